import type { ComplexMatrix } from '../solvers/complexMatrix.js';
import { hermitianEigen, type HermitianEigen } from '../solvers/hermitianEigen.js';
import { thresholdedGeneralizedEigen, type ThresholdedSolution } from '../solvers/thresholdedGeneralizedEigen.js';
import { firstOrderEnergyError } from './energyError.js';

/** One threshold of a scan and what the thresholded problem gave there. */
export interface ScanPoint {
  /** Absolute threshold on the eigenvalues of S. */
  threshold: number;
  /** The threshold over the largest eigenvalue of S. */
  relativeThreshold: number;
  keptDimension: number;
  condition: number;
  /** Lowest energies, ascending (empty when nothing is kept). */
  energies: number[];
  residuals: number[];
  /** First-order standard error of the lowest energy from the element errors, or null without errors. */
  energyError: number | null;
}

/** Range and density of a scan; thresholds are relative to the largest eigenvalue of S. */
export interface ThresholdScanOptions {
  from?: number;
  to?: number;
  stepsPerDecade?: number;
  eigs?: number;
  overlap?: HermitianEigen;
  hErr?: ComplexMatrix | null;
  sErr?: ComplexMatrix | null;
}

/** Defaults of a scan: 1e-14 to 1 times λ_max(S), ten points per decade. */
export const SCAN_DEFAULTS = { from: 1e-14, to: 1, stepsPerDecade: 10 } as const;

/**
 * Solve the thresholded problem on a logarithmic grid of thresholds, ascending; S is decomposed
 * once and each kept dimension solved once, since the answer only changes when the threshold
 * crosses an eigenvalue of S.
 */
export function thresholdScan(h: ComplexMatrix, s: ComplexMatrix, options: ThresholdScanOptions = {}): ScanPoint[] {
  const from = options.from ?? SCAN_DEFAULTS.from;
  const to = options.to ?? SCAN_DEFAULTS.to;
  const steps = options.stepsPerDecade ?? SCAN_DEFAULTS.stepsPerDecade;
  if (!(from > 0 && to >= from && steps >= 1)) throw new RangeError(`bad scan range ${from}..${to}, ${steps} per decade`);
  const overlap = options.overlap ?? hermitianEigen(s);
  const n = s.n;
  const lambdaMax = overlap.values[n - 1]!;
  const decades = Math.log10(to / from);
  const count = Math.max(1, Math.round(decades * steps) + 1);
  const byKept = new Map<number, { sol: ThresholdedSolution; error: number | null }>();
  const points: ScanPoint[] = [];
  for (let i = 0; i < count; i++) {
    // Grid points are exact powers of ten at whole decades (from·10^{i/steps}).
    const rel = count === 1 ? from : from * 10 ** ((i * decades) / (count - 1));
    const threshold = rel * lambdaMax;
    let kept = 0;
    for (let k = n - 1; k >= 0 && overlap.values[k]! > threshold; k--) kept++;
    let cached = byKept.get(kept);
    if (!cached) {
      const sol = thresholdedGeneralizedEigen(h, s, { threshold, eigs: options.eigs ?? 1, overlap });
      const want = sol.energies.length;
      let error: number | null = null;
      if (want > 0 && (options.hErr || options.sErr)) {
        const cRe = new Float64Array(n);
        const cIm = new Float64Array(n);
        for (let j = 0; j < n; j++) {
          cRe[j] = sol.vectorsRe[j * want]!;
          cIm[j] = sol.vectorsIm[j * want]!;
        }
        error = firstOrderEnergyError(cRe, cIm, sol.energies[0]!, options.hErr ?? null, options.sErr ?? null);
      }
      cached = { sol, error };
      byKept.set(kept, cached);
    }
    const { sol, error } = cached;
    points.push({
      threshold,
      relativeThreshold: rel,
      keptDimension: sol.keptDimension,
      condition: sol.condition,
      energies: Array.from(sol.energies),
      residuals: Array.from(sol.residuals),
      energyError: error,
    });
  }
  return points;
}
