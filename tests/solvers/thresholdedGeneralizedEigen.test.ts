import { describe, expect, it } from 'vitest';
import { CholeskyDecomposition, EigenvalueDecomposition, inverse, Matrix } from 'ml-matrix';
import { complexMatrix, leadingBlock, type ComplexMatrix } from '../../src/solvers/complexMatrix.js';
import { hermitianEigen } from '../../src/solvers/hermitianEigen.js';
import { thresholdedGeneralizedEigen } from '../../src/solvers/thresholdedGeneralizedEigen.js';
import { addHermitianNoise, closeTo, heisenbergKrylov } from '../helpers.js';

// 4-site open Heisenberg chain, Néel start: 5 distinct reachable eigenvalues (counted in the fixture
// from ml-matrix's eigen-decomposition of the mathjs-built Hamiltonian).
const small = await heisenbergKrylov(4, 0.3, 12);

/** Real embedding [[A, −B], [B, A]] of a complex matrix, as ml-matrix. */
function embed(a: ComplexMatrix): Matrix {
  const n = a.n;
  const m = Matrix.zeros(2 * n, 2 * n);
  for (let j = 0; j < n; j++) {
    for (let k = 0; k < n; k++) {
      m.set(j, k, a.re[j * n + k]!);
      m.set(j + n, k + n, a.re[j * n + k]!);
      m.set(j, k + n, -a.im[j * n + k]!);
      m.set(j + n, k, a.im[j * n + k]!);
    }
  }
  return m;
}

/**
 * Plain generalized eigenvalues of (H, S) for positive definite S by Cholesky reduction
 * (L⁻¹HL⁻ᵀ, Golub & Van Loan §8.7.2) on the real embedding, all by ml-matrix; each appears twice.
 */
function choleskyPencil(h: ComplexMatrix, s: ComplexMatrix): number[] {
  const l = new CholeskyDecomposition(embed(s)).lowerTriangularMatrix;
  const li = inverse(l);
  const c = li.mmul(embed(h)).mmul(li.transpose());
  const sym = c.add(c.transpose()).mul(0.5);
  return new EigenvalueDecomposition(sym, { assumeSymmetric: true }).realEigenvalues.slice().sort((x, y) => x - y);
}

