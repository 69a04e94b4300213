import { seededUniform } from '../util/random.js';
import type { LanczosResult, LinearOperator } from './lanczos.js';
import { symmetricEigen } from './symmetricEigen.js';
import { axpy, dot, norm, scale } from './vectorOps.js';

/** Options of `lanczosTwoPass`. */
export interface TwoPassOptions {
  tol: number;
  seed: number;
  maxIterations: number;
  start?: Float64Array;
  onProgress?: (info: { matvecs: number; residual: number; energy: number }) => void;
}

/**
 * The lowest eigenpair by plain Lanczos without reorthogonalisation, holding three vectors: the
 * first pass builds the tridiagonal matrix until the lowest Ritz value's residual estimate
 * |β_j y_j| is below tol·max|θ|; the second pass replays the same recurrence from the same start
 * vector to form the Ritz vector (Paige: the lowest Ritz pair converges before orthogonality loss
 * can spoil it). Returns the true residual; the caller refines with thick restart when needed.
 */
export function lanczosTwoPass(op: LinearOperator, opts: TwoPassOptions): LanczosResult {
  const len = op.complex ? 2 * op.dim : op.dim;
  const start = new Float64Array(len);
  if (opts.start && opts.start.length === len) start.set(opts.start);
  else {
    const rng = seededUniform(opts.seed);
    for (let i = 0; i < len; i++) start[i] = rng.next() - 0.5;
  }
  scale(start, 1 / norm(start));
  const alpha: number[] = [];
  const beta: number[] = [];
  let matvecs = 0;
  let y: Float64Array | undefined;
  let scaleSeen = 0;
  let residualEstimate = Infinity;
  // Pass 1: coefficients only.
  {
    let vPrev = new Float64Array(len);
    let v = Float64Array.from(start);
    let w = new Float64Array(len);
    let b = 0;
    for (let j = 0; j < opts.maxIterations && j < op.dim; j++) {
      op.apply(v, w);
      matvecs++;
      if (j > 0) axpy(-b, 0, vPrev, w, op.complex);
      const a = dot(v, w, op.complex);
      axpy(-a, 0, v, w, op.complex);
      alpha.push(a);
      b = norm(w);
      scaleSeen = Math.max(scaleSeen, Math.abs(a) + b);
      const last = j + 1 === op.dim || b <= 1e-14 * scaleSeen;
      if (last || j < 4 || j % 5 === 4 || j + 1 === opts.maxIterations) {
        const ev = tridiagonalLowest(alpha, beta);
        y = ev.vector;
        opts.onProgress?.({ matvecs, residual: Math.abs(b * y[j]!), energy: ev.value });
        scaleSeen = Math.max(scaleSeen, ev.maxAbs);
        residualEstimate = last ? 0 : Math.abs(b * y[j]!);
        if (residualEstimate <= opts.tol * scaleSeen) break;
      }
      if (last) break;
      beta.push(b);
      scale(w, 1 / b);
      const t = vPrev;
      vPrev = v;
      v = w;
      w = t;
    }
  }
  const steps = alpha.length;
  if (!y || y.length !== steps) {
    y = tridiagonalLowest(alpha, beta).vector;
  }
  // Pass 2: replay the recurrence and accumulate x = Σ y_j v_j.
  const x = new Float64Array(len);
  {
    let vPrev = new Float64Array(len);
    let v = Float64Array.from(start);
    let w = new Float64Array(len);
    for (let j = 0; j < steps; j++) {
      axpy(y[j]!, 0, v, x, op.complex);
      if (j + 1 === steps) break;
      op.apply(v, w);
      matvecs++;
      if (j > 0) axpy(-beta[j - 1]!, 0, vPrev, w, op.complex);
      axpy(-alpha[j]!, 0, v, w, op.complex);
      scale(w, 1 / beta[j]!);
      const t = vPrev;
      vPrev = v;
      v = w;
      w = t;
    }
  }
  scale(x, 1 / norm(x));
  const hx = new Float64Array(len);
  op.apply(x, hx);
  matvecs++;
  const energy = dot(x, hx, op.complex);
  axpy(-energy, 0, x, hx, op.complex);
  const residual = norm(hx);
  const scaleFinal = Math.max(scaleSeen, Math.abs(energy));
  return {
    values: Float64Array.of(energy),
    vectors: [x],
    residuals: Float64Array.of(residual),
    converged: residual <= opts.tol * scaleFinal,
    iterations: steps,
    matvecs,
    restarts: 0,
    scale: scaleFinal,
  };
}

/** Lowest eigenpair of the symmetric tridiagonal matrix (alpha on the diagonal, beta beside it). */
function tridiagonalLowest(alpha: number[], beta: number[]): { value: number; vector: Float64Array; maxAbs: number } {
  const n = alpha.length;
  const t = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    t[i * n + i] = alpha[i]!;
    if (i + 1 < n) t[i * n + i + 1] = t[(i + 1) * n + i] = beta[i]!;
  }
  const { values, vectors } = symmetricEigen(t, n);
  const vector = new Float64Array(n);
  for (let i = 0; i < n; i++) vector[i] = vectors[i * n]!;
  return { value: values[0]!, vector, maxAbs: Math.max(Math.abs(values[0]!), Math.abs(values[n - 1]!)) };
}
