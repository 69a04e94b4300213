import fc from 'fast-check';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { tridiagonalLowest } from '../../src/solvers/tridiagonalLowest.js';

describe('tridiagonalLowest', () => {
  it('tridiagonalLowest matches ml-matrix on random symmetric tridiagonal matrices (value, vector, largest magnitude)', () => {
    // Subnormal entries are folded to 0: the reference decomposition is not meant for them.
    const entry = fc.double({ min: -50, max: 50, noNaN: true }).map((v) => (Math.abs(v) < 1e-12 ? 0 : v));
    fc.assert(
      fc.property(fc.array(fc.tuple(entry, entry), { minLength: 1, maxLength: 60 }), (pairs) => {
        const n = pairs.length;
        const alpha = pairs.map((p) => p[0]);
        const beta = pairs.slice(0, n - 1).map((p) => p[1]);
        const dense = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? alpha[i]! : Math.abs(i - j) === 1 ? beta[Math.min(i, j)]! : 0)));
        // Reference: ml-matrix's symmetric eigendecomposition (a registry library).
        const ref = new EigenvalueDecomposition(new Matrix(dense), { assumeSymmetric: true }).realEigenvalues.sort((a, b) => a - b);
        const got = tridiagonalLowest(alpha, beta);
        const scale = Math.max(1, Math.abs(ref[0]!), Math.abs(ref[n - 1]!));
        expect(Math.abs(got.value - ref[0]!)).toBeLessThan(1e-11 * scale);
        expect(Math.abs(got.maxAbs - Math.max(Math.abs(ref[0]!), Math.abs(ref[n - 1]!)))).toBeLessThan(1e-11 * scale);
        // ‖T v − λ v‖ small and ‖v‖ = 1 (the eigenvector up to sign).
        let res = 0;
        let nv = 0;
        for (let i = 0; i < n; i++) {
          let tv = alpha[i]! * got.vector[i]!;
          if (i > 0) tv += beta[i - 1]! * got.vector[i - 1]!;
          if (i + 1 < n) tv += beta[i]! * got.vector[i + 1]!;
          res += (tv - got.value * got.vector[i]!) ** 2;
          nv += got.vector[i]! ** 2;
        }
        expect(Math.abs(nv - 1)).toBeLessThan(1e-12);
        // Degenerate lowest eigenvalues (e.g. a zero β splitting the matrix) still give an eigenvector.
        expect(Math.sqrt(res)).toBeLessThan(1e-8 * scale);
      }),
      { numRuns: 300, seed: 12 },
    );
  });
});
