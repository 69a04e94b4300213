import { PauliSumBuilder, type PauliSum } from '../../src/operators/pauliSum.js';
import { seededUniform } from '../../src/util/random.js';
import { createState, type StateVector } from '../../src/sim/stateVector.js';

/** A seeded random Pauli sum on n qubits; `complex` lets odd-Y strings in. */
export function randomPauliSum(n: number, terms: number, seed: number, complex: boolean): PauliSum {
  const rng = seededUniform(seed);
  const b = new PauliSumBuilder(n);
  b.add(rng.next() - 0.5, []);
  for (let t = 0; t < terms; t++) {
    const ops: Array<['X' | 'Y' | 'Z', number]> = [];
    for (let q = 0; q < n; q++) {
      const r = rng.next();
      if (r < 0.3) ops.push(['X', q]);
      else if (r < (complex ? 0.5 : 0.3)) ops.push(['Y', q]);
      else if (r < 0.7) ops.push(['Z', q]);
    }
    // Keep real sums real: an odd number of Y's makes the matrix complex.
    if (!complex && ops.filter(([o]) => o === 'Y').length % 2 === 1) ops.splice(ops.findIndex(([o]) => o === 'Y'), 1);
    if (ops.length) b.add(2 * rng.next() - 1, ops);
  }
  return b.finish(true);
}

/** A seeded random normalised state. */
export function randomState(n: number, seed: number): StateVector {
  const rng = seededUniform(seed);
  const s = createState(n);
  let norm = 0;
  for (let b = 0; b < s.dim; b++) {
    s.re[b] = rng.next() - 0.5;
    s.im[b] = rng.next() - 0.5;
    norm += s.re[b]! ** 2 + s.im[b]! ** 2;
  }
  const k = 1 / Math.sqrt(norm);
  for (let b = 0; b < s.dim; b++) {
    s.re[b]! *= k;
    s.im[b]! *= k;
  }
  return s;
}

/** ‖a − b‖. */
export function distance(a: { re: ArrayLike<number>; im: ArrayLike<number> }, b: { re: ArrayLike<number>; im: ArrayLike<number> }): number {
  let s = 0;
  for (let i = 0; i < a.re.length; i++) s += (a.re[i]! - b.re[i]!) ** 2 + (a.im[i]! - b.im[i]!) ** 2;
  return Math.sqrt(s);
}

/** Copy of a state. */
export function cloneState(s: StateVector): StateVector {
  const c = createState(s.qubits);
  c.re.set(s.re);
  c.im.set(s.im);
  return c;
}
