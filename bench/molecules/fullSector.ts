/** Every determinant of a spin sector, for exact references and for sampling synthetic dumps. */
import { makeBasis, type Basis } from '../../src/bits/basis.js';
import { wordsFor } from '../../src/bits/packed.js';

/** All ways to choose `n` of `m` orbitals, as ascending index lists. */
export function combinations(m: number, n: number): number[][] {
  const out: number[][] = [];
  const pick: number[] = [];
  const walk = (from: number): void => {
    if (pick.length === n) {
      out.push(pick.slice());
      return;
    }
    for (let p = from; p <= m - (n - pick.length); p++) {
      pick.push(p);
      walk(p + 1);
      pick.pop();
    }
  };
  walk(0);
  return out;
}

/** The basis of all determinants with `up` spin-up and `down` spin-down electrons in `orbitals` orbitals. */
export function fullSector(orbitals: number, up: number, down: number): Basis {
  const qubits = 2 * orbitals;
  const nWords = wordsFor(qubits);
  const ups = combinations(orbitals, up);
  const downs = combinations(orbitals, down);
  const dim = ups.length * downs.length;
  const states = new Uint32Array(Math.max(1, dim * nWords));
  let r = 0;
  for (const d of downs) {
    for (const u of ups) {
      for (const p of u) states[r * nWords + (p >>> 5)]! |= 1 << (p & 31);
      for (const p of d) states[r * nWords + ((orbitals + p) >>> 5)]! |= 1 << ((orbitals + p) & 31);
      r++;
    }
  }
  return makeBasis(qubits, nWords, states, dim);
}
