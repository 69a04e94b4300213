import { seededUniform } from '../util/random.js';
import type { LanczosSweeps } from './lanczosSweeps.js';
import { lanczosTwoPass } from './lanczosTwoPass.js';
import { symmetricEigen } from './symmetricEigen.js';
import { axpy, dot, norm, orthogonalize, scale } from './vectorOps.js';

/**
 * A Hermitian linear operator of dimension `dim`; complex operators act on interleaved vectors of
 * length 2·dim. Stored matrices and matrix-free forms both fit.
 */
export interface LinearOperator {
  dim: number;
  complex: boolean;
  apply(x: Float64Array, y: Float64Array): void;
  /**
   * A zeroed vector the operator applies to and into without copying (e.g. one shared with its
   * worker threads); solvers that hold few vectors take theirs from here when it exists.
   */
  vector?(): Float64Array;
  /** Lanczos vector sweeps on the operator's own threads, for vectors from `vector()` (see lanczosSweeps.ts). */
  sweeps?: LanczosSweeps;
  /**
   * A replayed two-pass step with its product fused in (see `replayFusedRange`): x += yj·v and
   * vPrev ← (H v − a·v − b·vPrev)·inv, with no vector for H v. Operators whose rows are computed
   * one at a time (a stored matrix) offer it; a matrix-free product scatters across rows and cannot.
   */
  replayStep?(v: Float64Array, vPrev: Float64Array, x: Float64Array, a: number, b: number, inv: number, yj: number): void;
}

/** Options of `lanczos`; defaults live in `LANCZOS_DEFAULTS`. */
export interface LanczosOptions {
  /** Number of lowest eigenpairs wanted. */
  eigs: number;
  /** Converged when ‖Hv − θv‖ ≤ tol · max|θ| (largest Ritz value magnitude, an estimate of ‖H‖). */
  tol: number;
  /** Seed of the random start vector. */
  seed: number;
  /** Largest number of Lanczos vectors held at once (bounded memory). */
  maxBasis: number;
  /** Stop after this many operator applications even if not converged. */
  maxMatvecs: number;
  /**
   * `two-pass` keeps three vectors (plain Lanczos, then a replay for the eigenvector) and falls back
   * to thick restart if its residual is not small enough; `auto` uses it for one eigenpair of a
   * large operator, where orthogonalisation would dominate the cost.
   */
  strategy: 'auto' | 'thick-restart' | 'two-pass';
  /** Optional start vector (length dim, or 2·dim complex); random otherwise. */
  start?: Float64Array;
  /** Two-pass only: Lanczos vectors it may keep to skip its second pass (see `TwoPassOptions`). */
  keepVectors?: number;
  /** Called after each restart with the current residual of the lowest wanted pair. */
  onProgress?: (info: { matvecs: number; restarts: number; residual: number; energy: number }) => void;
}

export const LANCZOS_DEFAULTS: Omit<LanczosOptions, 'start' | 'onProgress'> = {
  eigs: 1,
  tol: 1e-8,
  seed: 1,
  maxBasis: 0, // 0: chosen from eigs
  maxMatvecs: 100000,
  strategy: 'auto',
};

/** Dimension from which `auto` picks the two-pass strategy for a single eigenpair. */
export const TWO_PASS_MIN_DIM = 50000;

/** Eigenpairs and convergence data; solvers report rather than throw when not converged. */
export interface LanczosResult {
  values: Float64Array;
  vectors: Float64Array[];
  /** True residual norms ‖Hv − θv‖ computed with an extra application each. */
  residuals: Float64Array;
  converged: boolean;
  /** Lanczos steps taken (one per operator application in the recurrence). */
  iterations: number;
  matvecs: number;
  restarts: number;
  /** The tolerance scale used: max |θ| seen. */
  scale: number;
}

interface PartialResult {
  values: number[];
  vectors: Float64Array[];
  converged: boolean;
  exhausted: boolean;
  steps: number;
  restarts: number;
  scale: number;
}

/**
 * The `eigs` lowest eigenpairs of a Hermitian operator by thick-restart Lanczos (Wu & Simon,
 * SIAM J. Matrix Anal. Appl. 22 (2000) 602) with full reorthogonalisation and locking. Degenerate
 * eigenvalues are found by deflated restarts: after the wanted pairs converge, a fresh random
 * vector orthogonal to them is run until no lower Ritz value appears in the complement.
 */
