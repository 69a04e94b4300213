import type { UniformSource } from './random.js';

/** Below this many trials the count is drawn one Bernoulli trial at a time. */
const DIRECT_TRIALS = 64;

/**
 * One exact draw from Binomial(n, p) using `u`. Large n is halved by the order-statistic split
 * (Knuth, TAOCP vol. 2, §3.4.1 F): the a-th smallest of n uniforms is Beta(a, n+1−a), and the
 * uniforms below p lie all on one side of it; so the cost is O(log n) Beta draws plus ≤ 64 trials.
 */
export function binomial(n: number, p: number, u: UniformSource): number {
  if (p <= 0 || n <= 0) return 0;
  if (p >= 1) return n;
  let count = 0;
  while (n > DIRECT_TRIALS) {
    const a = 1 + (n >> 1);
    const b = n + 1 - a;
    const x = beta(a, b, u);
    if (x >= p) {
      n = a - 1;
      p = p / x;
    } else {
      count += a;
      n = b - 1;
      p = (p - x) / (1 - x);
    }
  }
  for (let i = 0; i < n; i++) if (u.next() < p) count++;
  return count;
}

/** Beta(a, b) for a, b ≥ 1, as X/(X+Y) of two Gamma deviates. */
function beta(a: number, b: number, u: UniformSource): number {
  const x = gamma(a, u);
  const y = gamma(b, u);
  return x / (x + y);
}

/** Gamma(a, 1) for a ≥ 1 (Marsaglia & Tsang, ACM TOMS 26, 2000), normals by Box–Muller on `u`. */
function gamma(a: number, u: UniformSource): number {
  const d = a - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    const z = Math.sqrt(-2 * Math.log(1 - u.next())) * Math.cos(2 * Math.PI * u.next());
    const t = 1 + c * z;
    if (t <= 0) continue;
    const v = t * t * t;
    const w = 1 - u.next();
    if (Math.log(w) < 0.5 * z * z + d - d * v + d * Math.log(v)) return d * v;
  }
}
