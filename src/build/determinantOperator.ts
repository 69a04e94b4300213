import type { LinearOperator } from '../solvers/lanczos.js';
import { forEachRow, RowSink, type DeterminantContext } from './determinantHamiltonian.js';

/**
 * y[r] = Σ_c H[r][c] x[c] for rows r0..r1, regenerating the Slater–Condon elements instead of
 * storing them: memory stays at the prepared string connections when the stored matrix would not fit.
 */
export function applyDeterminantRows(ctx: DeterminantContext, x: Float64Array, y: Float64Array, r0: number, r1: number): void {
  const sink = RowSink.dot(x);
  forEachRow(ctx, r0, r1, sink, (r) => {
    y[r] = sink.sum;
    sink.sum = 0;
  });
}

/** The matrix-free determinant-basis Hamiltonian as an operator for Lanczos. */
export function determinantOperator(ctx: DeterminantContext): LinearOperator {
  return { dim: ctx.dim, complex: false, apply: (x, y) => applyDeterminantRows(ctx, x, y, 0, ctx.dim) };
}
