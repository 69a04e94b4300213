import { describe, expect, it } from 'vitest';
import { hadamardTestNoise, type NoisyKrylovMatrices } from '../../src/sim/hadamardTestNoise.js';
import type { SimulatedKrylovMatrices } from '../../src/sim/krylovMatrixRecorder.js';
import { heisenbergKrylov } from '../helpers.js';

// Exact H~ and S of the open Heisenberg chain from mathjs expm (tests/helpers.ts), λ = Σ|c| = 9.
const fx = await heisenbergKrylov(4, 0.3, 8);
const exact: SimulatedKrylovMatrices = { h: fx.h, s: fx.s };
const LAMBDA = 9;
const n = fx.h.n;

/** Deviations (noisy − exact) of every estimated part of the upper triangle, and their recorded errors. */
function deviations(noisy: NoisyKrylovMatrices): { dev: number[]; err: number[] } {
  const dev: number[] = [];
  const err: number[] = [];
  for (let j = 0; j < n; j++) {
    for (let k = j; k < n; k++) {
      const a = j * n + k;
      dev.push(noisy.h.re[a]! - fx.h.re[a]!);
      err.push(noisy.hErr.re[a]!);
      if (j === k) continue;
      dev.push(noisy.h.im[a]! - fx.h.im[a]!, noisy.s.re[a]! - fx.s.re[a]!, noisy.s.im[a]! - fx.s.im[a]!);
      err.push(noisy.hErr.im[a]!, noisy.sErr.re[a]!, noisy.sErr.im[a]!);
    }
  }
  return { dev, err };
}

const rms = (xs: number[]): number => Math.sqrt(xs.reduce((a, x) => a + x * x, 0) / xs.length);

describe('hadamardTestNoise', () => {
  it('hadamardTestNoise errors shrink like 1/sqrt(N): N and 100N at a fixed seed differ by about 10', () => {
    const a = deviations(hadamardTestNoise(exact, { shots: 1000, scale: LAMBDA, seed: 4 }));
    const b = deviations(hadamardTestNoise(exact, { shots: 100_000, scale: LAMBDA, seed: 4 }));
    // Standard error of a mean of N ±1 outcomes is √((1−x²)/N) (common practice): √100 = 10.
    const ratio = rms(a.dev) / rms(b.dev);
    expect(ratio).toBeGreaterThan(5);
    expect(ratio).toBeLessThan(20);
    // The recorded errors scale exactly so.
    for (let i = 0; i < a.err.length; i++) if (a.err[i]! > 0) expect(a.err[i]! / b.err[i]!).toBeCloseTo(10, 9);
  });

  it('hadamardTestNoise records honest errors: deviations divided by hErr/sErr have rms near 1', () => {
    const z: number[] = [];
    for (const seed of [1, 2, 3, 4, 5]) {
      const { dev, err } = deviations(hadamardTestNoise(exact, { shots: 400, scale: LAMBDA, seed }));
      dev.forEach((d, i) => z.push(d / err[i]!));
    }
    // ~5 × 120 standardised deviations: their rms is 1 within a few percent (common practice).
    expect(rms(z)).toBeGreaterThan(0.85);
    expect(rms(z)).toBeLessThan(1.15);
  });

  it('hadamardTestNoise keeps Hermiticity, diag S = 1 exactly, real diagonals, and is reproducible per seed', () => {
    const m = hadamardTestNoise(exact, { shots: 500, scale: LAMBDA, seed: 9 });
    for (let j = 0; j < n; j++) {
      expect(m.s.re[j * n + j]).toBe(1);
      expect(m.sErr.re[j * n + j]).toBe(0);
      expect(Math.abs(m.h.im[j * n + j]!)).toBe(0);
      for (let k = 0; k < n; k++) {
        for (const a of [m.h, m.s, m.hErr, m.sErr]) expect(a.re[j * n + k]).toBe(a.re[k * n + j]);
        for (const a of [m.h, m.s]) expect(a.im[j * n + k]! + a.im[k * n + j]!).toBe(0);
        // H~/λ estimates lie in [−1, 1]: each is a mean of ±1 outcomes.
        expect(Math.abs(m.h.re[j * n + k]!)).toBeLessThanOrEqual(LAMBDA);
      }
    }
    const again = hadamardTestNoise(exact, { shots: 500, scale: LAMBDA, seed: 9 });
    expect(Array.from(again.h.re)).toEqual(Array.from(m.h.re));
    const other = hadamardTestNoise(exact, { shots: 500, scale: LAMBDA, seed: 10 });
    expect(Array.from(other.h.re)).not.toEqual(Array.from(m.h.re));
  });
});
