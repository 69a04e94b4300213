import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { complex, det, eigs } from 'mathjs';
import { complexMatrix, type ComplexMatrix } from '../../src/solvers/complexMatrix.js';
import { hermitianEigen } from '../../src/solvers/hermitianEigen.js';
import { seededUniform } from '../../src/util/random.js';
import { closeTo } from '../helpers.js';

function randomHermitian(n: number, seed: number): ComplexMatrix {
  const u = seededUniform(seed);
  const a = complexMatrix(n);
  for (let j = 0; j < n; j++) {
    a.re[j * n + j] = 2 * u.next() - 1;
    for (let k = j + 1; k < n; k++) {
      const x = 2 * u.next() - 1;
      const y = 2 * u.next() - 1;
      a.re[j * n + k] = x;
      a.im[j * n + k] = y;
      a.re[k * n + j] = x;
      a.im[k * n + j] = -y;
    }
  }
  return a;
}

/** Eigenvalues of the real embedding [[A, −B], [B, A]] by ml-matrix: each appears twice. */
function embeddedEigenvalues(a: ComplexMatrix): number[] {
  const n = a.n;
  const m = Matrix.zeros(2 * n, 2 * n);
  for (let j = 0; j < n; j++) {
    for (let k = 0; k < n; k++) {
      const x = a.re[j * n + k]!;
      const y = a.im[j * n + k]!;
      m.set(j, k, x);
      m.set(j + n, k + n, x);
      m.set(j, k + n, -y);
      m.set(j + n, k, y);
    }
  }
  return new EigenvalueDecomposition(m, { assumeSymmetric: true }).realEigenvalues.slice().sort((x, y) => x - y);
}

