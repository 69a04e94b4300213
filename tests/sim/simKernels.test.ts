import { describe, expect, it } from 'vitest';
import { fullSpaceOperator, applyFullSpace } from '../../src/sim/fullSpaceOperator.js';
import { gershgorinBounds } from '../../src/sim/spectralBounds.js';
import { LocalKernels } from '../../src/sim/simKernels.js';
import { PauliSumBuilder } from '../../src/operators/pauliSum.js';
import { createState } from '../../src/sim/stateVector.js';
import { denseFromPauliSum, hermitianEigenvalues } from '../helpers.js';
import { expmEvolve } from './expmReference.js';
import { cloneState, distance, randomPauliSum, randomState } from './simHelpers.js';

describe('applyFullSpace', () => {
  it('applyFullSpace computes αHx + βx + γy like the Kronecker-product matrix', () => {
    for (const complex of [false, true]) {
      const n = 5;
      const h = randomPauliSum(n, 12, complex ? 3 : 4, complex);
      const op = fullSpaceOperator(h, n);
      const dense = denseFromPauliSum(h, n);
      const x = randomState(n, 5);
      const y = randomState(n, 6);
      const y0 = cloneState(y);
      const [alpha, beta, gamma] = [0.7, -0.3, 1.5];
      applyFullSpace(op, x.re, x.im, y.re, y.im, alpha, beta, gamma);
      let err = 0;
      for (let i = 0; i < op.dim; i++) {
        let sr = 0;
        let si = 0;
        for (let j = 0; j < op.dim; j++) {
          const hr = dense.re[i * op.dim + j]!;
          const hi = dense.im[i * op.dim + j]!;
          sr += hr * x.re[j]! - hi * x.im[j]!;
          si += hr * x.im[j]! + hi * x.re[j]!;
        }
        const er = alpha * sr + beta * x.re[i]! + gamma * y0.re[i]!;
        const ei = alpha * si + beta * x.im[i]! + gamma * y0.im[i]!;
        err = Math.max(err, Math.abs(er - y.re[i]!), Math.abs(ei - y.im[i]!));
      }
      expect(err).toBeLessThan(1e-13);
    }
  });
});

describe('gershgorinBounds', () => {
  it('gershgorinBounds encloses the spectrum from dense diagonalisation (ml-matrix)', () => {
    const h = randomPauliSum(5, 15, 8, true);
    const ev = hermitianEigenvalues(denseFromPauliSum(h, 5));
    const b = gershgorinBounds(fullSpaceOperator(h, 5));
    expect(b.lower).toBeLessThanOrEqual(ev[0]! + 1e-12);
    expect(b.upper).toBeGreaterThanOrEqual(ev[ev.length - 1]! - 1e-12);
  });
});

describe('LocalKernels.rotateGroup', () => {
  it('LocalKernels.rotateGroup applies e^{−iτcP} for single X, Y and mixed Pauli strings like mathjs expm', () => {
    const n = 4;
    for (const ops of [[['X', 1]], [['Y', 2]], [['Y', 0], ['Z', 1], ['X', 3]], [['X', 0], ['Y', 1], ['Y', 2], ['Z', 3]], [['Y', 0], ['Y', 3]]] as Array<Array<['X' | 'Y' | 'Z', number]>>) {
      const b = new PauliSumBuilder(n);
      b.add(0.8, ops);
      const h = b.finish(true);
      const op = fullSpaceOperator(h, n);
      const psi = randomState(n, 3);
      const out = cloneState(psi);
      new LocalKernels(op).rotateGroup(out, 0, Int32Array.of(0), Float64Array.of(0.37));
      expect(distance(out, expmEvolve(denseFromPauliSum(h, n), psi, 0.37))).toBeLessThan(1e-12);
    }
  });

  it('LocalKernels.energyMoments returns ⟨H⟩ and ⟨H²⟩ of a basis state', () => {
    const b = new PauliSumBuilder(3);
    b.add(0.5, [['Z', 0]]);
    b.add(2, [['X', 1]]);
    const op = fullSpaceOperator(b.finish(true), 3);
    const psi = createState(3);
    psi.re[0] = 1;
    const m = new LocalKernels(op).energyMoments(psi);
    // H|000⟩ = 0.5|000⟩ + 2|010⟩: ⟨H⟩ = 0.5, ⟨H²⟩ = 0.25 + 4.
    expect(m.first).toBeCloseTo(0.5, 14);
    expect(m.second).toBeCloseTo(4.25, 14);
  });
});
