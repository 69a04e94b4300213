import { describe, expect, it } from 'vitest';
import { firstOrderEnergyError } from '../../src/analysis/energyError.js';
import { leadingBlock } from '../../src/solvers/complexMatrix.js';
import { thresholdedGeneralizedEigen } from '../../src/solvers/thresholdedGeneralizedEigen.js';
import { addHermitianNoise, closeTo, heisenbergKrylov, uniformErrors } from '../helpers.js';

const fx = await heisenbergKrylov(4, 0.3, 5);

describe('firstOrderEnergyError', () => {
  it('firstOrderEnergyError matches the Hellmann–Feynman derivative of E for one perturbed pair', () => {
    // dE/dx for H̃_jk → H̃_jk + x, H̃_kj → H̃_kj + x is 2·Re(conj(c_j)c_k) (Hellmann–Feynman with
    // c†Sc = 1, common practice); with only that pair carrying error σ, the first-order error is σ·|dE/dx|.
    const base = thresholdedGeneralizedEigen(fx.h, fx.s, { threshold: 0 });
    const n = fx.h.n;
    const [j, k] = [1, 3];
    const step = 1e-6;
    const shifted = (x: number): number => {
      const h = leadingBlock(fx.h, n);
      h.re[j * n + k] = h.re[j * n + k]! + x;
      h.re[k * n + j] = h.re[k * n + j]! + x;
      return thresholdedGeneralizedEigen(h, fx.s, { threshold: 0 }).energies[0]!;
    };
    const derivative = (shifted(step) - shifted(-step)) / (2 * step); // central difference
    const err = uniformErrors(n, 0);
    err.re[j * n + k] = 1;
    err.re[k * n + j] = 1;
    const predicted = firstOrderEnergyError(base.vectorsRe, base.vectorsIm, base.energies[0]!, err, null);
    closeTo(predicted, Math.abs(derivative), 1e-4 * Math.abs(derivative) + 1e-8, '|dE/dx|');
  });

  it('firstOrderEnergyError matches the Monte Carlo spread of E for small noise', () => {
    const sigma = 1e-7;
    const base = thresholdedGeneralizedEigen(fx.h, fx.s, { threshold: 0 });
    const predicted = firstOrderEnergyError(base.vectorsRe, base.vectorsIm, base.energies[0]!, uniformErrors(5, 3 * sigma), uniformErrors(5, sigma));
    const samples = 2000;
    const es: number[] = [];
    for (let seed = 0; seed < samples; seed++) {
      const h = addHermitianNoise(fx.h, 3 * sigma, 2 * seed + 1);
      const s = addHermitianNoise(fx.s, sigma, 2 * seed + 2);
      es.push(thresholdedGeneralizedEigen(h, s, { threshold: 0 }).energies[0]!);
    }
    const mean = es.reduce((a, x) => a + x, 0) / samples;
    const std = Math.sqrt(es.reduce((a, x) => a + (x - mean) ** 2, 0) / (samples - 1));
    // Sample std of 2000 normal draws is within ~7% (4 standard errors, √(1/(2·2000)) ≈ 1.6%).
    expect(Math.abs(std / predicted - 1)).toBeLessThan(0.07);
  });
});
