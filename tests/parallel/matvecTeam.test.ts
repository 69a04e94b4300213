import { afterAll, describe, expect, it } from 'vitest';
import { applyStoredRows, storedFromPieces, type StoredHamiltonian } from '../../src/build/storedHamiltonian.js';
import { closeMatvecWorkers, MatvecTeam, startMatvecWorkers, teamMembers } from '../../src/parallel/matvecTeam.js';
import { lanczos } from '../../src/solvers/lanczos.js';
import { storageOrderOperator } from '../../src/pipeline/solve.js';
import { localSweeps } from '../../src/solvers/lanczosSweeps.js';
import { seededUniform } from '../../src/util/random.js';

afterAll(closeMatvecWorkers);

/** A seeded random Hermitian (real) stored matrix on SharedArrayBuffers, about `perRow` upper entries per row. */
function randomSymmetric(dim: number, perRow: number, seed: number): StoredHamiltonian {
  const rng = seededUniform(seed);
  const cols: number[] = [];
  const values: number[] = [];
  const rowEnd = new Int32Array(dim);
  const diag = new Float64Array(dim);
  for (let r = 0; r < dim; r++) {
    diag[r] = rng.next() - 0.5;
    const picked = new Set<number>();
    for (let k = 0; k < perRow && r + 1 < dim; k++) picked.add(r + 1 + Math.floor(rng.next() * (dim - r - 1)));
    for (const c of [...picked].sort((x, y) => x - y)) {
      cols.push(c);
      values.push(rng.next() - 0.5);
    }
    rowEnd[r] = cols.length;
  }
  return storedFromPieces(dim, false, [{ r0: 0, r1: dim, diag, rowEnd, cols: Int32Array.from(cols), values: Float64Array.from(values) }], true);
}

function randomVector(dim: number, seed: number): Float64Array {
  const rng = seededUniform(seed);
  return Float64Array.from({ length: dim }, () => rng.next() - 0.5);
}

/** Largest |a_i − b_i|. */
function maxDiff(a: Float64Array, b: Float64Array): number {
  let d = 0;
  for (let i = 0; i < a.length; i++) d = Math.max(d, Math.abs(a[i]! - b[i]!));
  return d;
}

