import { binomial } from '../util/binomial.js';
import { seededUniform } from '../util/random.js';
import { complexMatrix, type ComplexMatrix } from '../solvers/complexMatrix.js';
import type { SimulatedKrylovMatrices } from './krylovMatrixRecorder.js';

/** Krylov matrices as a finite number of Hadamard tests would estimate them, with element errors. */
export interface NoisyKrylovMatrices extends SimulatedKrylovMatrices {
  /** Standard deviation of each estimated part (re, im) of H̃ and S. */
  hErr: ComplexMatrix;
  sErr: ComplexMatrix;
}

/** Options of `hadamardTestNoise`. */
export interface HadamardTestNoiseOptions {
  /** Shots per real or imaginary part of every element. */
  shots: number;
  /** λ = Σ|Pauli coefficients| (constant included): H/λ has norm ≤ 1, so each measured mean lies in [−1, 1]. */
  scale: number;
  seed: number;
}

/**
 * Replace every real and imaginary part x of S (and of H̃/λ) by the mean of `shots` ±1 outcomes of
 * mean x: 2·Binomial(N, (1+x)/2)/N − 1, times λ for H̃. The upper triangle is estimated and
 * mirrored (Hermitian), diagonal imaginary parts are 0 and diag S is exactly 1 (normalised states).
 * The errors are the estimator's standard deviations √((1−x²)/N) (times λ), from the exact x.
 */
export function hadamardTestNoise(exact: SimulatedKrylovMatrices, opts: HadamardTestNoiseOptions): NoisyKrylovMatrices {
  const n = exact.h.n;
  const rng = seededUniform(opts.seed);
  const N = opts.shots;
  const estimate = (x: number): { value: number; err: number } => {
    // Rounding can push |x| a hair past 1.
    const m = Math.min(1, Math.max(-1, x));
    return { value: (2 * binomial(N, (1 + m) / 2, rng)) / N - 1, err: Math.sqrt((1 - m * m) / N) };
  };
  const out: NoisyKrylovMatrices = { h: complexMatrix(n), s: complexMatrix(n), hErr: complexMatrix(n), sErr: complexMatrix(n) };
  const lambda = opts.scale > 0 ? opts.scale : 1;
  for (let j = 0; j < n; j++) {
    for (let k = j; k < n; k++) {
      const a = j * n + k;
      const b = k * n + j;
      // S: the diagonal is the norm, known to be 1 without measuring.
      const sRe = j === k ? { value: 1, err: 0 } : estimate(exact.s.re[a]!);
      const sIm = j === k ? { value: 0, err: 0 } : estimate(exact.s.im[a]!);
      const hRe = estimate(exact.h.re[a]! / lambda);
      const hIm = j === k ? { value: 0, err: 0 } : estimate(exact.h.im[a]! / lambda);
      // The diagonal once (no −0 from mirroring), the rest mirrored as the conjugate.
      for (const [idx, sign] of j === k ? ([[a, 1]] as const) : ([[a, 1], [b, -1]] as const)) {
        out.s.re[idx] = sRe.value;
        out.s.im[idx] = sign * sIm.value;
        out.sErr.re[idx] = sRe.err;
        out.sErr.im[idx] = sIm.err;
        out.h.re[idx] = lambda * hRe.value;
        out.h.im[idx] = sign * lambda * hIm.value;
        out.hErr.re[idx] = lambda * hRe.err;
        out.hErr.im[idx] = lambda * hIm.err;
      }
    }
  }
  return out;
}