export function lanczos(op: LinearOperator, options: Partial<LanczosOptions> = {}): LanczosResult {
  const opts: LanczosOptions = { ...LANCZOS_DEFAULTS, ...options };
  const n = op.dim;
  const twoPass = opts.strategy === 'two-pass' || (opts.strategy === 'auto' && opts.eigs === 1 && n >= TWO_PASS_MIN_DIM);
  if (twoPass && opts.eigs === 1) {
    const r = lanczosTwoPass(op, {
      tol: opts.tol,
      seed: opts.seed,
      maxIterations: Math.min(opts.maxMatvecs, 3000),
      start: opts.start,
      keepVectors: opts.keepVectors,
      onProgress: opts.onProgress ? (p) => opts.onProgress!({ ...p, restarts: 0 }) : undefined,
    });
    if (r.converged) return r;
    // Rounding spoilt the replayed vector: polish it with thick restart, starting from it.
    const polished = lanczos(op, { ...options, strategy: 'thick-restart', start: r.vectors[0], maxMatvecs: Math.max(1, opts.maxMatvecs - r.matvecs) });
    return { ...polished, iterations: polished.iterations + r.iterations, matvecs: polished.matvecs + r.matvecs };
  }
  const want = Math.min(opts.eigs, n);
  const rng = seededUniform(opts.seed);
  const counter = { matvecs: 0 };
  const apply = (x: Float64Array, y: Float64Array): void => {
    op.apply(x, y);
    counter.matvecs++;
  };
  const locked: Float64Array[] = [];
  const lockedValues: number[] = [];
  let steps = 0;
  let restarts = 0;
  let converged = true;
  let scaleSeen = 0;
  const absorb = (part: PartialResult): void => {
    steps += part.steps;
    restarts += part.restarts;
    scaleSeen = Math.max(scaleSeen, part.scale);
    if (!part.converged) converged = false;
  };
  const first = thickRestart(op, apply, want, opts, locked, rng, opts.start, counter);
  absorb(first);
  first.values.forEach((v, i) => {
    locked.push(first.vectors[i]!);
    lockedValues.push(v);
  });
  // A single Krylov sequence sees one copy of a degenerate eigenvalue: search the complement of
  // the locked vectors for lower values until none appears (not needed for the lowest value alone).
  for (let round = 0; want > 1 && round < want && locked.length < n && counter.matvecs < opts.maxMatvecs; round++) {
    const part = thickRestart(op, apply, 1, opts, locked, rng, undefined, counter);
    absorb(part);
    const found = part.values[0];
    const top = Math.max(...lockedValues);
    if (found === undefined || found >= top - opts.tol * Math.max(scaleSeen, 1e-300) * 10) break;
    const drop = lockedValues.indexOf(top);
    locked.splice(drop, 1, part.vectors[0]!);
    lockedValues.splice(drop, 1, found);
  }
  // Final Rayleigh–Ritz on the locked vectors: sorts them and mixes near-degenerate pairs consistently.
  const order = lockedValues.map((_, i) => i).sort((a, b) => lockedValues[a]! - lockedValues[b]!);
  const k = Math.min(want, order.length);
  const values = new Float64Array(k);
  const vectors: Float64Array[] = [];
  const residuals = new Float64Array(k);
  const hv = new Float64Array(op.complex ? 2 * n : n);
  for (let i = 0; i < k; i++) {
    const v = locked[order[i]!]!;
    apply(v, hv);
    const theta = dot(v, hv, op.complex);
    axpy(-theta, 0, v, hv, op.complex);
    values[i] = theta;
    residuals[i] = norm(hv);
    vectors.push(v);
  }
  const scaleFinal = Math.max(scaleSeen, ...Array.from(values, Math.abs));
  for (let i = 0; i < k; i++) if (residuals[i]! > opts.tol * scaleFinal * 10 + 1e-300 && residuals[i]! > 1e-12 * scaleFinal) converged = false;
  return { values, vectors, residuals, converged, iterations: steps, matvecs: counter.matvecs, restarts, scale: scaleFinal };
}

