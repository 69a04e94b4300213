import { afterAll, describe, expect, it } from 'vitest';
import { csrApplyRows, type SparseMatrix } from '../../src/build/sparseMatrix.js';
import { closeMatvecWorkers, MatvecTeam, startMatvecWorkers, teamMembers } from '../../src/parallel/matvecTeam.js';
import { seededUniform } from '../../src/util/random.js';

afterAll(closeMatvecWorkers);

/** A seeded random symmetric CSR matrix on SharedArrayBuffers, `perRow` off-diagonal pairs per row. */
function randomSymmetric(dim: number, perRow: number, seed: number): SparseMatrix {
  const rng = seededUniform(seed);
  const rows: Array<Map<number, number>> = Array.from({ length: dim }, () => new Map());
  for (let r = 0; r < dim; r++) {
    rows[r]!.set(r, rng.next() - 0.5);
    for (let k = 0; k < perRow; k++) {
      const c = Math.floor(rng.next() * dim);
      const v = rng.next() - 0.5;
      rows[r]!.set(c, (rows[r]!.get(c) ?? 0) + v);
      if (c !== r) rows[c]!.set(r, (rows[c]!.get(r) ?? 0) + v);
    }
  }
  const nnz = rows.reduce((a, m) => a + m.size, 0);
  const rowPtr = new Float64Array(new SharedArrayBuffer((dim + 1) * 8));
  const cols = new Int32Array(new SharedArrayBuffer(nnz * 4));
  const values = new Float64Array(new SharedArrayBuffer(nnz * 8));
  let e = 0;
  rows.forEach((m, r) => {
    rowPtr[r] = e;
    for (const [c, v] of [...m].sort((a, b) => a[0] - b[0])) {
      cols[e] = c;
      values[e++] = v;
    }
  });
  rowPtr[dim] = e;
  return { dim, complex: false, rowPtr, cols, values };
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

  it('MatvecTeam.apply on workers started ahead, and on the same workers reused by the next team, equals the one-thread CSR product', () => {
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
          csrApplyRows(m, x, want);
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

  it('MatvecTeam.close before any product leaves its workers ready for the next team', () => {
    const m = randomSymmetric(4000, 3, 9);
    new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 2).close();
    const team = new MatvecTeam({ kind: 'stored', complex: false, dim: m.dim, matrix: m }, 2);
    const x = randomVector(m.dim, 21);
    const want = new Float64Array(m.dim);
    csrApplyRows(m, x, want);
    const got = new Float64Array(m.dim);
    team.apply(x, got);
    team.close();
    expect(maxDiff(got, want)).toBe(0);
  });
});
