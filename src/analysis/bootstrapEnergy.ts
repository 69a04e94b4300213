import { complexMatrix, type ComplexMatrix } from '../solvers/complexMatrix.js';
import { thresholdedGeneralizedEigen } from '../solvers/thresholdedGeneralizedEigen.js';
import { seededNormal, type NormalSource } from '../util/normal.js';
import { pairErrorSquared } from './energyError.js';

/** Spread of the lowest energy over resampled matrices. */
export interface BootstrapSummary {
  samples: number;
  seed: number;
  threshold: number;
  mean: number;
  std: number;
  /** 2.5% and 97.5% quantiles: the central 95% of the resampled energies. */
  low: number;
  high: number;
  /** Resamples in which no direction of S passed the threshold (left out of the statistics). */
  empty: number;
}

/**
 * Parametric bootstrap: add seeded Gaussian noise with the element errors to the Hermitian parts
 * of H̃ and S (each pair (j,k),(k,j) perturbed once, conjugate-symmetrically), solve at the fixed
 * absolute `threshold`, and summarise the lowest energy. Same seed, same result.
 */
export function bootstrapEnergy(
  h: ComplexMatrix,
  s: ComplexMatrix,
  hErr: ComplexMatrix | null,
  sErr: ComplexMatrix | null,
  options: { samples: number; seed: number; threshold: number },
): BootstrapSummary {
  const g = seededNormal(options.seed);
  const energies: number[] = [];
  for (let b = 0; b < options.samples; b++) {
    const hb = perturb(h, hErr, g);
    const sb = perturb(s, sErr, g);
    const sol = thresholdedGeneralizedEigen(hb, sb, { threshold: options.threshold });
    if (sol.energies.length > 0) energies.push(sol.energies[0]!);
  }
  const m = energies.length;
  const mean = energies.reduce((a, x) => a + x, 0) / m;
  const std = m > 1 ? Math.sqrt(energies.reduce((a, x) => a + (x - mean) ** 2, 0) / (m - 1)) : Number.NaN;
  energies.sort((x, y) => x - y);
  return {
    samples: options.samples,
    seed: options.seed,
    threshold: options.threshold,
    mean: m > 0 ? mean : Number.NaN,
    std,
    low: quantile(energies, 0.025),
    high: quantile(energies, 0.975),
    empty: options.samples - m,
  };
}

function perturb(a: ComplexMatrix, err: ComplexMatrix | null, g: NormalSource): ComplexMatrix {
  const n = a.n;
  const out = complexMatrix(n);
  out.re.set(a.re);
  out.im.set(a.im);
  if (!err) return out;
  for (let j = 0; j < n; j++) {
    out.re[j * n + j] = out.re[j * n + j]! + Math.sqrt(pairErrorSquared(err, j, j, 're')) * g.next();
    for (let k = j + 1; k < n; k++) {
      const x = Math.sqrt(pairErrorSquared(err, j, k, 're')) * g.next();
      const y = Math.sqrt(pairErrorSquared(err, j, k, 'im')) * g.next();
      out.re[j * n + k] = out.re[j * n + k]! + x;
      out.im[j * n + k] = out.im[j * n + k]! + y;
      out.re[k * n + j] = out.re[k * n + j]! + x;
      out.im[k * n + j] = out.im[k * n + j]! - y;
    }
  }
  return out;
}

// Linear interpolation between order statistics (type 7 of Hyndman & Fan 1996, R's default).
function quantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return Number.NaN;
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo]! + (pos - lo) * (sorted[hi]! - sorted[lo]!);
}