/** Thick-restart Lanczos for the `need` lowest pairs of H restricted to the complement of `locked`. */
function thickRestart(
  op: LinearOperator,
  apply: (x: Float64Array, y: Float64Array) => void,
  need: number,
  opts: LanczosOptions,
  locked: Float64Array[],
  rng: { next(): number },
  start: Float64Array | undefined,
  counter: { matvecs: number },
): PartialResult {
  const n = op.dim;
  const len = op.complex ? 2 * n : n;
  const room = n - locked.length;
  const m = Math.min(room, Math.max(opts.maxBasis > 0 ? opts.maxBasis : 0, 2 * need + 18, need + 2));
  const V: Float64Array[] = [];
  const T = new Float64Array((m + 1) * (m + 1));
  const coeffs = new Float64Array(m + 1);
  let steps = 0;
  let restarts = 0;
  let scaleSeen = 0;

  const v0 = new Float64Array(len);
  if (start && start.length === len) v0.set(start);
  else fillRandom(v0, rng);
  if (!normalizeInComplement(v0, locked, [], 0, op.complex)) {
    return { values: [], vectors: [], converged: true, exhausted: true, steps, restarts, scale: 0 };
  }
  V.push(v0);
  let kept = 0; // Ritz vectors carried over from the last restart
  let w = new Float64Array(len);
  for (;;) {
    let p = kept; // number of basis vectors whose column of T is complete
    let beta = 0;
    let exhausted = false;
    for (let j = kept; j < m; j++) {
      apply(V[j]!, w);
      steps++;
      orthogonalize(w, locked, locked.length, op.complex);
      coeffs.fill(0);
      orthogonalize(w, V, j + 1, op.complex, coeffs);
      for (let i = 0; i <= j; i++) {
        // Column j of T = V†HV; the part above the arrow is rounding-level and symmetrised later.
        if (i >= kept || j >= kept) {
          T[i * m + j] = coeffs[i]!;
          T[j * m + i] = coeffs[i]!;
        }
      }
      p = j + 1;
      beta = norm(w);
      const diagScale = Math.abs(coeffs[j]!) + (j > 0 ? Math.abs(T[(j - 1) * m + j]!) : 0);
      scaleSeen = Math.max(scaleSeen, diagScale);
      if (j + 1 >= m) break;
      if (beta <= 1e-13 * Math.max(scaleSeen, 1e-300) || beta === 0) {
        // Invariant subspace: continue with a fresh direction orthogonal to everything so far.
        fillRandom(w, rng);
        if (!normalizeInComplement(w, locked, V, j + 1, op.complex)) {
          exhausted = true;
          beta = 0;
          break;
        }
        beta = 0;
        T[j * m + j + 1] = 0;
        T[(j + 1) * m + j] = 0;
      } else {
        scale(w, 1 / beta);
        T[j * m + j + 1] = beta;
        T[(j + 1) * m + j] = beta;
      }
      V[j + 1] = w;
      w = new Float64Array(len);
    }
    if (p >= room) exhausted = true;
    const sub = new Float64Array(p * p);
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) sub[i * p + j] = T[i * m + j]!;
    const { values: theta, vectors: Y } = symmetricEigen(sub, p);
    for (let i = 0; i < p; i++) scaleSeen = Math.max(scaleSeen, Math.abs(theta[i]!));
    const tolAbs = opts.tol * Math.max(scaleSeen, 1e-300);
    const k = Math.min(need, p);
    let allConverged = true;
    let firstResidual = 0;
    for (let i = 0; i < k; i++) {
      const r = exhausted ? 0 : Math.abs(beta * Y[(p - 1) * p + i]!);
      if (i === 0) firstResidual = r;
      if (r > tolAbs) allConverged = false;
    }
    opts.onProgress?.({ matvecs: counter.matvecs, restarts, residual: firstResidual, energy: theta[0]! });
    const outOfBudget = counter.matvecs >= opts.maxMatvecs;
    if (allConverged || exhausted || outOfBudget) {
      const vectors = ritzVectors(V, Y, p, k, len);
      return { values: Array.from(theta.subarray(0, k)), vectors, converged: allConverged || exhausted, exhausted, steps, restarts, scale: scaleSeen };
    }
    // Thick restart: keep the lowest Ritz vectors plus the residual direction (w, not yet normalised).
    const keep = Math.max(k, Math.min(p - 2, k + Math.floor((m - k) / 2)));
    const newBasis = ritzVectors(V, Y, p, keep, len);
    let coupling = beta;
    if (beta > 1e-13 * scaleSeen) scale(w, 1 / beta);
    else {
      fillRandom(w, rng);
      coupling = 0;
    }
    T.fill(0);
    for (let i = 0; i < keep; i++) {
      const s = coupling * Y[(p - 1) * p + i]!;
      T[i * m + i] = theta[i]!;
      T[i * m + keep] = s;
      T[keep * m + i] = s;
    }
    V.length = 0;
    for (const v of newBasis) V.push(v);
    if (coupling === 0 && !normalizeInComplement(w, locked, V, keep, op.complex)) {
      const vectors = newBasis.slice(0, k);
      return { values: Array.from(theta.subarray(0, k)), vectors, converged: true, exhausted: true, steps, restarts, scale: scaleSeen };
    }
    V.push(w);
    w = new Float64Array(len);
    kept = keep;
    restarts++;
  }
}

/** Ritz vectors x_i = Σ_j V_j Y[j][i] for i < k, formed element by element to avoid k extra copies at once. */
function ritzVectors(V: Float64Array[], Y: Float64Array, p: number, k: number, len: number): Float64Array[] {
  const out: Float64Array[] = [];
  for (let i = 0; i < k; i++) out.push(new Float64Array(len));
  for (let j = 0; j < p; j++) {
    const vj = V[j]!;
    for (let i = 0; i < k; i++) {
      const y = Y[j * p + i]!;
      if (y === 0) continue;
      const o = out[i]!;
      for (let e = 0; e < len; e++) o[e]! += y * vj[e]!;
    }
  }
  return out;
}

function fillRandom(v: Float64Array, rng: { next(): number }): void {
  for (let i = 0; i < v.length; i++) v[i] = rng.next() - 0.5;
}

/** Orthogonalise against both sets and normalise; false when nothing is left (the space is exhausted). */
function normalizeInComplement(v: Float64Array, locked: Float64Array[], V: Float64Array[], count: number, complex: boolean): boolean {
  const before = norm(v);
  orthogonalize(v, locked, locked.length, complex);
  orthogonalize(v, V, count, complex);
  const after = norm(v);
  if (!(after > 1e-10 * before)) return false;
  scale(v, 1 / after);
  return true;
}
