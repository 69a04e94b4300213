import { describe, expect, it } from 'vitest';
import { corruptShots, countShots, sampleDump, sampleShots, timeSeed } from '../../src/sim/sampleDump.js';
import { createState } from '../../src/sim/stateVector.js';
import { seededUniform } from '../../src/util/random.js';
import { randomState } from './simHelpers.js';

/**
 * Upper χ² quantile by the Wilson–Hilferty cube-root normal approximation (common practice);
 * z = 3.0902 is the standard normal 0.999 quantile (from memory, checked below against the
 * tabulated χ²_{0.999}(10) = 29.588, also from memory).
 */
function chiSquareQuantile999(df: number): number {
  const z = 3.0902;
  const a = 2 / (9 * df);
  return df * (1 - a + z * Math.sqrt(a)) ** 3;
}

describe('sampleShots', () => {
  it('sampleShots frequencies pass a chi-square test against |ψ_b|² at a fixed seed', () => {
    expect(Math.abs(chiSquareQuantile999(10) - 29.588)).toBeLessThan(0.2);
    const psi = randomState(7, 5);
    const shots = 40000;
    const drawn = sampleShots(psi, shots, seededUniform(99));
    const d = countShots(drawn);
    const observed = new Float64Array(psi.dim);
    d.configs.forEach((c, i) => (observed[c] = d.counts[i]!));
    let chi2 = 0;
    let bins = 0;
    let restExpected = 0;
    let restObserved = 0;
    for (let b = 0; b < psi.dim; b++) {
      const expected = shots * (psi.re[b]! ** 2 + psi.im[b]! ** 2);
      if (expected < 5) {
        restExpected += expected;
        restObserved += observed[b]!;
        continue;
      }
      chi2 += (observed[b]! - expected) ** 2 / expected;
      bins++;
    }
    if (restExpected > 0) {
      chi2 += (restObserved - restExpected) ** 2 / restExpected;
      bins++;
    }
    expect(bins).toBeGreaterThan(100);
    expect(chi2).toBeLessThan(chiSquareQuantile999(bins - 1));
    // And not suspiciously perfect: above the lower 0.001 tail (mirror of the same approximation).
    const a = 2 / (9 * (bins - 1));
    expect(chi2).toBeGreaterThan((bins - 1) * (1 - a - 3.0902 * Math.sqrt(a)) ** 3);
  });

  it('sampleShots never draws a configuration of zero probability', () => {
    const psi = createState(5);
    psi.re[3] = Math.sqrt(0.25);
    psi.im[17] = Math.sqrt(0.75);
    const d = countShots(sampleShots(psi, 5000, seededUniform(1)));
    expect(Array.from(d.configs)).toEqual([3, 17]);
    expect(Math.abs(d.counts[1]! / 5000 - 0.75)).toBeLessThan(4 * Math.sqrt((0.75 * 0.25) / 5000));
  });
});

describe('corruptShots', () => {
  const rate = (shots: Uint32Array, qubits: number): number => {
    let ones = 0;
    for (const s of shots) for (let q = 0; q < qubits; q++) ones += (s >>> q) & 1;
    return ones / (shots.length * qubits);
  };
  const within = (p: number, expected: number, n: number): void => {
    // Binomial: four standard deviations.
    expect(Math.abs(p - expected)).toBeLessThan(4 * Math.sqrt((expected * (1 - expected)) / n));
  };

  it('corruptShots applies readout error per bit: 0→1 with p01 and 1→0 with p10', () => {
    const n = 20000;
    const zeros = new Uint32Array(n);
    corruptShots(zeros, 8, { p01: 0.03, p10: 0.2, flip: 0 }, seededUniform(3));
    within(rate(zeros, 8), 0.03, n * 8);
    const ones = new Uint32Array(n).fill(0xff);
    corruptShots(ones, 8, { p01: 0.03, p10: 0.2, flip: 0 }, seededUniform(4));
    within(1 - rate(ones, 8), 0.2, n * 8);
  });

  it('corruptShots flips before readout: P(read 1 | 0) = f(1 − p10) + (1 − f)p01 (hand-derived)', () => {
    const n = 20000;
    const zeros = new Uint32Array(n);
    const f = 0.1;
    corruptShots(zeros, 6, { p01: 0.05, p10: 0.3, flip: f }, seededUniform(5));
    within(rate(zeros, 6), f * 0.7 + (1 - f) * 0.05, n * 6);
  });

  it('corruptShots leaves shots alone without noise', () => {
    const s = Uint32Array.of(1, 2, 3);
    corruptShots(s, 4, { p01: 0, p10: 0, flip: 0 }, seededUniform(1));
    expect(Array.from(s)).toEqual([1, 2, 3]);
  });
});

describe('sampleDump', () => {
  it('sampleDump is reproducible per seed and time index, and differs across them', () => {
    const psi = randomState(6, 1);
    const noise = { p01: 0.02, p10: 0.02, flip: 0.01 };
    const a = sampleDump(psi, 3000, noise, 7, 2);
    const b = sampleDump(psi, 3000, noise, 7, 2);
    const c = sampleDump(psi, 3000, noise, 7, 3);
    expect(Array.from(a.configs)).toEqual(Array.from(b.configs));
    expect(Array.from(a.counts)).toEqual(Array.from(b.counts));
    expect(Array.from(a.counts)).not.toEqual(Array.from(c.counts));
    expect(a.counts.reduce((s, x) => s + x, 0)).toBe(3000);
    expect(new Set([timeSeed(1, 0), timeSeed(1, 1), timeSeed(2, 0), timeSeed(0, 0)]).size).toBe(4);
  });
});
