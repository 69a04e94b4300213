import { describe, expect, it } from 'vitest';
import { thresholdScan } from '../../src/analysis/thresholdScan.js';
import { hermitianEigen } from '../../src/solvers/hermitianEigen.js';
import { thresholdedGeneralizedEigen } from '../../src/solvers/thresholdedGeneralizedEigen.js';
import { closeTo, heisenbergKrylov, uniformErrors } from '../helpers.js';

const fx = await heisenbergKrylov(4, 0.3, 8);

describe('thresholdScan', () => {
  it('thresholdScan covers the decades asked for, ascending, with the density asked for', () => {
    const scan = thresholdScan(fx.h, fx.s, { from: 1e-6, to: 1e-2, stepsPerDecade: 5 });
    expect(scan.length).toBe(21);
    closeTo(scan[0]!.relativeThreshold, 1e-6, 1e-20, 'first');
    closeTo(scan[20]!.relativeThreshold, 1e-2, 1e-16, 'last');
    for (let i = 1; i < scan.length; i++) {
      expect(scan[i]!.threshold).toBeGreaterThan(scan[i - 1]!.threshold);
      expect(scan[i]!.keptDimension).toBeLessThanOrEqual(scan[i - 1]!.keptDimension);
    }
  });

  it('thresholdScan gives at every point what a direct solve gives, and noise-free energies rise with the threshold', () => {
    const overlap = hermitianEigen(fx.s);
    const scan = thresholdScan(fx.h, fx.s, { overlap, eigs: 2 });
    for (const p of scan) {
      const direct = thresholdedGeneralizedEigen(fx.h, fx.s, { threshold: p.threshold, eigs: 2 });
      expect(p.keptDimension).toBe(direct.keptDimension);
      p.energies.forEach((e, k) => closeTo(e, direct.energies[k]!, 1e-12, `E${k} at ${p.threshold}`));
      expect(p.energyError).toBeNull();
    }
    // Larger threshold ⇒ kept space is a subspace of the smaller threshold's ⇒ E0 can only rise
    // (Courant–Fischer); checked above the rounding level of S.
    const clean = scan.filter((p) => p.relativeThreshold >= 1e-12 && p.energies.length > 0);
    for (let i = 1; i < clean.length; i++) expect(clean[i]!.energies[0]!).toBeGreaterThanOrEqual(clean[i - 1]!.energies[0]! - 1e-9);
    closeTo(clean[0]!.energies[0]!, fx.exactGround, 1e-8, 'E0 at the smallest clean threshold');
  });

  it('thresholdScan reports a first-order energy error when element errors are given', () => {
    const scan = thresholdScan(fx.h, fx.s, { hErr: uniformErrors(8, 1e-3), sErr: uniformErrors(8, 1e-4) });
    for (const p of scan) {
      if (p.energies.length > 0) expect(p.energyError).toBeGreaterThan(0);
      else expect(p.energyError).toBeNull();
    }
  });
});
