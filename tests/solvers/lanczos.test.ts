import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { lanczos, type LinearOperator } from '../../src/solvers/lanczos.js';
import { seededUniform } from '../../src/util/random.js';
import { closeTo } from '../helpers.js';

function denseOperator(a: Float64Array, n: number): LinearOperator {
  return {
    dim: n,
    complex: false,
    apply(x, y) {
      for (let i = 0; i < n; i++) {
        let s = 0;
        for (let j = 0; j < n; j++) s += a[i * n + j]! * x[j]!;
        y[i] = s;
      }
    },
  };
}

/** Q diag(d) Qᵀ with a random orthogonal Q (QR of a seeded random matrix via ml-matrix). */
function withSpectrum(d: number[], seed: number): Float64Array {
  const n = d.length;
  const rng = seededUniform(seed);
  const g = Matrix.zeros(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) g.set(i, j, rng.next() - 0.5);
  const q = new EigenvalueDecomposition(g.add(g.transpose()), { assumeSymmetric: true }).eigenvectorMatrix;
  const a = q.mmul(Matrix.diag(d)).mmul(q.transpose());
  return Float64Array.from(a.to1DArray());
}

describe('lanczos', () => {
  it('lanczos finds the lowest eigenvalues of a random symmetric matrix as ml-matrix does', () => {
    // Reference: ml-matrix EigenvalueDecomposition.
    const n = 120;
    const rng = seededUniform(5);
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) a[i * n + j] = a[j * n + i] = rng.next() - 0.5;
    const ref = new EigenvalueDecomposition(new Matrix(Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n)))), { assumeSymmetric: true }).realEigenvalues.sort((x, y) => x - y);
    const r = lanczos(denseOperator(a, n), { eigs: 4, tol: 1e-10, seed: 2 });
    expect(r.converged).toBe(true);
    for (let i = 0; i < 4; i++) closeTo(r.values[i]!, ref[i]!, 1e-9, `λ${i}`);
  });

  it('lanczos finds every copy of a degenerate eigenvalue', () => {
    const d = [-2, -2, -2, -1, 0.5, 1, 1.5, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20, 21, 22, 23, 24, 25, 26, 27, 28, 29, 30, 31, 32, 33, 34];
    const a = withSpectrum(d, 9);
    const r = lanczos(denseOperator(a, d.length), { eigs: 4, tol: 1e-10, seed: 4 });
    expect(Array.from(r.values).map((v) => Math.round(v * 1e8) / 1e8)).toEqual([-2, -2, -2, -1]);
    for (const res of r.residuals) expect(res).toBeLessThan(1e-8 * 34);
  });

  it('lanczos returns orthonormal eigenvectors with small true residuals', () => {
    const d = Array.from({ length: 60 }, (_, i) => Math.sin(i) * 3);
    const a = withSpectrum(d, 12);
    const r = lanczos(denseOperator(a, 60), { eigs: 3, tol: 1e-10, seed: 1 });
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 3; j++) {
        let s = 0;
        for (let k = 0; k < 60; k++) s += r.vectors[i]![k]! * r.vectors[j]![k]!;
        closeTo(s, i === j ? 1 : 0, 1e-9, `⟨v${i}|v${j}⟩`);
      }
    const sorted = d.slice().sort((x, y) => x - y);
    for (let i = 0; i < 3; i++) closeTo(r.values[i]!, sorted[i]!, 1e-9);
  });

  it('lanczos handles dimensions 1 and 2 and more wanted pairs than the dimension', () => {
    const one = lanczos(denseOperator(Float64Array.from([3.5]), 1), { eigs: 2 });
    expect(Array.from(one.values)).toEqual([3.5]);
    const two = lanczos(denseOperator(Float64Array.from([0, 1, 1, 0]), 2), { eigs: 2 });
    closeTo(two.values[0]!, -1, 1e-12);
    closeTo(two.values[1]!, 1, 1e-12);
  });

  it('lanczos is reproducible for a fixed seed and reports when it runs out of budget', () => {
    const d = Array.from({ length: 300 }, (_, i) => i * 0.01 + (i % 7) * 1e-3);
    const a = withSpectrum(d, 3);
    const r1 = lanczos(denseOperator(a, 300), { eigs: 1, seed: 8 });
    const r2 = lanczos(denseOperator(a, 300), { eigs: 1, seed: 8 });
    expect(r1.values[0]).toBe(r2.values[0]);
    const short = lanczos(denseOperator(a, 300), { eigs: 1, seed: 8, maxMatvecs: 5, tol: 1e-14 });
    expect(short.converged).toBe(false);
    expect(short.matvecs).toBeLessThan(40);
  });

  it('two-pass Lanczos that keeps its vectors skips the replay and gives the same pair as ml-matrix and as the replay', () => {
    // Reference: ml-matrix EigenvalueDecomposition of the same matrix.
    const d = Array.from({ length: 200 }, (_, i) => -3 + i * 0.05 + Math.sin(i) * 0.01);
    const a = withSpectrum(d, 21);
    const ref = new EigenvalueDecomposition(new Matrix(Array.from({ length: 200 }, (_, i) => Array.from(a.subarray(i * 200, i * 200 + 200)))), { assumeSymmetric: true });
    const lowest = Math.min(...ref.realEigenvalues);
    const replay = lanczos(denseOperator(a, 200), { eigs: 1, seed: 3, strategy: 'two-pass', tol: 1e-9 });
    const kept = lanczos(denseOperator(a, 200), { eigs: 1, seed: 3, strategy: 'two-pass', tol: 1e-9, keepVectors: 200 });
    closeTo(kept.values[0]!, lowest, 1e-9, 'kept vectors');
    closeTo(replay.values[0]!, lowest, 1e-9, 'replay');
    expect(kept.residuals[0]!).toBeLessThan(1e-9 * 10);
    // Same recurrence, so the same Ritz vector; the replay's products are saved (all but the residual check).
    expect(kept.iterations).toBe(replay.iterations);
    expect(kept.matvecs).toBe(replay.iterations + 1);
    expect(replay.matvecs).toBe(2 * replay.iterations);
    let diff = 0;
    for (let i = 0; i < 200; i++) diff = Math.max(diff, Math.abs(kept.vectors[0]![i]! - replay.vectors[0]![i]!));
    expect(diff).toBeLessThan(1e-12);
    // Too few kept vectors: the replay starts after them (the last two kept restart it), same pair.
    const few = lanczos(denseOperator(a, 200), { eigs: 1, seed: 3, strategy: 'two-pass', tol: 1e-9, keepVectors: 5 });
    expect(few.matvecs).toBe(replay.matvecs - 4);
    let fewDiff = 0;
    for (let i = 0; i < 200; i++) fewDiff = Math.max(fewDiff, Math.abs(few.vectors[0]![i]! - replay.vectors[0]![i]!));
    expect(fewDiff).toBeLessThan(1e-12);
  });
});
