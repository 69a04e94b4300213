/** A weighted straight-line fit E = energy + slope · x and its intercept's uncertainty. */
export interface LinearExtrapolation {
  /** The intercept: the energy extrapolated to x = 0. */
  energy: number;
  /** Standard error of the intercept (3+ points), or |slope · x_min| for two points. */
  uncertainty: number;
  slope: number;
  /** Points used. */
  points: number;
  /** Weighted root-mean-square residual of the fit (0 for two points). */
  rms: number;
}

/**
 * Weighted least-squares line through (x_i, y_i), extrapolated to x = 0. Weights are 1/x_i²: the
 * departure from linearity grows with the distance to extrapolate, so points near x = 0 count most
 * (common practice for variance and PT2 extrapolation in selected CI). A point with x = 0 is exact
 * and is returned as is. Needs two distinct x; returns null otherwise.
 */
export function extrapolate(x: readonly number[], y: readonly number[]): LinearExtrapolation | null {
  const pts: Array<[number, number]> = [];
  for (let i = 0; i < x.length; i++) if (Number.isFinite(x[i]) && Number.isFinite(y[i])) pts.push([x[i]!, y[i]!]);
  if (pts.length === 0) return null;
  const scale = Math.max(...pts.map(([a]) => Math.abs(a)));
  const exact = pts.filter(([a]) => Math.abs(a) <= 1e-15 * Math.max(scale, 1e-300) || a === 0);
  if (exact.length > 0) {
    const best = Math.min(...exact.map(([, b]) => b));
    return { energy: best, uncertainty: 0, slope: 0, points: pts.length, rms: 0 };
  }
  let sw = 0;
  let sx = 0;
  let sy = 0;
  for (const [a, b] of pts) {
    const w = 1 / (a * a);
    sw += w;
    sx += w * a;
    sy += w * b;
  }
  const mx = sx / sw;
  const my = sy / sw;
  // Centred sums: stable when all x are close together.
  let sxx = 0;
  let sxy = 0;
  for (const [a, b] of pts) {
    const w = 1 / (a * a);
    sxx += w * (a - mx) ** 2;
    sxy += w * (a - mx) * (b - my);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  const energy = my - slope * mx;
  const n = pts.length;
  let rss = 0;
  for (const [a, b] of pts) rss += ((b - energy - slope * a) / a) ** 2;
  if (n === 2) {
    const xmin = Math.min(...pts.map(([a]) => Math.abs(a)));
    return { energy, uncertainty: Math.abs(slope * xmin), slope, points: n, rms: 0 };
  }
  // Var(intercept) = s² (1/Σw + x̄²/Sxx) with s² = Σ w r² / (n − 2) (weighted least squares).
  const s2 = rss / (n - 2);
  const uncertainty = Math.sqrt(s2 * (1 / sw + (mx * mx) / sxx));
  return { energy, uncertainty, slope, points: n, rms: Math.sqrt(rss / sw) };
}
