import { describe, expect, it } from 'vitest';
import { erf } from 'mathjs';
import { seededNormal } from '../../src/util/normal.js';
import { closeTo } from '../helpers.js';

describe('seededNormal', () => {
  it('seededNormal gives the same stream for the same seed and another for another seed', () => {
    const a = seededNormal(5);
    const b = seededNormal(5);
    const c = seededNormal(6);
    const xs = Array.from({ length: 8 }, () => a.next());
    expect(Array.from({ length: 8 }, () => b.next())).toEqual(xs);
    expect(Array.from({ length: 8 }, () => c.next())).not.toEqual(xs);
  });

  it('seededNormal matches the standard normal distribution (CDF via mathjs erf)', () => {
    const g = seededNormal(42);
    const n = 100_000;
    const xs = Array.from({ length: n }, () => g.next());
    const mean = xs.reduce((s, x) => s + x, 0) / n;
    const variance = xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1);
    // Mean 0 and variance 1 within ~4 standard errors (1/√n and √(2/n)).
    closeTo(mean, 0, 4 / Math.sqrt(n), 'mean');
    closeTo(variance, 1, 4 * Math.sqrt(2 / n), 'variance');
    // Empirical CDF against Φ(x) = (1 + erf(x/√2))/2 (outside reference: mathjs erf); the
    // Dvoretzky–Kiefer–Wolfowitz bound gives sup|F_n − Φ| < 0.0068 with probability 1 − 1e-4.
    xs.sort((p, q) => p - q);
    for (const x of [-2.5, -1, -0.3, 0, 0.7, 1.5, 3]) {
      let count = 0;
      while (count < n && xs[count]! <= x) count++;
      closeTo(count / n, 0.5 * (1 + erf(x / Math.SQRT2)), 0.0068, `CDF at ${x}`);
    }
  });
});
