/**
 * Bessel functions J_0(x) … J_K(x) of the first kind for x ≥ 0, by Miller's backward recurrence
 * J_{k−1} = (2k/x) J_k − J_{k+1} normalised with J_0 + 2 Σ J_{2k} = 1 (Abramowitz & Stegun 9.12,
 * 9.1.46), stable where the forward recurrence is not. K is the last order with |J_K| > `cutoff`,
 * so Σ_{k>K} |J_k| is far below it (the tail decays faster than geometrically once k > x).
 */
export function besselJSequence(x: number, cutoff = 1e-17): Float64Array {
  if (x === 0) return Float64Array.of(1);
  // Start well above the order where J_k(x) drops below the cutoff (k ≈ x + O(x^{1/3}) + log terms).
  const start = Math.ceil(x + 12 * Math.cbrt(x) + 60);
  const j = new Float64Array(start + 2);
  j[start + 1] = 0;
  j[start] = 1e-300;
  for (let k = start; k >= 1; k--) {
    j[k - 1] = ((2 * k) / x) * j[k]! - j[k + 1]!;
    if (Math.abs(j[k - 1]!) > 1e250) {
      // Rescale everything computed so far to stay in range.
      for (let m = k - 1; m <= start; m++) j[m]! *= 1e-250;
    }
  }
  let norm = j[0]!;
  for (let k = 2; k <= start; k += 2) norm += 2 * j[k]!;
  let last = 0;
  for (let k = 0; k <= start; k++) {
    j[k]! /= norm;
    if (Math.abs(j[k]!) > cutoff) last = k;
  }
  return j.slice(0, last + 1);
}
