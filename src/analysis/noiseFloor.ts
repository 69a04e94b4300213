import type { ComplexMatrix } from '../solvers/complexMatrix.js';
import { pairErrorSquared } from './energyError.js';

/**
 * Threshold below which eigenvalues of S cannot be told from noise: the largest of (a) the
 * expected spectral norm of the noise, 2·√(r·v̄) with v̄ the mean element variance (edge of the
 * Wigner semicircle, common practice), when element errors are given; (b) minus the most negative
 * eigenvalue of S, since the S of any states is positive semidefinite; (c) rounding, 10·r·ε·λ_max.
 */
export function overlapNoiseFloor(overlapValues: ArrayLike<number>, sErr: ComplexMatrix | null): number {
  const r = overlapValues.length;
  const lambdaMin = overlapValues[0]!;
  const lambdaMax = Math.max(Math.abs(lambdaMin), Math.abs(overlapValues[r - 1]!));
  let floor = 10 * r * Number.EPSILON * lambdaMax;
  if (lambdaMin < 0) floor = Math.max(floor, -lambdaMin);
  if (sErr) {
    let sum = 0;
    let count = 0;
    for (let j = 0; j < r; j++) {
      for (let k = j; k < r; k++) {
        sum += pairErrorSquared(sErr, j, k, 're') + (j === k ? 0 : pairErrorSquared(sErr, j, k, 'im'));
        count++;
      }
    }
    floor = Math.max(floor, 2 * Math.sqrt((r * sum) / count));
  }
  return floor;
}
