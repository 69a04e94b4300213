import { BitspanError } from '../errors.js';

/**
 * The electronic Hamiltonian of M real spatial orbitals in second quantisation:
 * H = core + Σ_{pq,σ} h_pq a†_pσ a_qσ + ½ Σ_{pqrs,στ} (pq|rs) a†_pσ a†_rτ a_sτ a_qσ,
 * with (pq|rs) in chemists' notation. Orbital indices here are 0-based.
 */
export interface Integrals {
  orbitals: number;
  /** Core energy (nuclear repulsion plus any frozen-core part), added to every diagonal element. */
  core: number;
  /** M×M one-electron integrals, h1[p·M + q] = h_pq, symmetric. */
  h1: Float64Array;
  /**
   * M⁴ two-electron integrals, eri[((p·M + q)·M + r)·M + s] = (pq|rs), all eight permutations of a
   * real-orbital integral stored, so (ai|··) is one contiguous M×M slice for the builder's inner loop.
   */
  eri: Float64Array;
}

/** Largest orbital count whose dense M⁴ tensor we allocate (128⁴ doubles = 2 GiB). */
export const MAX_ORBITALS = 128;

/** Zeroed integrals for `orbitals` spatial orbitals; throws `too-large` past `MAX_ORBITALS`. */
export function makeIntegrals(orbitals: number): Integrals {
  if (orbitals > MAX_ORBITALS) {
    throw new BitspanError(
      'too-large',
      `${orbitals} orbitals need a ${((orbitals ** 4 * 8) / 2 ** 30).toFixed(1)} GiB two-electron tensor`,
      `bitspan holds the dense tensor for at most ${MAX_ORBITALS} orbitals; freeze core or drop virtual orbitals first`,
    );
  }
  const m = orbitals;
  return { orbitals: m, core: 0, h1: new Float64Array(m * m), eri: new Float64Array(m * m * m * m) };
}

/** Set h_pq and h_qp. */
export function setOneElectron(ints: Integrals, p: number, q: number, value: number): void {
  const m = ints.orbitals;
  ints.h1[p * m + q] = value;
  ints.h1[q * m + p] = value;
}

/** Offset of (pq|rs) in `eri`. */
export function eriIndex(m: number, p: number, q: number, r: number, s: number): number {
  return ((p * m + q) * m + r) * m + s;
}

/** Set (pq|rs) and its seven partners under the permutational symmetry of real orbitals. */
export function setTwoElectron(ints: Integrals, p: number, q: number, r: number, s: number, value: number): void {
  const m = ints.orbitals;
  const e = ints.eri;
  e[eriIndex(m, p, q, r, s)] = value;
  e[eriIndex(m, q, p, r, s)] = value;
  e[eriIndex(m, p, q, s, r)] = value;
  e[eriIndex(m, q, p, s, r)] = value;
  e[eriIndex(m, r, s, p, q)] = value;
  e[eriIndex(m, s, r, p, q)] = value;
  e[eriIndex(m, r, s, q, p)] = value;
  e[eriIndex(m, s, r, q, p)] = value;
}

/** Number of symmetry-distinct nonzero integrals (one- and two-electron), for reports. */
export function countNonzeroIntegrals(ints: Integrals): number {
  const m = ints.orbitals;
  let n = 0;
  for (let p = 0; p < m; p++) for (let q = 0; q <= p; q++) if (ints.h1[p * m + q] !== 0) n++;
  for (let p = 0; p < m; p++) {
    for (let q = 0; q <= p; q++) {
      const pq = p * (p + 1) / 2 + q;
      for (let r = 0; r < m; r++) {
        for (let s = 0; s <= r; s++) {
          if (r * (r + 1) / 2 + s > pq) continue;
          if (ints.eri[eriIndex(m, p, q, r, s)] !== 0) n++;
        }
      }
    }
  }
  return n;
}