describe('hermitianEigen', () => {
  it('hermitianEigen matches the doubled spectrum of the real embedding (ml-matrix) and has small residuals', () => {
    for (const [n, seed] of [[1, 1], [2, 2], [5, 3], [12, 4], [30, 5]] as const) {
      const a = randomHermitian(n, seed);
      const e = hermitianEigen(a);
      expect(e.converged).toBe(true);
      // Quadratic convergence of cyclic Jacobi: a handful of sweeps (Golub & Van Loan §8.5.3).
      expect(e.sweeps).toBeLessThan(15);
      // Outside reference: ml-matrix symmetric QL on [[A,−B],[B,A]], whose spectrum is A's, doubled.
      const ref = embeddedEigenvalues(a);
      for (let k = 0; k < n; k++) {
        closeTo(e.values[k]!, ref[2 * k]!, 1e-12, `n=${n} λ${k}`);
        closeTo(e.values[k]!, ref[2 * k + 1]!, 1e-12, `n=${n} λ${k} (pair)`);
      }
      // Property: ‖Av − λv‖ small and V unitary.
      for (let k = 0; k < n; k++) {
        let res = 0;
        for (let j = 0; j < n; j++) {
          let sr = 0;
          let si = 0;
          for (let l = 0; l < n; l++) {
            const ar = a.re[j * n + l]!;
            const ai = a.im[j * n + l]!;
            const vr = e.vectorsRe[l * n + k]!;
            const vi = e.vectorsIm[l * n + k]!;
            sr += ar * vr - ai * vi;
            si += ar * vi + ai * vr;
          }
          sr -= e.values[k]! * e.vectorsRe[j * n + k]!;
          si -= e.values[k]! * e.vectorsIm[j * n + k]!;
          res += sr * sr + si * si;
        }
        expect(Math.sqrt(res)).toBeLessThan(1e-12 * n);
        for (let k2 = 0; k2 < n; k2++) {
          let dr = 0;
          let di = 0;
          for (let j = 0; j < n; j++) {
            const xr = e.vectorsRe[j * n + k]!;
            const xi = e.vectorsIm[j * n + k]!;
            const yr = e.vectorsRe[j * n + k2]!;
            const yi = e.vectorsIm[j * n + k2]!;
            dr += xr * yr + xi * yi;
            di += xr * yi - xi * yr;
          }
          closeTo(dr, k === k2 ? 1 : 0, 1e-13, `⟨v${k}|v${k2}⟩ real`);
          closeTo(di, 0, 1e-13, `⟨v${k}|v${k2}⟩ imag`);
        }
      }
    }
  });

  it('hermitianEigen agrees with mathjs eigs on a complex Hermitian matrix', () => {
    const a = randomHermitian(6, 11);
    const rows = Array.from({ length: 6 }, (_, j) => Array.from({ length: 6 }, (_, k) => complex(a.re[j * 6 + k]!, a.im[j * 6 + k]!)));
    // Outside reference: mathjs eigs (general complex algorithm).
    const ref = (eigs(rows).values as unknown as Array<number | { re: number }>)
      .map((v) => (typeof v === 'number' ? v : v.re))
      .sort((x, y) => x - y);
    const e = hermitianEigen(a);
    ref.forEach((v, k) => closeTo(e.values[k]!, v, 1e-10, `λ${k}`));
  });

  it('hermitianEigen finds the zero eigenvalues of a rank-deficient Gram matrix', () => {
    const n = 5;
    const a = complexMatrix(n);
    const u = seededUniform(7);
    // Gram matrix of 3 random complex vectors in C^5: rank 3, so two eigenvalues are 0 (common practice).
    const vecs = [0, 1, 2].map(() => Array.from({ length: n }, () => [2 * u.next() - 1, 2 * u.next() - 1] as const));
    for (let j = 0; j < n; j++) {
      for (let k = 0; k < n; k++) {
        let sr = 0;
        let si = 0;
        for (const v of vecs) {
          const [xr, xi] = v[j]!;
          const [yr, yi] = v[k]!;
          sr += xr * yr + xi * yi;
          si += xr * yi - xi * yr;
        }
        a.re[j * n + k] = sr;
        a.im[j * n + k] = si;
      }
    }
    const e = hermitianEigen(a);
    expect(Math.abs(e.values[0]!)).toBeLessThan(1e-14);
    expect(Math.abs(e.values[1]!)).toBeLessThan(1e-14);
    expect(e.values[2]!).toBeGreaterThan(1e-3);
    const ref = embeddedEigenvalues(a);
    for (let k = 0; k < n; k++) closeTo(e.values[k]!, ref[2 * k]!, 1e-13, `λ${k}`);
  });

  it('hermitianEigen keeps the small eigenvalues of a graded positive definite matrix to their own size', () => {
    // A = D M D with D = diag(1, 1e-4, 1e-8, 1e-12) and M a well-conditioned Hermitian positive
    // definite matrix: det A = det M · Π d², so the product of the eigenvalues is known to high
    // relative accuracy (Demmel & Veselić 1992, SIAM J. Matrix Anal. Appl. 13:1204; det via mathjs).
    const n = 4;
    const d = [1, 1e-4, 1e-8, 1e-12];
    const m = randomHermitian(n, 21);
    for (let j = 0; j < n; j++) m.re[j * n + j] = m.re[j * n + j]! + 4; // diagonally dominant ⇒ PD
    const a = complexMatrix(n);
    for (let j = 0; j < n; j++) {
      for (let k = 0; k < n; k++) {
        a.re[j * n + k] = d[j]! * m.re[j * n + k]! * d[k]!;
        a.im[j * n + k] = d[j]! * m.im[j * n + k]! * d[k]!;
      }
    }
    const rows = Array.from({ length: n }, (_, j) => Array.from({ length: n }, (_, k) => complex(m.re[j * n + k]!, m.im[j * n + k]!)));
    const detM = det(rows) as unknown as { re: number };
    const expected = detM.re * d.reduce((p, x) => p * x * x, 1);
    const e = hermitianEigen(a);
    const product = e.values.reduce((p, x) => p * x, 1);
    expect(e.values[0]!).toBeGreaterThan(0);
    closeTo(product / expected, 1, 1e-10, 'product of eigenvalues / det');
  });
});
