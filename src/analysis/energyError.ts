import type { ComplexMatrix } from '../solvers/complexMatrix.js';

/**
 * First-order standard error of an eigenvalue E of the pencil (H̃, S) from independent element
 * errors: δE = c†(ΔH̃ − E·ΔS)c for c normalised by c†Sc = 1 (Rayleigh-quotient perturbation,
 * common practice). Noise is that of the Hermitian parts: the pair (j,k),(k,j) is one measured
 * number with the rms of the two given errors; diagonal entries carry only their real error.
 */
export function firstOrderEnergyError(cRe: ArrayLike<number>, cIm: ArrayLike<number>, energy: number, hErr: ComplexMatrix | null, sErr: ComplexMatrix | null): number {
  const n = cRe.length;
  const e2 = energy * energy;
  let variance = 0;
  for (let j = 0; j < n; j++) {
    for (let k = j; k < n; k++) {
      const vRe = pairVariance(hErr, sErr, e2, j, k, 're');
      if (j === k) {
        const w = cRe[j]! * cRe[j]! + cIm[j]! * cIm[j]!;
        variance += w * w * vRe;
        continue;
      }
      const vIm = pairVariance(hErr, sErr, e2, j, k, 'im');
      // conj(c_j)·c_k = a + ib; the pair contributes 2·Re((a + ib)(x + iy)) = 2(ax − by).
      const a = cRe[j]! * cRe[k]! + cIm[j]! * cIm[k]!;
      const b = cRe[j]! * cIm[k]! - cIm[j]! * cRe[k]!;
      variance += 4 * (a * a * vRe + b * b * vIm);
    }
  }
  return Math.sqrt(variance);
}

// Variance of the (j,k) entry of ΔH̃ − E·ΔS, one part.
function pairVariance(hErr: ComplexMatrix | null, sErr: ComplexMatrix | null, e2: number, j: number, k: number, part: 're' | 'im'): number {
  return pairErrorSquared(hErr, j, k, part) + e2 * pairErrorSquared(sErr, j, k, part);
}

/** Squared error of the Hermitian part's (j,k) entry: mean of the two given squared errors. */
export function pairErrorSquared(err: ComplexMatrix | null, j: number, k: number, part: 're' | 'im'): number {
  if (!err) return 0;
  const n = err.n;
  const a = err[part][j * n + k]!;
  const b = err[part][k * n + j]!;
  return 0.5 * (a * a + b * b);
}
