import { hermitianPart, type ComplexMatrix } from './complexMatrix.js';

/** Eigenpairs of a Hermitian matrix, ascending; vectors column-wise like `symmetricEigen`. */
export interface HermitianEigen {
  n: number;
  values: Float64Array;
  /** Component j of eigenvector k is vectorsRe[j*n + k] + i·vectorsIm[j*n + k]. */
  vectorsRe: Float64Array;
  vectorsIm: Float64Array;
  sweeps: number;
  /** Whether a sweep found nothing left to rotate (always so far; kept for the solver contract). */
  converged: boolean;
}

const MAX_SWEEPS = 100;

/**
 * All eigenpairs of a small complex Hermitian matrix by cyclic Jacobi rotations (the input is
 * replaced by its Hermitian part first). Jacobi is simple, needs no complex arithmetic library and
 * gives graded positive definite matrices eigenvalues accurate to their own size (Demmel & Veselić
 * 1992), where QR-type methods are accurate only relative to the largest.
 */
export function hermitianEigen(input: ComplexMatrix): HermitianEigen {
  const { n } = input;
  const a = hermitianPart(input);
  const re = a.re;
  const im = a.im;
  const vRe = new Float64Array(n * n);
  const vIm = new Float64Array(n * n);
  for (let j = 0; j < n; j++) vRe[j * n + j] = 1;
  let sweeps = 0;
  let converged = false;
  for (; sweeps < MAX_SWEEPS; sweeps++) {
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const pq = p * n + q;
        const g = Math.hypot(re[pq]!, im[pq]!);
        const app = re[p * n + p]!;
        const aqq = re[q * n + q]!;
        // Skip when negligible relative to both diagonals (the relative-accuracy criterion of
        // Demmel & Veselić 1992); an absolute cut against the largest entry would lose that.
        if (g <= 1e-300 || g <= 1e-17 * Math.sqrt(Math.abs(app * aqq))) continue;
        rotated = true;
        // Phase e^{-iφ} on column q makes a_pq real (= g); then a real Jacobi rotation
        // (Numerical Recipes convention: t = sgn(τ)/(|τ| + √(1+τ²)), τ = (a_qq − a_pp)/2g).
        const ph = re[pq]! / g;
        const phIm = -im[pq]! / g; // e^{-iφ} = conj(a_pq)/|a_pq|
        const tau = (aqq - app) / (2 * g);
        const t = (tau >= 0 ? 1 : -1) / (Math.abs(tau) + Math.sqrt(1 + tau * tau));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = t * c;
        // Columns: new_p = c·a_p − s·e^{-iφ}·a_q, new_q = s·a_p + c·e^{-iφ}·a_q; rows by Hermiticity.
        for (let k = 0; k < n; k++) {
          if (k === p || k === q) continue;
          const kp = k * n + p;
          const kq = k * n + q;
          const xr = re[kp]!;
          const xi = im[kp]!;
          const yr = re[kq]! * ph - im[kq]! * phIm;
          const yi = re[kq]! * phIm + im[kq]! * ph;
          const npr = c * xr - s * yr;
          const npi = c * xi - s * yi;
          const nqr = s * xr + c * yr;
          const nqi = s * xi + c * yi;
          re[kp] = npr;
          im[kp] = npi;
          re[kq] = nqr;
          im[kq] = nqi;
          re[p * n + k] = npr;
          im[p * n + k] = -npi;
          re[q * n + k] = nqr;
          im[q * n + k] = -nqi;
        }
        re[p * n + p] = app - t * g;
        re[q * n + q] = aqq + t * g;
        im[p * n + p] = 0;
        im[q * n + q] = 0;
        re[pq] = 0;
        im[pq] = 0;
        re[q * n + p] = 0;
        im[q * n + p] = 0;
        for (let k = 0; k < n; k++) {
          const kp = k * n + p;
          const kq = k * n + q;
          const xr = vRe[kp]!;
          const xi = vIm[kp]!;
          const yr = vRe[kq]! * ph - vIm[kq]! * phIm;
          const yi = vRe[kq]! * phIm + vIm[kq]! * ph;
          vRe[kp] = c * xr - s * yr;
          vIm[kp] = c * xi - s * yi;
          vRe[kq] = s * xr + c * yr;
          vIm[kq] = s * xi + c * yi;
        }
      }
    }
    if (!rotated) {
      converged = true;
      break;
    }
  }
  const order = Array.from({ length: n }, (_, i) => i).sort((x, y) => re[x * n + x]! - re[y * n + y]!);
  const values = new Float64Array(n);
  const vectorsRe = new Float64Array(n * n);
  const vectorsIm = new Float64Array(n * n);
  order.forEach((src, k) => {
    values[k] = re[src * n + src]!;
    for (let j = 0; j < n; j++) {
      vectorsRe[j * n + k] = vRe[j * n + src]!;
      vectorsIm[j * n + k] = vIm[j * n + src]!;
    }
  });
  return { n, values, vectorsRe, vectorsIm, sweeps, converged };
}
