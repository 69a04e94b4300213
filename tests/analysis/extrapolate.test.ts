import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { extrapolate } from '../../src/analysis/extrapolate.js';
import { closeTo } from '../helpers.js';

describe('extrapolate', () => {
  it('extrapolate recovers the known intercept and slope of exact synthetic lines', () => {
    // Reference: a straight line y = a + b·x is fitted exactly by least squares with any positive
    // weights (Gauss–Markov, common practice), so the intercept is a and the uncertainty 0.
    fc.assert(
      fc.property(
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.double({ min: -5, max: 5, noNaN: true }),
        fc.uniqueArray(fc.double({ min: 1e-3, max: 10, noNaN: true }), { minLength: 3, maxLength: 8 }),
        (a, b, xs) => {
          fc.pre(Math.max(...xs) / Math.min(...xs) > 1.01);
          const fit = extrapolate(xs, xs.map((x) => a + b * x))!;
          closeTo(fit.energy, a, 1e-9 * (1 + Math.abs(a) + Math.abs(b) * 10), 'intercept');
          closeTo(fit.slope, b, 1e-7 * (1 + Math.abs(b)), 'slope');
          expect(fit.uncertainty).toBeLessThan(1e-7 * (1 + Math.abs(a) + Math.abs(b)));
          expect(fit.points).toBe(xs.length);
        },
      ),
      { numRuns: 100, seed: 7 },
    );
  });

  it('extrapolate on noisy synthetic data lands within a few standard errors of the known intercept', () => {
    // Synthetic energies E = E0 + k·σ² + noise ∝ σ² (the weighting model): the intercept estimate
    // is unbiased, so over many seeds it falls within 3 reported standard errors nearly always.
    const E0 = -12.5;
    let inside = 0;
    const runs = 200;
    let s = 12345;
    const gauss = (): number => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      const u1 = (s + 1) / 4294967297;
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      const u2 = s / 4294967296;
      return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
    };
    for (let r = 0; r < runs; r++) {
      const xs = [0.05, 0.1, 0.2, 0.4, 0.8, 1.6];
      const ys = xs.map((x) => E0 + 0.7 * x + 0.01 * x * gauss());
      const fit = extrapolate(xs, ys)!;
      if (Math.abs(fit.energy - E0) <= 3 * fit.uncertainty) inside++;
    }
    expect(inside / runs).toBeGreaterThan(0.9);
  });

  it('extrapolate returns an exact point as is, and null without two distinct x', () => {
    expect(extrapolate([0, 1, 2], [-3, -2, -1])!.energy).toBe(-3);
    expect(extrapolate([1], [-3])).toBeNull();
    expect(extrapolate([1, 1], [-3, -2])).toBeNull();
    expect(extrapolate([], [])).toBeNull();
  });

  it('extrapolate with two points passes through both and reports the extrapolation step as uncertainty', () => {
    const fit = extrapolate([1, 2], [-9, -8])!;
    closeTo(fit.energy, -10, 1e-12, 'intercept');
    closeTo(fit.uncertainty, 1, 1e-12, '|slope · x_min|');
  });
});
