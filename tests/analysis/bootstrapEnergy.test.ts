import { describe, expect, it } from 'vitest';
import { bootstrapEnergy } from '../../src/analysis/bootstrapEnergy.js';
import { firstOrderEnergyError } from '../../src/analysis/energyError.js';
import { thresholdedGeneralizedEigen } from '../../src/solvers/thresholdedGeneralizedEigen.js';
import { closeTo, heisenbergKrylov, uniformErrors } from '../helpers.js';

const fx = await heisenbergKrylov(4, 0.3, 5);

describe('bootstrapEnergy', () => {
  it('bootstrapEnergy is reproducible for a seed and its spread matches first-order propagation', () => {
    const hErr = uniformErrors(5, 3e-6);
    const sErr = uniformErrors(5, 1e-6);
    const a = bootstrapEnergy(fx.h, fx.s, hErr, sErr, { samples: 1000, seed: 7, threshold: 0 });
    const b = bootstrapEnergy(fx.h, fx.s, hErr, sErr, { samples: 1000, seed: 7, threshold: 0 });
    expect(b).toEqual(a);
    const c = bootstrapEnergy(fx.h, fx.s, hErr, sErr, { samples: 1000, seed: 8, threshold: 0 });
    expect(c.mean).not.toBe(a.mean);
    const base = thresholdedGeneralizedEigen(fx.h, fx.s, { threshold: 0 });
    const predicted = firstOrderEnergyError(base.vectorsRe, base.vectorsIm, base.energies[0]!, hErr, sErr);
    // Sample std of 1000 draws: within 10% (≈4.5 standard errors of 2.2%).
    expect(Math.abs(a.std / predicted - 1)).toBeLessThan(0.1);
    closeTo(a.mean, base.energies[0]!, 4 * predicted / Math.sqrt(1000), 'mean');
    // The central 95% of a normal spans ±1.96σ (common practice).
    closeTo((a.high - a.low) / (2 * 1.96 * predicted), 1, 0.15, 'interval width / 3.92σ');
    expect(a.low).toBeLessThan(a.mean);
    expect(a.high).toBeGreaterThan(a.mean);
    expect(a.empty).toBe(0);
  });

  it('bootstrapEnergy without errors has no spread', () => {
    const z = bootstrapEnergy(fx.h, fx.s, null, null, { samples: 5, seed: 1, threshold: 0 });
    expect(z.std).toBe(0);
    expect(z.low).toBe(z.high);
  });
});
