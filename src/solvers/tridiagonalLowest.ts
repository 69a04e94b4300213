/**
 * The lowest eigenpair of a real symmetric tridiagonal matrix (alpha on the diagonal, beta beside
 * it) and its largest eigenvalue magnitude, without a dense decomposition: Sturm-sequence
 * bisection for the extreme eigenvalues, then inverse iteration for the vector. Shifted just
 * below the lowest eigenvalue the matrix is positive definite, so the LDLᵀ solve needs no pivoting.
 */
export function tridiagonalLowest(alpha: ArrayLike<number>, beta: ArrayLike<number>): { value: number; vector: Float64Array; maxAbs: number } {
  const n = alpha.length;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const r = (i > 0 ? Math.abs(beta[i - 1]!) : 0) + (i + 1 < n ? Math.abs(beta[i]!) : 0);
    lo = Math.min(lo, alpha[i]! - r);
    hi = Math.max(hi, alpha[i]! + r);
  }
  const extent = Math.max(Math.abs(lo), Math.abs(hi));
  // Inverse iteration works on T / scale, so pivots and growth stay within range.
  const scale = extent > 0 ? extent : 1;
  let maxB2 = 0;
  for (let i = 0; i + 1 < n; i++) maxB2 = Math.max(maxB2, beta[i]! * beta[i]!);
  // Smallest pivot magnitude allowed in the Sturm count (as in LAPACK's bisection).
  const pivmin = Math.max(1e-300, Number.EPSILON * Number.EPSILON * maxB2);
  const lowest = bisect(alpha, beta, lo, hi, 1, pivmin);
  const highest = bisect(alpha, beta, lo, hi, n, pivmin);
  const vector = inverseIteration(alpha, beta, lowest, scale);
  return { value: lowest, vector, maxAbs: Math.max(Math.abs(lowest), Math.abs(highest)) };
}

/** Number of eigenvalues below x (Sturm sequence of the LDLᵀ pivots of T − xI). */
function countBelow(alpha: ArrayLike<number>, beta: ArrayLike<number>, x: number, pivmin: number): number {
  let count = 0;
  let d = 1;
  for (let i = 0; i < alpha.length; i++) {
    const b2 = i > 0 ? beta[i - 1]! * beta[i - 1]! : 0;
    d = alpha[i]! - x - (i > 0 ? b2 / d : 0);
    // A (nearly) zero pivot becomes a tiny negative one: x sits on an eigenvalue of a leading block.
    if (Math.abs(d) < pivmin) d = -pivmin;
    if (d < 0) count++;
  }
  return count;
}

/** The k-th smallest eigenvalue (1-based) within [lo, hi], to the last bit bisection can give. */
function bisect(alpha: ArrayLike<number>, beta: ArrayLike<number>, lo: number, hi: number, k: number, pivmin: number): number {
  for (let it = 0; it < 200; it++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (countBelow(alpha, beta, mid, pivmin) >= k) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

/** Unit eigenvector for eigenvalue `lambda`: a few steps of inverse iteration with a shift just below it. */
function inverseIteration(alpha: ArrayLike<number>, beta: ArrayLike<number>, lambda: number, scale: number): Float64Array {
  const n = alpha.length;
  const sigma = lambda / scale - 1e-10;
  // LDLᵀ of T/scale − σI (positive definite): d pivots, l sub-diagonal multipliers.
  const d = new Float64Array(n);
  const l = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    d[i] = alpha[i]! / scale - sigma - (i > 0 ? (l[i - 1]! * beta[i - 1]!) / scale : 0);
    if (d[i]! < Number.EPSILON) d[i] = Number.EPSILON;
    if (i + 1 < n) l[i] = beta[i]! / scale / d[i]!;
  }
  // An irregular start (a uniform one can be orthogonal to the wanted vector, e.g. (1, −1)).
  const v = Float64Array.from({ length: n }, (_, i) => 1 + 0.5 * Math.sin(1.7 * i + 0.3));
  for (let step = 0; step < 4; step++) {
    for (let i = 1; i < n; i++) v[i]! -= l[i - 1]! * v[i - 1]!;
    for (let i = 0; i < n; i++) v[i]! /= d[i]!;
    for (let i = n - 2; i >= 0; i--) v[i]! -= l[i]! * v[i + 1]!;
    let s = 0;
    for (let i = 0; i < n; i++) s += v[i]! * v[i]!;
    const inv = 1 / Math.sqrt(s);
    for (let i = 0; i < n; i++) v[i]! *= inv;
  }
  return v;
}
