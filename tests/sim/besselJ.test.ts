import { describe, expect, it } from 'vitest';
import { besselJSequence } from '../../src/sim/besselJ.js';
import { closeTo } from '../helpers.js';

/** Bessel's integral J_n(x) = (1/π) ∫_0^π cos(nτ − x sin τ) dτ (Abramowitz & Stegun 9.1.21), Simpson's rule. */
function besselIntegral(n: number, x: number): number {
  const m = 4000;
  const h = Math.PI / m;
  let s = 0;
  for (let i = 0; i <= m; i++) {
    const w = i === 0 || i === m ? 1 : i % 2 ? 4 : 2;
    s += w * Math.cos(n * i * h - x * Math.sin(i * h));
  }
  return (s * h) / 3 / Math.PI;
}

describe('besselJSequence', () => {
  it('besselJSequence matches Bessel’s integral for small and large arguments', () => {
    for (const x of [0.01, 0.7, 3, 12.5, 40]) {
      const j = besselJSequence(x);
      for (const n of [0, 1, 2, 5, Math.floor(x), Math.floor(x) + 3]) {
        if (n < j.length) closeTo(j[n]!, besselIntegral(n, x), 1e-12, `J_${n}(${x})`);
      }
    }
  });

  it('besselJSequence gives J0(1) = 0.7651976866 and J1(1) = 0.4400505857 (A&S table 9.1, from memory)', () => {
    const j = besselJSequence(1);
    closeTo(j[0]!, 0.7651976866, 1e-10, 'J0(1)');
    closeTo(j[1]!, 0.4400505857, 1e-10, 'J1(1)');
    // Verified another way: the integral representation.
    closeTo(j[0]!, besselIntegral(0, 1), 1e-12, 'J0(1) integral');
  });

  it('besselJSequence is cut where the terms fall below the cutoff, beyond the argument', () => {
    for (const x of [0.5, 5, 50, 300]) {
      const j = besselJSequence(x);
      expect(j.length - 1).toBeGreaterThan(x);
      expect(Math.abs(j[j.length - 1]!)).toBeGreaterThan(1e-17);
      // Neumann's identity J0 + 2 Σ J_2k = 1 (A&S 9.1.46) holds for the kept terms.
      let s = j[0]!;
      for (let k = 2; k < j.length; k += 2) s += 2 * j[k]!;
      closeTo(s, 1, 1e-13, `normalisation at x=${x}`);
    }
    expect(Array.from(besselJSequence(0))).toEqual([1]);
  });
});