describe('MatvecTeam', () => {
  it('teamMembers gives one thread per ~2000 rows, at most the threads asked for', () => {
    expect(teamMembers(100, 4)).toBe(1);
    expect(teamMembers(4000, 4)).toBe(2);
    expect(teamMembers(1_000_000, 3)).toBe(3);
    expect(teamMembers(1_000_000, 1)).toBe(1);
  });

  it('MatvecTeam.apply on workers started ahead, and on the same workers reused by the next team, equals the one-thread product', () => {
    const m1 = randomSymmetric(6000, 4, 3);
    startMatvecWorkers(m1.dim, 3);
    const checks: number[] = [];
    for (const [m, seed] of [
      [m1, 11],
      [randomSymmetric(5000, 6, 5), 12],
    ] as const) {
      const team = new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 3);
      try {
        for (let k = 0; k < 3; k++) {
          const x = randomVector(m.dim, seed + 100 * k);
          const want = new Float64Array(m.dim);
          applyStoredRows(m, x, want);
          const got = new Float64Array(m.dim);
          team.apply(x, got);
          // Each row is summed by one thread in the same order, so the product is bit-identical.
          checks.push(maxDiff(got, want));
        }
      } finally {
        team.close();
      }
    }
    expect(checks).toEqual([0, 0, 0, 0, 0, 0]);
  });

  it('MatvecTeam.apply on its own vectors works in place, and on mixed vectors through staging', () => {
    const m = randomSymmetric(7000, 3, 31);
    const team = new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 2);
    try {
      const x = team.vector();
      const y = team.vector();
      x.set(randomVector(m.dim, 41));
      const want = new Float64Array(m.dim);
      applyStoredRows(m, x, want);
      team.apply(x, y);
      expect(maxDiff(y, want)).toBe(0);
      // A plain output array and an aliased input and output both go through staging.
      const plain = new Float64Array(m.dim);
      team.apply(x, plain);
      expect(maxDiff(plain, want)).toBe(0);
      team.apply(x, x);
      expect(maxDiff(x, want)).toBe(0);
    } finally {
      team.close();
    }
  });

  it('MatvecTeam.close before any product leaves its workers ready for the next team', () => {
    const m = randomSymmetric(4000, 3, 9);
    new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 2).close();
    const team = new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 2);
    const x = randomVector(m.dim, 21);
    const want = new Float64Array(m.dim);
    applyStoredRows(m, x, want);
    const got = new Float64Array(m.dim);
    team.apply(x, got);
    team.close();
    expect(maxDiff(got, want)).toBe(0);
  });

  it('MatvecTeam.sweeps split the Lanczos vector sweeps over the team and agree with the one-thread sweeps', () => {
    const m = randomSymmetric(9000, 3, 51);
    const team = new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 3);
    try {
      const [v, vPrev, w, x] = [team.vector(), team.vector(), team.vector(), team.vector()];
      v.set(randomVector(m.dim, 1));
      vPrev.set(randomVector(m.dim, 2));
      w.set(randomVector(m.dim, 3));
      x.set(randomVector(m.dim, 4));
      const copy = (a: Float64Array): Float64Array => Float64Array.from(a);
      const [lv, lp, lw, lx] = [copy(v), copy(vPrev), copy(w), copy(x)];
      // Sums differ only in the order the members add them: compare to rounding.
      const [vw, vp] = team.sweeps!.dots(v, w, vPrev);
      const [rvw, rvp] = localSweeps.dots(lv, lw, lp);
      expect(Math.abs(vw - rvw)).toBeLessThan(1e-12 * m.dim);
      expect(Math.abs(vp - rvp)).toBeLessThan(1e-12 * m.dim);
      const ss = team.sweeps!.update(v, vPrev, w, 0.3, -0.7);
      const rss = localSweeps.update(lv, lp, lw, 0.3, -0.7);
      expect(Math.abs(ss - rss)).toBeLessThan(1e-12 * rss);
      expect(maxDiff(w, lw)).toBe(0);
      team.sweeps!.scale(w, 1.5);
      localSweeps.scale(lw, 1.5);
      expect(maxDiff(w, lw)).toBe(0);
      team.sweeps!.replay(v, vPrev, w, x, 0.2, 0.4, 0.9, -1.1);
      localSweeps.replay(lv, lp, lw, lx, 0.2, 0.4, 0.9, -1.1);
      expect(maxDiff(w, lw)).toBe(0);
      expect(maxDiff(x, lx)).toBe(0);
    } finally {
      team.close();
    }
  });

  it('two-pass Lanczos on a team gives the lowest eigenvalue of the one-thread operator to 1e-10', () => {
    const m = randomSymmetric(20000, 3, 61);
    const plain = { dim: m.dim, complex: false, apply: (x: Float64Array, y: Float64Array) => applyStoredRows(m, x, y) };
    const one = lanczos(plain, { eigs: 1, strategy: 'two-pass', tol: 1e-10, seed: 7 });
    const team = new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 2);
    try {
      const two = lanczos(team, { eigs: 1, strategy: 'two-pass', tol: 1e-10, seed: 7 });
      expect(two.converged).toBe(true);
      expect(Math.abs(two.values[0]! - one.values[0]!)).toBeLessThan(1e-10 * Math.abs(one.values[0]!));
    } finally {
      team.close();
    }
  });

  it('the fused replay (replayStep) gives two-pass Lanczos bit for bit the result of the separate product and replay sweep, on one thread and on a team', () => {
    const m = randomSymmetric(20000, 3, 62);
    const unfused = { dim: m.dim, complex: false, apply: (x: Float64Array, y: Float64Array) => applyStoredRows(m, x, y) };
    const opts = { eigs: 1, strategy: 'two-pass' as const, tol: 1e-10, seed: 9 };
    const want = lanczos(unfused, opts);
    const got = lanczos(storageOrderOperator(m), opts);
    expect(Array.from(got.values)).toEqual(Array.from(want.values));
    expect(got.matvecs).toBe(want.matvecs);
    expect(Buffer.from(got.vectors[0]!.buffer).equals(Buffer.from(want.vectors[0]!.buffer))).toBe(true);
    // Each run gets a fresh team: a team hands out four shared vectors, and sweeps over other arrays
    // run on one thread, whose sums are taken in another order.
    const onTeam = (fused: boolean): ReturnType<typeof lanczos> => {
      const team = new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 2);
      try {
        expect(team.replayStep).toBeTypeOf('function');
        // Without the fused step: the team's product, then its replay sweep.
        return lanczos(fused ? team : { dim: team.dim, complex: false, apply: (x, y) => team.apply(x, y), vector: () => team.vector(), sweeps: team.sweeps }, opts);
      } finally {
        team.close();
      }
    };
    const fusedTeam = onTeam(true);
    const plainTeam = onTeam(false);
    expect(Array.from(fusedTeam.values)).toEqual(Array.from(plainTeam.values));
    expect(Array.from(fusedTeam.vectors[0]!)).toEqual(Array.from(plainTeam.vectors[0]!));
    expect(Math.abs(fusedTeam.values[0]! - want.values[0]!)).toBeLessThan(1e-10 * Math.abs(want.values[0]!));
  });
});
