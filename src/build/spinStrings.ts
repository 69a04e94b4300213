import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { sortOrder } from '../bits/basis.js';
import { extractBits } from '../bits/bitRange.js';
import { ConfigTable } from '../bits/configTable.js';
import { buildHashSlots, lookupConfig } from '../bits/hashIndex.js';
import { popcount32, wordsFor } from '../bits/packed.js';

/**
 * Distinct occupation strings of one spin register (M orbitals, bit p = orbital p), sorted
 * ascending as binary numbers, with a hash index and the occupied orbitals of each.
 */
export interface SpinStrings {
  orbitals: number;
  /** Electrons in every string (the register's Hamming weight). */
  electrons: number;
  nWords: number;
  count: number;
  /** count × nWords packed strings, ascending. */
  states: Uint32Array;
  slots: Int32Array;
  /** count × electrons occupied orbitals, ascending within each string. */
  occ: Int32Array;
}

/** A determinant basis seen as pairs (spin-up string, spin-down string). */
export interface SpinSplit {
  alpha: SpinStrings;
  beta: SpinStrings;
  /** Spin-up string index of each basis row. */
  rowAlpha: Int32Array;
  /** Spin-down string index of each basis row. */
  rowBeta: Int32Array;
  /**
   * Whether the basis holds every spin-up string with every spin-down string; then, because the
   * spin-down register is the high qubits, row = iβ·nα + iα.
   */
  product: boolean;
}

/**
 * Deduplicate and sort `count` packed strings of `orbitals` bits. Throws `bad-argument` when the
 * strings do not all hold the same number of electrons.
 */
export function makeSpinStrings(states: Uint32Array, count: number, nWords: number, orbitals: number, what = 'spin'): SpinStrings {
  const table = new ConfigTable(nWords, count);
  for (let i = 0; i < count; i++) table.add(states, i * nWords, 1);
  const n = table.size;
  const order = sortOrder(table.states, n, nWords);
  const sorted = new Uint32Array(Math.max(1, n * nWords));
  for (let i = 0; i < n; i++) sorted.set(table.states.subarray(order[i]! * nWords, order[i]! * nWords + nWords), i * nWords);
  let electrons = -1;
  for (let i = 0; i < n; i++) {
    let w = 0;
    for (let k = 0; k < nWords; k++) w += popcount32(sorted[i * nWords + k]!);
    if (electrons < 0) electrons = w;
    else if (w !== electrons) {
      throw new BitspanError('bad-argument', `the ${what} register holds strings with ${electrons} and with ${w} electrons`, 'a determinant basis needs a fixed electron count per spin: give --electrons A,B');
    }
  }
  electrons = Math.max(0, electrons);
  const occ = new Int32Array(n * electrons);
  for (let i = 0; i < n; i++) {
    let at = i * electrons;
    for (let p = 0; p < orbitals; p++) if ((sorted[i * nWords + (p >>> 5)]! >>> (p & 31)) & 1) occ[at++] = p;
  }
  return { orbitals, electrons, nWords, count: n, states: sorted, slots: buildHashSlots(sorted, n, nWords), occ };
}

/**
 * Split a basis of 2M-qubit Jordan–Wigner determinants (spin-up orbital p on qubit p, spin-down on
 * qubit M+p) into its distinct spin-up and spin-down strings and the string pair of every row.
 */
export function splitSpinStrings(basis: Basis, orbitals: number): SpinSplit {
  const m = orbitals;
  if (basis.qubits !== 2 * m) throw new BitspanError('qubit-mismatch', `a determinant of ${m} orbitals has ${2 * m} qubits, the basis has ${basis.qubits}`, 'samples of a molecule with M orbitals have 2M qubits');
  const w = wordsFor(m);
  const dim = basis.dim;
  const up = new Uint32Array(Math.max(1, dim * w));
  const down = new Uint32Array(Math.max(1, dim * w));
  for (let r = 0; r < dim; r++) {
    extractBits(basis.states, r * basis.nWords, basis.nWords, 0, m, up, r * w, w);
    extractBits(basis.states, r * basis.nWords, basis.nWords, m, m, down, r * w, w);
  }
  const alpha = makeSpinStrings(up, dim, w, m, 'spin-up');
  const beta = makeSpinStrings(down, dim, w, m, 'spin-down');
  const rowAlpha = new Int32Array(dim);
  const rowBeta = new Int32Array(dim);
  for (let r = 0; r < dim; r++) {
    rowAlpha[r] = lookupConfig(alpha.states, alpha.slots, w, up, r * w);
    rowBeta[r] = lookupConfig(beta.states, beta.slots, w, down, r * w);
  }
  return { alpha, beta, rowAlpha, rowBeta, product: dim === alpha.count * beta.count };
}
