import { describe, expect, it } from 'vitest';
import { BitspanError } from '../../src/errors.js';
import { checkKrylovMatrices } from '../../src/io/checkKrylovMatrices.js';
import type { KrylovMatrices } from '../../src/io/krylovMatrices.js';
import { hermitianPart, type ComplexMatrix } from '../../src/solvers/complexMatrix.js';
import { addHermitianNoise, heisenbergKrylov, uniformErrors, errorOf as code } from '../helpers.js';

const fx = await heisenbergKrylov(4, 0.3, 6);

function input(h: ComplexMatrix, s: ComplexMatrix, hErr: ComplexMatrix | null = null, sErr: ComplexMatrix | null = null, csv = false): KrylovMatrices {
  const lines = csv ? Array.from({ length: h.n }, (_, j) => j + 2) : null;
  return {
    h, s, hErr, sErr,
    origins: { h: { file: 'h.csv', name: 'h', rowLines: lines }, s: { file: 's.csv', name: 's', rowLines: lines }, hErr: null, sErr: null },
  };
}

describe('checkKrylovMatrices', () => {
  it('checkKrylovMatrices accepts exact Krylov matrices and returns Hermitian parts and the spectrum of S', () => {
    const c = checkKrylovMatrices(input(fx.h, fx.s));
    expect(c.checks.hermiticity.h).toBeLessThan(1e-12);
    // Gram matrices are positive semidefinite (common practice); here S is singular past r = 5.
    expect(c.checks.minOverlapEigenvalue).toBeGreaterThan(-1e-12);
    expect(c.overlap.values.length).toBe(6);
  });

  it('checkKrylovMatrices rejects a non-Hermitian H̃ with bad-matrices, the file and the row line', () => {
    const h = hermitianPart(fx.h);
    h.im[1 * 6 + 3] = h.im[1 * 6 + 3]! + 1e-3; // break (1,3) vs (3,1)
    const e = code(() => checkKrylovMatrices(input(h, fx.s, null, null, true)));
    expect(e.code).toBe('bad-matrices');
    expect(e.file).toBe('h.csv');
    expect(e.line).toBe(3); // row 1 sits on line 3 of this CSV
    expect(e.message).toMatch(/not Hermitian.*\[1\]\[3\]/);
  });

  it('checkKrylovMatrices rejects a complex diagonal entry', () => {
    const s = hermitianPart(fx.s);
    s.im[2 * 6 + 2] = 0.01;
    const e = code(() => checkKrylovMatrices(input(fx.h, s)));
    expect(e.code).toBe('bad-matrices');
    expect(e.file).toBe('s.csv');
    expect(e.message).toMatch(/S\[2\]\[2\].*real/);
  });

  it('checkKrylovMatrices tolerates independent noise within the element errors, not beyond them', () => {
    // Entries measured independently on both triangles: not Hermitian, but within 5 errors.
    const sigma = 1e-3;
    const h = addHermitianNoise(fx.h, 0, 1);
    for (let i = 0; i < 36; i++) h.im[i] = h.im[i]! + sigma * Math.sin(7 * i); // |Δ| ≤ σ per entry
    expect(() => checkKrylovMatrices(input(h, fx.s, uniformErrors(6, sigma), null))).not.toThrow();
    expect(code(() => checkKrylovMatrices(input(h, fx.s))).code).toBe('bad-matrices');
  });

  it('checkKrylovMatrices rejects an S that is not positive semidefinite, but accepts noisy S within its errors', () => {
    const noisy = addHermitianNoise(fx.s, 1e-3, 3);
    // Noise makes eigenvalues of the singular S negative: an error without errors given…
    const e = code(() => checkKrylovMatrices(input(fx.h, noisy)));
    expect(e.code).toBe('bad-matrices');
    expect(e.message).toMatch(/not positive semidefinite/);
    // …and fine with them.
    expect(checkKrylovMatrices(input(fx.h, noisy, null, uniformErrors(6, 1e-3))).checks.minOverlapEigenvalue).toBeLessThan(0);
    // H̃ in place of S (indefinite, eigenvalues of order 1) is caught even with errors.
    expect(code(() => checkKrylovMatrices(input(fx.s, fx.h, null, uniformErrors(6, 1e-3)))).code).toBe('bad-matrices');
  });
});
