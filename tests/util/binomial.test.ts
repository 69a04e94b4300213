import { describe, expect, it } from 'vitest';
import { binomial } from '../../src/util/binomial.js';
import { seededUniform } from '../../src/util/random.js';

/** Sample mean and variance of `draws` seeded Binomial(n, p) deviates. */
function moments(n: number, p: number, draws: number, seed: number): { mean: number; variance: number; min: number; max: number } {
  const u = seededUniform(seed);
  let s = 0;
  let s2 = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < draws; i++) {
    const x = binomial(n, p, u);
    s += x;
    s2 += x * x;
    min = Math.min(min, x);
    max = Math.max(max, x);
  }
  const mean = s / draws;
  return { mean, variance: s2 / draws - mean * mean, min, max };
}

describe('binomial', () => {
  // Reference: Binomial(n, p) has mean np and variance np(1−p) (published formula, any probability text).
  for (const [n, p] of [[20, 0.3], [1000, 0.5], [1_000_000, 0.02], [1_000_000, 0.97]] as const) {
    it(`binomial(${n}, ${p}) has mean np and variance np(1−p) over 20000 seeded draws`, () => {
      const draws = 20000;
      const m = moments(n, p, draws, 11);
      const v = n * p * (1 - p);
      // The sample mean has standard error √(v/draws); 5 of them is a loose but safe bound.
      expect(Math.abs(m.mean - n * p)).toBeLessThan(5 * Math.sqrt(v / draws));
      // The sample variance of a near-normal variable has relative standard error √(2/draws) ≈ 1 %.
      expect(Math.abs(m.variance / v - 1)).toBeLessThan(0.06);
      expect(m.min).toBeGreaterThanOrEqual(0);
      expect(m.max).toBeLessThanOrEqual(n);
    });
  }

  it('binomial returns 0 or n at p = 0 or 1, and the same stream for the same seed', () => {
    const u = seededUniform(1);
    expect(binomial(500, 0, u)).toBe(0);
    expect(binomial(500, 1, u)).toBe(500);
    const a = Array.from({ length: 50 }, ((g) => () => binomial(5000, 0.4, g))(seededUniform(7)));
    const b = Array.from({ length: 50 }, ((g) => () => binomial(5000, 0.4, g))(seededUniform(7)));
    expect(a).toEqual(b);
  });
});
