/**
 * The one-band Hubbard ring as integrals, a scenario of our own for tests and fixtures:
 * H = −t Σ_{i,σ} (a†_{i,σ} a_{i+1,σ} + h.c.) + U Σ_i n_{i↑} n_{i↓}, sites as orbitals, periodic.
 * In FCIDUMP terms h_{i,i±1} = −t and (ii|ii) = U.
 */
import { makeIntegrals, setOneElectron, setTwoElectron, type Integrals } from '../../src/operators/integrals.js';
import { PauliSumBuilder, type PauliSum } from '../../src/operators/pauliSum.js';

/** Site-basis integrals of an L-site ring. */
export function hubbardRingIntegrals(sites: number, t: number, u: number): Integrals {
  const ints = makeIntegrals(sites);
  for (let i = 0; i < sites; i++) {
    const j = (i + 1) % sites;
    if (j !== i) setOneElectron(ints, i, j, ints.h1[i * sites + j]! - t);
    setTwoElectron(ints, i, i, i, i, u);
  }
  return ints;
}

/**
 * The same ring as a Jordan–Wigner Pauli sum (spin-up site i on qubit i, spin-down on L + i):
 * a†_p a_q + a†_q a_p = ½ (X_p X_q + Y_p Y_q) Z_{p+1} ⋯ Z_{q−1} for p < q, and
 * n_a n_b = ¼ (1 − Z_a − Z_b + Z_a Z_b) (common practice).
 */
export function hubbardRingPauli(sites: number, t: number, u: number): PauliSum {
  const b = new PauliSumBuilder(2 * sites);
  for (let spin = 0; spin < 2; spin++) {
    for (let i = 0; i < sites; i++) {
      const j = (i + 1) % sites;
      if (j === i || (sites === 2 && i === 1)) continue; // a 2-site ring has one bond, counted twice
      const p = spin * sites + Math.min(i, j);
      const q = spin * sites + Math.max(i, j);
      const z: Array<['Z', number]> = [];
      for (let k = p + 1; k < q; k++) z.push(['Z', k]);
      const coeff = sites === 2 ? -t : -t / 2;
      b.add(coeff, [['X', p], ['X', q], ...z]);
      b.add(coeff, [['Y', p], ['Y', q], ...z]);
    }
  }
  for (let i = 0; i < sites; i++) {
    const a = i;
    const c = sites + i;
    b.add(u / 4, []);
    b.add(-u / 4, [['Z', a]]);
    b.add(-u / 4, [['Z', c]]);
    b.add(u / 4, [['Z', a], ['Z', c]]);
  }
  return b.finish(true);
}
