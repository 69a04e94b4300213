import { BitspanError } from '../errors.js';
import { hermitianPart, type ComplexMatrix } from '../solvers/complexMatrix.js';
import { hermitianEigen, type HermitianEigen } from '../solvers/hermitianEigen.js';
import type { KrylovMatrices, MatrixOrigin } from './krylovMatrices.js';

/** How many standard errors a deviation from Hermiticity or positivity may reach before it is an error. */
export const CHECK_SIGMAS = 5;
/** Relative tolerance of the checks for entries without errors (rounding in the user's pipeline). */
export const CHECK_RELATIVE_TOLERANCE = 1e-8;

/** What the checks measured. */
export interface MatrixChecks {
  /** Largest |A_jk − conj(A_kj)| in H̃ and in S. */
  hermiticity: { h: number; s: number };
  /** Smallest eigenvalue of S and how far below zero it was allowed to be. */
  minOverlapEigenvalue: number;
  psdTolerance: number;
}

/** Checked matrices: Hermitian parts of H̃ and S and the eigen-decomposition of S. */
export interface CheckedKrylovMatrices {
  h: ComplexMatrix;
  s: ComplexMatrix;
  overlap: HermitianEigen;
  checks: MatrixChecks;
}

/**
 * Check that H̃ and S are Hermitian and S positive semidefinite within the element errors (each
 * difference within CHECK_SIGMAS combined standard errors, plus `tolerance`, by default
 * CHECK_RELATIVE_TOLERANCE·max|entry|); return their Hermitian parts. Throws `bad-matrices`
 * naming the file and, for CSV input, the line of the offending row.
 */
export function checkKrylovMatrices(m: KrylovMatrices, tolerance?: number): CheckedKrylovMatrices {
  const devH = checkHermitian(m.h, m.hErr, m.origins.h, tolerance);
  const devS = checkHermitian(m.s, m.sErr, m.origins.s, tolerance);
  const s = hermitianPart(m.s);
  const overlap = hermitianEigen(s);
  const n = s.n;
  const lambdaMax = Math.max(Math.abs(overlap.values[0]!), Math.abs(overlap.values[n - 1]!));
  // ‖ΔS‖₂ ≤ ‖ΔS‖_F, and E‖ΔS‖²_F is the sum of the element variances.
  let variance = 0;
  if (m.sErr) for (let i = 0; i < n * n; i++) variance += m.sErr.re[i]! ** 2 + m.sErr.im[i]! ** 2;
  const psdTolerance = CHECK_SIGMAS * Math.sqrt(variance) + (tolerance ?? CHECK_RELATIVE_TOLERANCE * lambdaMax);
  const minEig = overlap.values[0]!;
  if (!(minEig >= -psdTolerance)) {
    throw new BitspanError(
      'bad-matrices',
      `S is not positive semidefinite: its smallest eigenvalue is ${fmt(minEig)}, below the allowed −${fmt(psdTolerance)}${m.sErr ? ` (${CHECK_SIGMAS}× the noise norm of sErr)` : ''}`,
      m.sErr ? 'check that "s" holds the overlaps ⟨ψ_j|ψ_k⟩ and that sErr is not too small' : 'S of states is positive semidefinite; if S is noisy give its element errors (sErr / --s-err) or --check-tol',
      { file: m.origins.s.file },
    );
  }
  return { h: hermitianPart(m.h), s, overlap, checks: { hermiticity: { h: devH, s: devS }, minOverlapEigenvalue: minEig, psdTolerance } };
}

function checkHermitian(a: ComplexMatrix, err: ComplexMatrix | null, origin: MatrixOrigin, tolerance: number | undefined): number {
  const n = a.n;
  let maxAbs = 0;
  for (let i = 0; i < n * n; i++) maxAbs = Math.max(maxAbs, Math.abs(a.re[i]!), Math.abs(a.im[i]!));
  const floor = tolerance ?? CHECK_RELATIVE_TOLERANCE * maxAbs;
  let worst = 0;
  const label = origin.name === 'h' ? 'H̃' : 'S';
  for (let j = 0; j < n; j++) {
    for (let k = j; k < n; k++) {
      const jk = j * n + k;
      const kj = k * n + j;
      const dRe = a.re[jk]! - a.re[kj]!;
      const dIm = a.im[jk]! + a.im[kj]!;
      worst = Math.max(worst, Math.hypot(dRe, dIm));
      const allowRe = floor + (err ? CHECK_SIGMAS * Math.hypot(err.re[jk]!, err.re[kj]!) : 0);
      const allowIm = floor + (err ? CHECK_SIGMAS * Math.hypot(err.im[jk]!, err.im[kj]!) : 0);
      if (Math.abs(dRe) <= allowRe && Math.abs(dIm) <= allowIm) continue;
      const part = Math.abs(dRe) > allowRe ? 'real' : 'imaginary';
      const diff = part === 'real' ? Math.abs(dRe) : Math.abs(dIm);
      const allow = part === 'real' ? allowRe : allowIm;
      const what =
        j === k
          ? `${label}[${j}][${j}] = ${cfmt(a.re[jk]!, a.im[jk]!)} has an imaginary part ${fmt(diff / 2)} but a diagonal entry of a Hermitian matrix is real`
          : `${label} is not Hermitian: ${label}[${j}][${k}] = ${cfmt(a.re[jk]!, a.im[jk]!)} but conj(${label}[${k}][${j}]) = ${cfmt(a.re[kj]!, -a.im[kj]!)} (${part} parts differ by ${fmt(diff)})`;
      throw new BitspanError(
        'bad-matrices',
        `${what}, more than the allowed ${fmt(allow)}${err ? ` (${CHECK_SIGMAS} standard errors)` : ''}`,
        err ? `check row ${j} and column ${j}; entry (k, j) must be the complex conjugate of (j, k)` : `entry (k, j) must be the complex conjugate of (j, k); if the matrix is noisy give element errors (${origin.name}Err) or --check-tol`,
        { file: origin.file, line: origin.rowLines ? origin.rowLines[j] : undefined },
      );
    }
  }
  return worst;
}

const fmt = (x: number): string => (x === 0 ? '0' : Math.abs(x) >= 1e-3 && Math.abs(x) < 1e4 ? String(Number(x.toPrecision(4))) : x.toExponential(3));
const cfmt = (re: number, im: number): string => `${fmt(re)}${im < 0 ? '−' : '+'}${fmt(Math.abs(im))}i`;
