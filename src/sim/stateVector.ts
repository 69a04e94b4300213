import { totalmem } from 'node:os';
import { BitspanError } from '../errors.js';

/**
 * A state of `qubits` qubits over the full computational basis: amplitude of configuration b
 * (qubit q = bit q of b) is re[b] + i·im[b]. Real and imaginary parts are separate arrays so that
 * real Hamiltonians act on each with the same kernel.
 */
export interface StateVector {
  qubits: number;
  dim: number;
  re: Float64Array;
  im: Float64Array;
}

/** Largest register the state-vector simulator indexes (configurations are 32-bit integers). */
export const MAX_SIM_QUBITS = 30;

/** Fraction of physical memory a simulation may plan to use. */
const MEMORY_FRACTION = 0.75;

/**
 * Refuse a simulation that needs `arrays` Float64Arrays of 2^qubits entries (a complex vector is
 * two) when that exceeds three quarters of the machine's memory or the indexable register.
 */
export function checkStateFits(qubits: number, arrays: number, what: string): void {
  const bytes = arrays * 8 * 2 ** qubits;
  const budget = MEMORY_FRACTION * totalmem();
  if (qubits > MAX_SIM_QUBITS || bytes > budget) {
    const gib = (x: number): string => (x / 2 ** 30).toFixed(1);
    let fit = 0;
    while (fit < MAX_SIM_QUBITS && arrays * 8 * 2 ** (fit + 1) <= budget) fit++;
    throw new BitspanError(
      'too-large',
      `${what} of ${qubits} qubits needs ${gib(bytes)} GiB for ${arrays / 2} complex state vectors, but this machine allows ${gib(budget)} GiB`,
      `at most ${fit} qubits fit here; use a smaller model`,
    );
  }
}

/** A zero state; on SharedArrayBuffers when `shared`, so worker threads can act on it in place. */
export function createState(qubits: number, shared = false): StateVector {
  const dim = 2 ** qubits;
  const alloc = (): Float64Array => (shared ? new Float64Array(new SharedArrayBuffer(dim * 8)) : new Float64Array(dim));
  return { qubits, dim, re: alloc(), im: alloc() };
}

/** Copy amplitudes from one state into another of the same size. */
export function copyState(from: StateVector, to: StateVector): void {
  to.re.set(from.re);
  to.im.set(from.im);
}

/** ‖ψ‖². */
export function normSquared(s: StateVector): number {
  let n = 0;
  const { re, im } = s;
  for (let b = 0; b < s.dim; b++) n += re[b]! * re[b]! + im[b]! * im[b]!;
  return n;
}

/** ⟨a|b⟩ as [re, im] (a conjugated), e.g. for overlaps between evolved states. */
export function innerProduct(a: StateVector, b: StateVector): [number, number] {
  let re = 0;
  let im = 0;
  const ar = a.re;
  const ai = a.im;
  const br = b.re;
  const bi = b.im;
  for (let k = 0; k < a.dim; k++) {
    re += ar[k]! * br[k]! + ai[k]! * bi[k]!;
    im += ar[k]! * bi[k]! - ai[k]! * br[k]!;
  }
  return [re, im];
}
