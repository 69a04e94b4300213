import { seededUniform } from '../util/random.js';
import type { LanczosResult, LinearOperator } from './lanczos.js';
import { tridiagonalLowest } from './tridiagonalLowest.js';
import { localSweeps, type LanczosSweeps } from './lanczosSweeps.js';
import { axpy, dot, norm, scale } from './vectorOps.js';

/** Options of `lanczosTwoPass`. */
export interface TwoPassOptions {
  tol: number;
  seed: number;
  maxIterations: number;
  start?: Float64Array;
  /**
   * Lanczos vectors pass 1 may keep (default 0): when the run converges within them the Ritz
   * vector is formed from the kept ones and pass 2 is skipped, else pass 2 replays only the steps
   * after them. For expensive products (matrix-free) with memory to spare, this halves the products.
   */
  keepVectors?: number;
  onProgress?: (info: { matvecs: number; residual: number; energy: number }) => void;
}

/**
 * The lowest eigenpair by plain Lanczos without reorthogonalisation, holding three vectors (four
 * in a second pass whose operator cannot fuse the replay with its product): the
 * first pass builds the tridiagonal matrix until the lowest Ritz value's residual estimate
 * |β_j y_j| is below tol·max|θ|; the second pass replays the same recurrence from the same start
 * vector to form the Ritz vector (Paige: the lowest Ritz pair converges before orthogonality loss
 * can spoil it). Returns the true residual; the caller refines with thick restart when needed.
 */
export function lanczosTwoPass(op: LinearOperator, opts: TwoPassOptions): LanczosResult {
  const len = op.complex ? 2 * op.dim : op.dim;
  // The normalised start vector is written into v twice (once per pass) rather than kept: a random
  // one is drawn again from the same seed, which costs less than holding another vector.
  let startScale = 0;
  const writeStart = (v: Float64Array): void => {
    if (opts.start && opts.start.length === len) v.set(opts.start);
    else {
      const rng = seededUniform(opts.seed);
      for (let i = 0; i < len; i++) v[i] = rng.next() - 0.5;
    }
    if (startScale === 0) startScale = 1 / norm(v);
    scale(v, startScale);
  };
  const alpha: number[] = [];
  const beta: number[] = [];
  let matvecs = 0;
  let y: Float64Array | undefined;
  let scaleSeen = 0;
  let residualEstimate = Infinity;
  // Vectors from the operator when it offers them (shared with its threads: no copies per product).
  const vector = (): Float64Array => op.vector?.() ?? new Float64Array(len);
  // The operator's threads share the vector sweeps too when it offers them (its own vectors only).
  const sweeps: LanczosSweeps = op.sweeps ?? localSweeps;
  let vPrev = vector();
  let v = vector();
  let w = vector();
  // Pass 1: coefficients only (and copies of the first keepVectors Lanczos vectors).
  const kept: Float64Array[] = [];
  const keep = opts.keepVectors ?? 0;
  writeStart(v);
  for (let j = 0; j < opts.maxIterations && j < op.dim; j++) {
    if (kept.length < keep) kept.push(Float64Array.from(v));
    op.apply(v, w);
    matvecs++;
    const { a, b } = lanczosStep(sweeps, v, vPrev, w, j > 0 ? beta[j - 1]! : 0);
    alpha.push(a);
    scaleSeen = Math.max(scaleSeen, Math.abs(a) + b);
    const last = j + 1 === op.dim || b <= 1e-14 * scaleSeen;
    // The tridiagonal solve is cheap while it is small: test every step then, every fifth later.
    if (last || j < CHECK_EVERY_STEP || j % 5 === 4 || j + 1 === opts.maxIterations) {
      const ev = tridiagonalLowest(alpha, beta);
      y = ev.vector;
      opts.onProgress?.({ matvecs, residual: Math.abs(b * y[j]!), energy: ev.value });
      scaleSeen = Math.max(scaleSeen, ev.maxAbs);
      residualEstimate = last ? 0 : Math.abs(b * y[j]!);
      if (residualEstimate <= opts.tol * scaleSeen) break;
    }
    if (last) break;
    beta.push(b);
    sweeps.scale(w, 1 / b);
    const t = vPrev;
    vPrev = v;
    v = w;
    w = t;
  }
  const steps = alpha.length;
  if (!y || y.length !== steps) {
    y = tridiagonalLowest(alpha, beta).vector;
  }
  // When pass 2 needs no w (every vector kept, or the operator fuses the replay with its product),
  // x takes w's place: the solve then holds three vectors, not four.
  const fused = op.replayStep?.bind(op);
  const x = kept.length >= steps || fused ? w.fill(0) : vector();
  if (kept.length >= steps) {
    // Every vector of the run was kept: x = Σ y_j v_j directly, no second pass.
    for (let j = 0; j < steps; j++) axpy(y[j]!, 0, kept[j]!, x, false);
    kept.length = 0;
  } else {
    // Pass 2: replay the recurrence with the same coefficients and accumulate x = Σ y_j v_j,
    // starting after the kept vectors (the last two kept ones restart the recurrence).
    let from = 0;
    if (kept.length >= 2) {
      from = kept.length - 1;
      for (let j = 0; j < from; j++) axpy(y[j]!, 0, kept[j]!, x, false);
      vPrev.set(kept[from - 1]!);
      v.set(kept[from]!);
    } else {
      vPrev.fill(0);
      writeStart(v);
    }
    kept.length = 0;
    for (let j = from; j < steps; j++) {
      if (j + 1 === steps) {
        axpy(y[j]!, 0, v, x, false);
        break;
      }
      matvecs++;
      if (fused) {
        // The next vector is written over vPrev.
        fused(v, vPrev, x, alpha[j]!, j > 0 ? beta[j - 1]! : 0, 1 / beta[j]!, y[j]!);
        const t = vPrev;
        vPrev = v;
        v = t;
        continue;
      }
      op.apply(v, w);
      sweeps.replay(v, vPrev, w, x, alpha[j]!, j > 0 ? beta[j - 1]! : 0, 1 / beta[j]!, y[j]!);
      const t = vPrev;
      vPrev = v;
      v = w;
      w = t;
    }
  }
  scale(x, 1 / norm(x));
  const hx = vPrev;
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

/** Steps below which pass 1 tests convergence after every product. */
const CHECK_EVERY_STEP = 60;

/**
 * One Lanczos step once w = H v: α = ⟨v|H v − β v_prev⟩ (both inner products in one sweep), then
 * w ← w − α v − β v_prev and its norm in a second sweep. Real arithmetic on interleaved complex
 * vectors is exact here: α and β are real for a Hermitian operator.
 */
function lanczosStep(sweeps: LanczosSweeps, v: Float64Array, vPrev: Float64Array, w: Float64Array, b: number): { a: number; b: number } {
  const [vw, vp] = sweeps.dots(v, w, vPrev);
  const a = vw - b * vp;
  return { a, b: Math.sqrt(sweeps.update(v, vPrev, w, a, b)) };
}
