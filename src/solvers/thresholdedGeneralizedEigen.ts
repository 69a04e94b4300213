import { complexMatrix, type ComplexMatrix } from './complexMatrix.js';
import { hermitianEigen, type HermitianEigen } from './hermitianEigen.js';

/** Settings of one thresholded solve. */
export interface ThresholdedOptions {
  /** Keep the eigenvalues of S strictly above this absolute value (0: every positive one). */
  threshold: number;
  /** Number of lowest energies wanted (default 1); fewer come back when fewer directions are kept. */
  eigs?: number;
  /** `hermitianEigen(s)`, when the caller already has it (scans reuse one decomposition). */
  overlap?: HermitianEigen;
}

/** Energies of the thresholded pencil with what they came from. */
export interface ThresholdedSolution {
  threshold: number;
  /** Number of eigenvectors of S kept (the dimension of the solved problem). */
  keptDimension: number;
  /** Largest over smallest kept eigenvalue of S (NaN when nothing is kept). */
  condition: number;
  /** Lowest energies, ascending. */
  energies: Float64Array;
  /** ‖H̃c − E·S·c‖₂ for each energy, with c normalised so that c†Sc = 1. */
  residuals: Float64Array;
  /** Coefficients c in the Krylov basis: component j of vector k at [j*energies.length + k]. */
  vectorsRe: Float64Array;
  vectorsIm: Float64Array;
}

/**
 * Solve H̃c = E·S·c for Hermitian H̃ and positive semidefinite S after discarding the eigenvectors
 * of S with eigenvalue at or below `threshold` (Epperly, Lin & Nakatsukasa, "A theory of quantum
 * subspace diagonalization", SIAM J. Matrix Anal. Appl. 43 (2022) 1263): with S = UΛU† and
 * W = U_kept·Λ_kept^{-1/2}, the energies are the eigenvalues of the Hermitian matrix W†H̃W.
 */
export function thresholdedGeneralizedEigen(h: ComplexMatrix, s: ComplexMatrix, options: ThresholdedOptions): ThresholdedSolution {
  const n = s.n;
  if (h.n !== n) throw new RangeError(`H̃ is ${h.n}×${h.n} but S is ${n}×${n}`);
  const overlap = options.overlap ?? hermitianEigen(s);
  const lambda = overlap.values;
  let first = 0;
  while (first < n && !(lambda[first]! > options.threshold)) first++;
  const m = n - first;
  const condition = m > 0 ? lambda[n - 1]! / lambda[first]! : Number.NaN;
  const want = Math.min(options.eigs ?? 1, m);
  const empty = new Float64Array(0);
  if (m === 0) return { threshold: options.threshold, keptDimension: 0, condition, energies: empty, residuals: empty, vectorsRe: empty, vectorsIm: empty };

  // W = U_kept Λ^{-1/2}, n×m row-major.
  const wRe = new Float64Array(n * m);
  const wIm = new Float64Array(n * m);
  for (let a = 0; a < m; a++) {
    const col = first + a;
    const scale = 1 / Math.sqrt(lambda[col]!);
    for (let j = 0; j < n; j++) {
      wRe[j * m + a] = overlap.vectorsRe[j * n + col]! * scale;
      wIm[j * m + a] = overlap.vectorsIm[j * n + col]! * scale;
    }
  }
  const hw = multiply(h.re, h.im, n, n, wRe, wIm, m);
  // Projected matrix W†(H̃W), m×m.
  const proj = complexMatrix(m);
  for (let a = 0; a < m; a++) {
    for (let b = 0; b < m; b++) {
      let sr = 0;
      let si = 0;
      for (let j = 0; j < n; j++) {
        const xr = wRe[j * m + a]!;
        const xi = -wIm[j * m + a]!;
        const yr = hw.re[j * m + b]!;
        const yi = hw.im[j * m + b]!;
        sr += xr * yr - xi * yi;
        si += xr * yi + xi * yr;
      }
      proj.re[a * m + b] = sr;
      proj.im[a * m + b] = si;
    }
  }
  const small = hermitianEigen(proj);

  const energies = new Float64Array(want);
  const residuals = new Float64Array(want);
  const vectorsRe = new Float64Array(n * want);
  const vectorsIm = new Float64Array(n * want);
  for (let k = 0; k < want; k++) {
    const e = small.values[k]!;
    energies[k] = e;
    // c = W y_k
    const cRe = new Float64Array(n);
    const cIm = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      let sr = 0;
      let si = 0;
      for (let a = 0; a < m; a++) {
        const xr = wRe[j * m + a]!;
        const xi = wIm[j * m + a]!;
        const yr = small.vectorsRe[a * m + k]!;
        const yi = small.vectorsIm[a * m + k]!;
        sr += xr * yr - xi * yi;
        si += xr * yi + xi * yr;
      }
      cRe[j] = sr;
      cIm[j] = si;
      vectorsRe[j * want + k] = sr;
      vectorsIm[j * want + k] = si;
    }
    const hc = multiply(h.re, h.im, n, n, cRe, cIm, 1);
    const sc = multiply(s.re, s.im, n, n, cRe, cIm, 1);
    let r2 = 0;
    for (let j = 0; j < n; j++) {
      const dr = hc.re[j]! - e * sc.re[j]!;
      const di = hc.im[j]! - e * sc.im[j]!;
      r2 += dr * dr + di * di;
    }
    residuals[k] = Math.sqrt(r2);
  }
  return { threshold: options.threshold, keptDimension: m, condition, energies, residuals, vectorsRe, vectorsIm };
}

// (rows×inner) · (inner×cols), all row-major complex.
function multiply(aRe: Float64Array, aIm: Float64Array, rows: number, inner: number, bRe: Float64Array, bIm: Float64Array, cols: number): { re: Float64Array; im: Float64Array } {
  const re = new Float64Array(rows * cols);
  const im = new Float64Array(rows * cols);
  for (let j = 0; j < rows; j++) {
    for (let l = 0; l < inner; l++) {
      const xr = aRe[j * inner + l]!;
      const xi = aIm[j * inner + l]!;
      if (xr === 0 && xi === 0) continue;
      for (let b = 0; b < cols; b++) {
        const yr = bRe[l * cols + b]!;
        const yi = bIm[l * cols + b]!;
        re[j * cols + b] += xr * yr - xi * yi;
        im[j * cols + b] += xr * yi + xi * yr;
      }
    }
  }
  return { re, im };
}