describe('thresholdedGeneralizedEigen', () => {
  it('thresholdedGeneralizedEigen reproduces the exact ground energy at r = the reachable dimension', () => {
    expect(small.reachableDimension).toBe(5);
    const r = small.reachableDimension;
    const h = leadingBlock(small.h, r);
    const s = leadingBlock(small.s, r);
    const sol = thresholdedGeneralizedEigen(h, s, { threshold: 1e-12 * hermitianEigen(s).values[r - 1]!, eigs: 2 });
    expect(sol.keptDimension).toBe(r);
    // Reference: lowest eigenvalue of the dense Hamiltonian by ml-matrix. Cross-check, from memory:
    // the 4-site open S=1/2 chain has E0 = −(3 + 2√3)/4 per J·S·S bond sum, and σ·σ = 4 S·S.
    closeTo(small.exactGround, -3 - 2 * Math.sqrt(3), 1e-10, 'ml-matrix ground energy vs recalled −3−2√3');
    closeTo(sol.energies[0]!, small.exactGround, 1e-9, 'Krylov E0');
    expect(sol.residuals[0]!).toBeLessThan(1e-9);
  });

  it('thresholdedGeneralizedEigen reproduces the exact ground energy of a 6-site chain at r = 14', async () => {
    const six = await heisenbergKrylov(6, 0.3, 14);
    expect(six.reachableDimension).toBe(14);
    const sol = thresholdedGeneralizedEigen(six.h, six.s, { threshold: 1e-13 * hermitianEigen(six.s).values[13]! });
    closeTo(sol.energies[0]!, six.exactGround, 1e-8, 'Krylov E0, 6 sites');
  });

  it('thresholdedGeneralizedEigen stays above the exact ground energy for every leading block (variational bound)', () => {
    let previous = Infinity;
    for (let r = 1; r <= small.reachableDimension; r++) {
      const sol = thresholdedGeneralizedEigen(leadingBlock(small.h, r), leadingBlock(small.s, r), { threshold: 1e-12 });
      expect(sol.energies[0]!).toBeGreaterThanOrEqual(small.exactGround - 1e-9);
      // Nested Krylov spaces: adding a vector never raises the lowest Ritz value (Courant–Fischer).
      expect(sol.energies[0]!).toBeLessThanOrEqual(previous + 1e-9);
      previous = sol.energies[0]!;
    }
  });

  it('thresholdedGeneralizedEigen agrees with the unregularised Cholesky solve (ml-matrix) when S is well conditioned', () => {
    const h = leadingBlock(small.h, 3);
    const s = leadingBlock(small.s, 3);
    const ov = hermitianEigen(s);
    expect(ov.values[2]! / ov.values[0]!).toBeLessThan(1e3);
    const ref = choleskyPencil(h, s);
    const thresholded = thresholdedGeneralizedEigen(h, s, { threshold: 1e-8 * ov.values[2]!, eigs: 3, overlap: ov });
    const unregularised = thresholdedGeneralizedEigen(h, s, { threshold: 0, eigs: 3, overlap: ov });
    expect(thresholded.keptDimension).toBe(3);
    for (let k = 0; k < 3; k++) {
      closeTo(thresholded.energies[k]!, ref[2 * k]!, 1e-10, `E${k} vs Cholesky`);
      closeTo(unregularised.energies[k]!, thresholded.energies[k]!, 1e-12, `E${k} unregularised vs thresholded`);
      expect(thresholded.residuals[k]!).toBeLessThan(1e-10);
    }
  });

  it('thresholdedGeneralizedEigen returns vectors with c†Sc = 1 and H̃c = E·S·c when nothing is discarded', () => {
    const h = leadingBlock(small.h, 4);
    const s = leadingBlock(small.s, 4);
    const sol = thresholdedGeneralizedEigen(h, s, { threshold: 0, eigs: 2 });
    const n = 4;
    for (let k = 0; k < 2; k++) {
      let norm = 0;
      for (let j = 0; j < n; j++) {
        for (let l = 0; l < n; l++) {
          const cjRe = sol.vectorsRe[j * 2 + k]!;
          const cjIm = sol.vectorsIm[j * 2 + k]!;
          const clRe = sol.vectorsRe[l * 2 + k]!;
          const clIm = sol.vectorsIm[l * 2 + k]!;
          const sRe = s.re[j * n + l]!;
          const sIm = s.im[j * n + l]!;
          // conj(c_j) S_jl c_l, real part
          const tRe = sRe * clRe - sIm * clIm;
          const tIm = sRe * clIm + sIm * clRe;
          norm += cjRe * tRe + cjIm * tIm;
        }
      }
      closeTo(norm, 1, 1e-10, `c${k}†Sc${k}`);
      expect(sol.residuals[k]!).toBeLessThan(1e-9);
    }
  });

  it('thresholdedGeneralizedEigen: with noise ε the thresholded error shrinks at least linearly over two decades, the unregularised does not', () => {
    // H̃ noise is 9ε: Hadamard-test estimates of H̃ sum the Pauli terms, so their shot noise grows
    // with Σ|c_P| (= 9 for 3 bonds × XX, YY, ZZ) (common practice).
    const errors = (eps: number, threshold: (eps: number) => number): number => {
      let worst = 0;
      for (let seed = 1; seed <= 4; seed++) {
        const h = addHermitianNoise(small.h, 9 * eps, seed);
        const s = addHermitianNoise(small.s, eps, 100 + seed);
        const sol = thresholdedGeneralizedEigen(h, s, { threshold: threshold(eps) });
        worst = Math.max(worst, Math.abs(sol.energies[0]! - small.exactGround));
      }
      return worst;
    };
    const eps = [1e-3, 1e-4, 1e-5];
    const thresholded = eps.map((e) => errors(e, (x) => 30 * x));
    const unregularised = eps.map((e) => errors(e, () => 0));
    // At least linear, with a factor-2 allowance per two decades.
    expect(thresholded[1]!).toBeLessThan(thresholded[0]! / 5);
    expect(thresholded[2]!).toBeLessThan(thresholded[0]! / 50);
    expect(thresholded[2]!).toBeLessThan(1e-3);
    // Unregularised: spurious directions of S at the noise level ruin it at every ε.
    expect(unregularised[2]!).toBeGreaterThan(unregularised[0]! / 10);
    expect(unregularised[2]!).toBeGreaterThan(1);
  });

  it('thresholdedGeneralizedEigen keeps nothing above the largest eigenvalue of S', () => {
    const s = complexMatrix(2);
    s.re.set([1, 0.5, 0.5, 1]);
    const h = complexMatrix(2);
    h.re.set([1, 0, 0, 2]);
    const sol = thresholdedGeneralizedEigen(h, s, { threshold: 1.5 });
    expect(sol.keptDimension).toBe(0);
    expect(sol.energies.length).toBe(0);
    const one = thresholdedGeneralizedEigen(h, s, { threshold: 1 });
    expect(one.keptDimension).toBe(1);
    closeTo(one.condition, 1, 0, 'condition of one kept eigenvalue');
    // Kept direction (1,1)/√2 of S scaled by 1/√1.5: E = (1+2)/2 / 1.5 = 1 (hand calculation).
    closeTo(one.energies[0]!, 1, 1e-14, 'E in the kept direction');
  });
});
