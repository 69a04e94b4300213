import { leadingBlock, type ComplexMatrix } from '../solvers/complexMatrix.js';
import { thresholdedGeneralizedEigen } from '../solvers/thresholdedGeneralizedEigen.js';

/** The thresholded solution of the leading r′×r′ block. */
export interface DimensionScanPoint {
  dimension: number;
  keptDimension: number;
  condition: number;
  energies: number[];
  residuals: number[];
}

/**
 * Energies of the leading r′×r′ blocks of H̃ and S, r′ = 1..r, at one absolute threshold: how the
 * estimate converges as Krylov vectors are added.
 */
export function dimensionScan(h: ComplexMatrix, s: ComplexMatrix, threshold: number, eigs = 1): DimensionScanPoint[] {
  const out: DimensionScanPoint[] = [];
  for (let m = 1; m <= s.n; m++) {
    const sol = thresholdedGeneralizedEigen(leadingBlock(h, m), leadingBlock(s, m), { threshold, eigs });
    out.push({ dimension: m, keptDimension: sol.keptDimension, condition: sol.condition, energies: Array.from(sol.energies), residuals: Array.from(sol.residuals) });
  }
  return out;
}
