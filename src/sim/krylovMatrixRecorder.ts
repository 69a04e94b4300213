import { BitspanError } from '../errors.js';
import { complexMatrix, type ComplexMatrix } from '../solvers/complexMatrix.js';
import type { SimKernels } from './simKernels.js';
import { checkStateFits, createState, innerProduct, type StateVector } from './stateVector.js';

/** Exact Krylov matrices of simulated states: H̃_jk = ⟨ψ_j|H|ψ_k⟩ and S_jk = ⟨ψ_j|ψ_k⟩. */
export interface SimulatedKrylovMatrices {
  h: ComplexMatrix;
  s: ComplexMatrix;
}

/**
 * Collects the states of an evolution one by one (e.g. from `simulate`'s `onState`) and fills the
 * exact H̃ and S: each new state ψ_k gets one product Hψ_k and inner products with the kept ψ_j, j ≤ k,
 * so it holds `steps` copies plus one scratch vector, never H·ψ for every k.
 */
export class KrylovMatrixRecorder {
  private readonly states: StateVector[] = [];
  private scratch: StateVector | null = null;
  private readonly h: ComplexMatrix;
  private readonly s: ComplexMatrix;

  /**
   * Plan for `steps` states of `qubits` qubits, next to `otherArrays` Float64Arrays of 2^qubits the
   * evolution already holds. Throws `too-large` when the kept states would not fit in memory.
   */
  constructor(
    readonly qubits: number,
    readonly steps: number,
    otherArrays = 0,
  ) {
    try {
      checkStateFits(qubits, otherArrays + 2 * (steps + 1), `keeping ${steps} states for the Krylov matrices`);
    } catch (e) {
      if (e instanceof BitspanError) throw new BitspanError('too-large', e.message, 'use fewer --steps, a smaller model, or drop --krylov-matrices');
      throw e;
    }
    this.h = complexMatrix(steps);
    this.s = complexMatrix(steps);
  }

  /** Add state ψ_k (k = number added so far; copied), using `kernels` for the product with H. */
  add(psi: StateVector, kernels: SimKernels): void {
    const k = this.states.length;
    if (k >= this.steps) throw new Error(`KrylovMatrixRecorder planned ${this.steps} states, got more`);
    // Kernels on a worker pool need shared buffers; the scratch vector follows the state's kind.
    this.scratch ??= createState(psi.qubits, psi.re.buffer instanceof SharedArrayBuffer);
    const hpsi = this.scratch;
    kernels.applyH(psi, hpsi, 1, 0, 0);
    const copy = createState(psi.qubits);
    copy.re.set(psi.re);
    copy.im.set(psi.im);
    this.states.push(copy);
    const n = this.steps;
    for (let j = 0; j <= k; j++) {
      const [hr, hi] = innerProduct(this.states[j]!, hpsi);
      const [sr, si] = innerProduct(this.states[j]!, copy);
      // Upper triangle from the products, lower by Hermitian symmetry; the diagonal is real.
      this.h.re[j * n + k] = hr;
      this.h.im[j * n + k] = j === k ? 0 : hi;
      this.h.re[k * n + j] = hr;
      this.h.im[k * n + j] = j === k ? 0 : -hi;
      this.s.re[j * n + k] = sr;
      this.s.im[j * n + k] = j === k ? 0 : si;
      this.s.re[k * n + j] = sr;
      this.s.im[k * n + j] = j === k ? 0 : -si;
    }
  }

  /** The matrices once all `steps` states are in; throws if some are missing. */
  result(): SimulatedKrylovMatrices {
    if (this.states.length !== this.steps) throw new Error(`KrylovMatrixRecorder has ${this.states.length} of ${this.steps} states`);
    return { h: this.h, s: this.s };
  }
}
