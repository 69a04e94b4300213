/**
 * Reference constructions for the molecule tests, written independently of src/build: the
 * second-quantised electronic Hamiltonian as a dense matrix over all 2^(2M) Jordan–Wigner
 * configurations, from annihilation operators a_q = Z_0 ⋯ Z_{q−1} σ⁻_q (common practice) multiplied
 * with ml-matrix; and seeded random real-orbital integrals.
 */
import { Matrix } from 'ml-matrix';
import { makeIntegrals, setOneElectron, setTwoElectron, type Integrals } from '../src/operators/integrals.js';
import { seededUniform } from '../src/util/random.js';

/** Dense a_q on n qubits: a_q|…1_q…⟩ = (−1)^{ones below q} |…0_q…⟩. */
export function annihilator(q: number, qubits: number): Matrix {
  const dim = 1 << qubits;
  const a = Matrix.zeros(dim, dim);
  for (let i = 0; i < dim; i++) {
    if (!((i >> q) & 1)) continue;
    let below = 0;
    for (let k = 0; k < q; k++) below += (i >> k) & 1;
    a.set(i ^ (1 << q), i, below & 1 ? -1 : 1);
  }
  return a;
}

/**
 * H = core + Σ_{pq,σ} h_pq a†_pσ a_qσ + ½ Σ_{pqrs,στ} (pq|rs) a†_pσ a†_rτ a_sτ a_qσ as a dense matrix
 * over `configs` (all 2^(2M) configurations when omitted; otherwise whole sectors of fixed spin-up and
 * spin-down counts, which every E_xy = a†_x a_y maps into themselves, so products of restricted E's
 * are exact). Spin-up orbital p is qubit p, spin-down orbital p is qubit M + p.
 */
export function denseHamiltonian(ints: Integrals, configs?: number[]): Matrix {
  const m = ints.orbitals;
  const n = 2 * m;
  const all = Array.from({ length: 1 << n }, (_, i) => i);
  const rows = configs ?? all;
  const a = Array.from({ length: n }, (_, q) => annihilator(q, n));
  const e = new Map<number, Matrix>();
  // E_xy restricted: (rows of a†_x) × (columns of a_y) over the configurations.
  const E = (x: number, y: number): Matrix => {
    const key = x * n + y;
    let v = e.get(key);
    if (!v) {
      v = a[x]!.transpose().selection(rows, all).mmul(a[y]!.selection(all, rows));
      e.set(key, v);
    }
    return v;
  };
  const size = rows.length;
  const h = Matrix.eye(size, size).mul(ints.core);
  const so = (p: number, spin: number): number => p + spin * m;
  const g = (p: number, q: number, r: number, s: number): number => ints.eri[((p * m + q) * m + r) * m + s]!;
  for (let s = 0; s < 2; s++) {
    for (let p = 0; p < m; p++) {
      for (let q = 0; q < m; q++) {
        // One-body part, and the correction from a†_p a†_r a_s a_q = E_pq E_rs − δ_qr E_ps
        // (anticommutation, common practice): −½ Σ_r (pr|rq) E_pq.
        let k = 0;
        for (let r = 0; r < m; r++) k += g(p, r, r, q);
        const c = ints.h1[p * m + q]! - 0.5 * k;
        if (c !== 0) h.add(E(so(p, s), so(q, s)).clone().mul(c));
        // ½ E_pq F_pq with F_pq = Σ_{rs,τ} (pq|rs) E_rs.
        const f = Matrix.zeros(size, size);
        for (let t = 0; t < 2; t++) {
          for (let r = 0; r < m; r++) {
            for (let u = 0; u < m; u++) {
              const v = g(p, q, r, u);
              if (v !== 0) f.add(E(so(r, t), so(u, t)).clone().mul(v));
            }
          }
        }
        h.add(E(so(p, s), so(q, s)).mmul(f).mul(0.5));
      }
    }
  }
  return h;
}

/** Seeded random integrals with the 8-fold symmetry of real orbitals. */
export function randomIntegrals(orbitals: number, seed: number): Integrals {
  const rng = seededUniform(seed);
  const ints = makeIntegrals(orbitals);
  const m = orbitals;
  ints.core = rng.next() - 0.5;
  for (let p = 0; p < m; p++) for (let q = 0; q <= p; q++) setOneElectron(ints, p, q, 2 * rng.next() - 1);
  for (let p = 0; p < m; p++) {
    for (let q = 0; q <= p; q++) {
      for (let r = 0; r < m; r++) {
        for (let s = 0; s <= r; s++) {
          if (r * m + s > p * m + q) continue;
          setTwoElectron(ints, p, q, r, s, rng.next() - 0.5);
        }
      }
    }
  }
  return ints;
}
