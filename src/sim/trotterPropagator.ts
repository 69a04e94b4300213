import type { FullSpaceOperator } from './fullSpaceOperator.js';
import type { SimKernels } from './simKernels.js';
import type { StateVector } from './stateVector.js';

/** One pass of a Trotter circuit: the diagonal part, or the terms of one flip group in order. */
interface Pass {
  /** −1 for the diagonal part. */
  group: number;
  terms: Int32Array;
  taus: Float64Array;
}

/**
 * Product formulas applied gate by gate on the state vector: every Pauli term's exponential
 * e^{−iτcP} acts on the pairs (b, b ⊕ flip) without forming a matrix, and the diagonal part (all
 * Z strings, which commute) is one pass of precomputed phases. Terms are ordered by flip group, as
 * `groupByFlipMask` lists them; order 1 is the Lie–Trotter product, order 2 its symmetric (Strang)
 * form, whose sweeps meet in the last group.
 */
export class TrotterPropagator {
  private readonly passes: Pass[] = [];
  private readonly cos: Float64Array;
  private readonly sin: Float64Array;
  private readonly stepSize: number;

  constructor(
    op: FullSpaceOperator,
    private readonly kernels: SimKernels,
    readonly order: 1 | 2,
    /** Size of one Trotter step. */
    h: number,
    shared = false,
  ) {
    this.stepSize = h;
    const alloc = (): Float64Array => (shared ? new Float64Array(new SharedArrayBuffer(op.dim * 8)) : new Float64Array(op.dim));
    this.cos = alloc();
    this.sin = alloc();
    const diagTau = order === 1 ? h : h / 2;
    kernels.fillPhases(diagTau, this.cos, this.sin);
    const groups = op.flips.length;
    const termsOf = (g: number): number[] => {
      const list: number[] = [];
      for (let t = op.termStart[g]!; t < op.termStart[g + 1]!; t++) list.push(t);
      return list;
    };
    const pass = (group: number, terms: number[], taus: number[]): Pass => ({ group, terms: Int32Array.from(terms), taus: Float64Array.from(taus) });
    if (order === 1) {
      this.passes.push(pass(-1, [], []));
      for (let g = 0; g < groups; g++) {
        const t = termsOf(g);
        this.passes.push(pass(g, t, t.map(() => h)));
      }
      return;
    }
    const half = h / 2;
    this.passes.push(pass(-1, [], []));
    for (let g = 0; g < groups - 1; g++) {
      const t = termsOf(g);
      this.passes.push(pass(g, t, t.map(() => half)));
    }
    if (groups > 0) {
      // Turning point: forward then backward through the last group, the middle term merged.
      const t = termsOf(groups - 1);
      const seq = [...t, ...t.slice(0, -1).reverse()];
      const taus = seq.map((_, i) => (i === t.length - 1 ? h : half));
      this.passes.push(pass(groups - 1, seq, taus));
    }
    for (let g = groups - 2; g >= 0; g--) {
      const t = termsOf(g).reverse();
      this.passes.push(pass(g, t, t.map(() => half)));
    }
    this.passes.push(pass(-1, [], []));
  }

  /** ψ ← U_order(h)^count ψ. */
  step(psi: StateVector, count = 1): void {
    for (let s = 0; s < count; s++) {
      for (const p of this.passes) {
        if (p.group < 0) this.kernels.phaseDiagonal(psi, this.cos, this.sin);
        else this.kernels.rotateGroup(psi, p.group, p.terms, p.taus);
      }
    }
  }

  /** Time advanced by one step. */
  get h(): number {
    return this.stepSize;
  }
}
