import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { UpperPiece } from '../../src/build/projectedHamiltonian.js';
import { toDense } from '../../src/build/sparseMatrix.js';
import { applyStoredRows, lengthSorted, localityOrder, permuteVector, reorderForLocality, sortRowsByLength, storedFromPieces, storedNonzeros, toBasisOrderInPlace, toSparseMatrix, type StoredHamiltonian } from '../../src/build/storedHamiltonian.js';
import { seededUniform } from '../../src/util/random.js';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { lanczos } from '../../src/solvers/lanczos.js';
import { storageOrderOperator } from '../../src/pipeline/solve.js';

/**
 * Random upper triangles (diagonal plus entries right of it) split into row pieces, with values
 * drawn from a few levels (coded storage) or continuous (plain doubles when there are too many).
 */
function randomPieces(dim: number, complex: boolean, seed: number, levels: number, density: number): UpperPiece[] {
  const rng = seededUniform(seed);
  const value = (): number => (levels > 0 ? Math.floor(rng.next() * levels) - levels / 2 : rng.next() - 0.5);
  const pieces: UpperPiece[] = [];
  const cuts = [0, Math.floor(dim / 3), Math.floor((2 * dim) / 3), dim];
  for (let p = 0; p < 3; p++) {
    const [r0, r1] = [cuts[p]!, cuts[p + 1]!];
    const cols: number[] = [];
    const values: number[] = [];
    const rowEnd: number[] = [];
    const diag: number[] = [];
    for (let r = r0; r < r1; r++) {
      diag.push(rng.next() < 0.2 ? 0 : value());
      if (complex) diag.push(0);
      for (let c = r + 1; c < dim; c++) {
        if (rng.next() >= density) continue;
        cols.push(c);
        values.push(value());
        if (complex) values.push(value());
      }
      rowEnd.push(cols.length);
    }
    pieces.push({ r0, r1, diag: Float64Array.from(diag), rowEnd: Int32Array.from(rowEnd), cols: Int32Array.from(cols), values: Float64Array.from(values) });
  }
  return pieces;
}

/** The Hermitian matrix the pieces describe, written out directly (upper, its conjugate mirror, diagonal). */
function denseOf(dim: number, complex: boolean, pieces: UpperPiece[]): { re: Float64Array; im: Float64Array } {
  const re = new Float64Array(dim * dim);
  const im = new Float64Array(dim * dim);
  for (const p of pieces) {
    let e = 0;
    for (let r = p.r0; r < p.r1; r++) {
      re[r * dim + r] = complex ? p.diag[2 * (r - p.r0)]! : p.diag[r - p.r0]!;
      for (; e < p.rowEnd[r - p.r0]!; e++) {
        const c = p.cols[e]!;
        const vr = complex ? p.values[2 * e]! : p.values[e]!;
        const vi = complex ? p.values[2 * e + 1]! : 0;
        re[r * dim + c] = vr;
        im[r * dim + c] = vi;
        re[c * dim + r] = vr;
        im[c * dim + r] = -vi;
      }
    }
  }
  return { re, im };
}

describe('storedHamiltonian', () => {
  it('storedFromPieces and toSparseMatrix give the Hermitian completion, coded or plain', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 30 }), fc.boolean(), fc.integer({ min: 1, max: 1e6 }), fc.constantFrom(0, 1, 3, 300), (dim, complex, seed, levels) => {
        const pieces = randomPieces(dim, complex, seed, levels, 0.3);
        const stored = storedFromPieces(dim, complex, pieces);
        const want = denseOf(dim, complex, pieces);
        const got = toDense(toSparseMatrix(stored));
        // `+ 0` folds −0 into 0: the sign of a zero imaginary part is not part of the matrix.
        expect(Array.from(got.re, (v) => v + 0)).toEqual(Array.from(want.re, (v) => v + 0));
        expect(Array.from(got.im, (v) => v + 0)).toEqual(Array.from(want.im, (v) => v + 0));
        // Zero diagonals are not counted, as in the CSR form.
        expect(storedNonzeros(stored)).toBe(toSparseMatrix(stored).rowPtr[dim]);
        // Integer levels give few distinct values: codes (1 byte up to 256 values).
        if (levels === 3 && (complex || stored.table!.length > 1)) expect(stored.codes).toBeInstanceOf(Uint8Array);
        // One real value (levels 1): nothing is stored per entry, the table holds it.
        if (levels === 1 && !complex && stored.rowPtr[dim]! > 0) expect([stored.codes, stored.values, stored.table?.length]).toEqual([undefined, undefined, 1]);
      }),
      { numRuns: 120, seed: 7 },
    );
  });

  it('applyStoredRows equals the dense product, for any row split (levels 1: one off-diagonal value, factored out of the sum)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 30 }), fc.boolean(), fc.integer({ min: 1, max: 1e6 }), fc.constantFrom(0, 1, 3), (dim, complex, seed, levels) => {
        const pieces = randomPieces(dim, complex, seed, levels, 0.4);
        const stored = storedFromPieces(dim, complex, pieces);
        const m = denseOf(dim, complex, pieces);
        const w = complex ? 2 : 1;
        const rng = seededUniform(seed + 3);
        const x = Float64Array.from({ length: w * dim }, () => rng.next() - 0.5);
        const y = new Float64Array(w * dim);
        const split = Math.floor(dim / 2);
        applyStoredRows(stored, x, y, 0, split);
        applyStoredRows(stored, x, y, split, dim);
        for (let i = 0; i < dim; i++) {
          let re = 0;
          let im = 0;
          for (let j = 0; j < dim; j++) {
            const xr = x[w * j]!;
            const xi = complex ? x[w * j + 1]! : 0;
            re += m.re[i * dim + j]! * xr - m.im[i * dim + j]! * xi;
            im += m.re[i * dim + j]! * xi + m.im[i * dim + j]! * xr;
          }
          expect(Math.abs(y[w * i]! - re)).toBeLessThan(1e-12);
          if (complex) expect(Math.abs(y[w * i + 1]! - im)).toBeLessThan(1e-12);
        }
      }),
      { numRuns: 120, seed: 8 },
    );
  });

  it('storedFromPieces falls back to plain doubles past 65536 distinct values', () => {
    const pieces = randomPieces(420, false, 5, 0, 0.9);
    const stored = storedFromPieces(420, false, pieces);
    expect(stored.codes).toBeUndefined();
    expect(stored.values).toBeInstanceOf(Float64Array);
    const few = storedFromPieces(420, false, randomPieces(420, false, 5, 300, 0.9));
    expect(few.codes).toBeInstanceOf(Uint16Array);
  });
});

describe('reorderForLocality', () => {
  it('reorderForLocality keeps the matrix: toSparseMatrix and permuted products equal the original', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 40 }), fc.boolean(), fc.integer({ min: 1, max: 1e6 }), fc.constantFrom(0, 3), (dim, complex, seed, levels) => {
        const stored = storedFromPieces(dim, complex, randomPieces(dim, complex, seed, levels, 0.15));
        const once = reorderForLocality(stored);
        const twice = reorderForLocality(once);
        const want = toDense(toSparseMatrix(stored));
        for (const r of [once, twice]) {
          expect(r.order).toBeInstanceOf(Int32Array);
          // The order is a permutation of the rows.
          expect([...r.order!].sort((a, b) => a - b)).toEqual(Array.from({ length: dim }, (_, i) => i));
          const got = toDense(toSparseMatrix(r));
          expect(Array.from(got.re)).toEqual(Array.from(want.re));
          expect(Array.from(got.im, (v) => v + 0)).toEqual(Array.from(want.im, (v) => v + 0));
          // A product in storage order, moved back, is the product in basis order.
          const w = complex ? 2 : 1;
          const rng = seededUniform(seed + 9);
          const x = Float64Array.from({ length: w * dim }, () => rng.next() - 0.5);
          const y0 = new Float64Array(w * dim);
          applyStoredRows(stored, x, y0);
          const xs = new Float64Array(w * dim);
          const ys = new Float64Array(w * dim);
          const y = new Float64Array(w * dim);
          permuteVector(r, x, xs, true);
          applyStoredRows(r, xs, ys);
          permuteVector(r, ys, y, false);
          for (let i = 0; i < w * dim; i++) expect(Math.abs(y[i]! - y0[i]!)).toBeLessThan(1e-12);
          // In place, the same move (entry i of storage order is entry order[i] in basis order).
          toBasisOrderInPlace(r, ys);
          expect(Array.from(ys)).toEqual(Array.from(y));
        }
      }),
      { numRuns: 100, seed: 21 },
    );
  });

  it('storedFromPieces with localityOrder builds, byte for byte, what reorderForLocality makes of the basis-order matrix', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 40 }), fc.boolean(), fc.integer({ min: 1, max: 1e6 }), fc.constantFrom(0, 3, 300), fc.constantFrom(0.02, 0.15), (dim, complex, seed, levels, density) => {
        const pieces = randomPieces(dim, complex, seed, levels, density);
        const order = localityOrder(dim, pieces);
        const got = storedFromPieces(dim, complex, pieces, false, order);
        const plain = storedFromPieces(dim, complex, pieces);
        const want = reorderForLocality(plain);
        // 'locality' finds the order inside the arrays it then fills and sorts rows by length in
        // windows; 'lengths' sorts basis order the same way.
        const pairs: Array<[StoredHamiltonian, StoredHamiltonian]> = [
          [got, want],
          [storedFromPieces(dim, complex, pieces, false, 'locality'), sortRowsByLength(want)],
          [storedFromPieces(dim, complex, pieces, false, 'lengths'), sortRowsByLength(plain)],
        ];
        for (const [m, ref] of pairs) {
          for (const key of ['diag', 'rowPtr', 'cols', 'codes', 'table', 'values', 'order'] as const) {
            const [g, w] = [m[key], ref[key]];
            expect(g === undefined ? undefined : Buffer.from(g.buffer, g.byteOffset, g.byteLength).toString('hex'), key).toEqual(w === undefined ? undefined : Buffer.from(w.buffer, w.byteOffset, w.byteLength).toString('hex'));
          }
        }
        // Sorted by length (one window at these sizes), and still the same matrix.
        const sorted = pairs[2]![0];
        for (let i = 1; i < dim; i++) expect(sorted.rowPtr[i + 1]! - sorted.rowPtr[i]!).toBeGreaterThanOrEqual(sorted.rowPtr[i]! - sorted.rowPtr[i - 1]!);
        const again = toDense(toSparseMatrix(sorted));
        expect(Array.from(again.re, (v) => v + 0)).toEqual(Array.from(toDense(toSparseMatrix(plain)).re, (v) => v + 0));
        // Reference order written out from the definition: breadth-first search on the dense
        // matrix's graph, neighbours taken in ascending index, each unvisited row starting a tree.
        const dense = denseOf(dim, complex, pieces);
        const seen = new Uint8Array(dim);
        const bfs: number[] = [];
        for (let s0 = 0; s0 < dim; s0++) {
          if (seen[s0]) continue;
          seen[s0] = 1;
          bfs.push(s0);
          for (let h = bfs.length - 1; h < bfs.length; h++) {
            const r = bfs[h]!;
            for (let c = 0; c < dim; c++) {
              if (c === r || seen[c] || (dense.re[r * dim + c] === 0 && dense.im[r * dim + c] === 0 && !hasEntry(pieces, r, c))) continue;
              seen[c] = 1;
              bfs.push(c);
            }
          }
        }
        expect(Array.from(order.take)).toEqual(bfs);
        for (let i = 0; i < dim; i++) expect(order.posOf[order.take[i]!]).toBe(i);
        // And the stored matrix is the Hermitian completion of the pieces, in basis order.
        const back = toDense(toSparseMatrix(got));
        expect(Array.from(back.re, (v) => v + 0)).toEqual(Array.from(dense.re, (v) => v + 0));
        expect(Array.from(back.im, (v) => v + 0)).toEqual(Array.from(dense.im, (v) => v + 0));
      }),
      { numRuns: 150, seed: 22 },
    );
  });
});

/** Whether the pieces hold an entry (r, c) or (c, r), zero-valued or not: stored entries are graph edges. */
function hasEntry(pieces: UpperPiece[], r: number, c: number): boolean {
  const [a, b] = r < c ? [r, c] : [c, r];
  for (const p of pieces) {
    if (a < p.r0 || a >= p.r1) continue;
    const i = a - p.r0;
    for (let e = i === 0 ? 0 : p.rowEnd[i - 1]!; e < p.rowEnd[i]!; e++) if (p.cols[e] === b) return true;
  }
  return false;
}

describe('product kernels on rows of equal and unequal length', () => {
  /**
   * A CSR matrix written by hand (not symmetric: the kernel does not care) with row lengths drawn
   * so that runs of four equal rows and traps (four rows whose lengths sum to four times the first,
   * e.g. 2, 0, 4, 2) both occur; checked against the definition y_r = d_r x_r + Σ_e v_e x_{c_e}.
   */
  it('applyStoredRows equals the row-by-row definition for one-value, coded and plain layouts, whatever the row lengths', () => {
    fc.assert(
      fc.property(
        fc.array(fc.constantFrom(0, 1, 2, 2, 2, 3, 4), { minLength: 1, maxLength: 40 }),
        fc.integer({ min: 1, max: 1e6 }),
        fc.constantFrom('one', 'coded', 'plain'),
        fc.integer({ min: 0, max: 40 }),
        (lengths, seed, layout, cut) => {
          // The trap first, then the drawn lengths.
          const lens = [2, 0, 4, 2, ...lengths];
          const dim = lens.length;
          const rng = seededUniform(seed);
          const rowPtr = new Int32Array(dim + 1);
          lens.forEach((l, r) => (rowPtr[r + 1] = rowPtr[r]! + l));
          const nnz = rowPtr[dim]!;
          const cols = Int32Array.from({ length: nnz }, () => Math.floor(rng.next() * dim));
          const diag = Float64Array.from({ length: dim }, () => rng.next() - 0.5);
          const table = Float64Array.from([-0.5, 1.25, 2]);
          const codes = Uint8Array.from({ length: nnz }, () => Math.floor(rng.next() * 3));
          const values = Float64Array.from({ length: nnz }, () => rng.next() - 0.5);
          const m: StoredHamiltonian =
            layout === 'one' ? { dim, complex: false, diag, rowPtr, cols, table: table.subarray(0, 1) } : layout === 'coded' ? { dim, complex: false, diag, rowPtr, cols, codes, table } : { dim, complex: false, diag, rowPtr, cols, values };
          const valueOf = (e: number): number => (layout === 'one' ? table[0]! : layout === 'coded' ? table[codes[e]!]! : values[e]!);
          const x = Float64Array.from({ length: dim }, () => rng.next() - 0.5);
          const y = new Float64Array(dim);
          // Any split into two ranges, as a team's members take them.
          const split = Math.min(dim, cut);
          applyStoredRows(m, x, y, 0, split);
          applyStoredRows(m, x, y, split, dim);
          for (let r = 0; r < dim; r++) {
            let want = diag[r]! * x[r]!;
            for (let e = rowPtr[r]!; e < rowPtr[r + 1]!; e++) want += valueOf(e) * x[cols[e]!]!;
            expect(Math.abs(y[r]! - want)).toBeLessThan(1e-12);
          }
        },
      ),
      { numRuns: 200, seed: 31 },
    );
  });

  it('lengthSorted sorts each window by length, stably, and keeps take and posOf inverse', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 6 }), { minLength: 1, maxLength: 60 }), fc.integer({ min: 1, max: 9 }), fc.integer({ min: 1, max: 1e6 }), (lengthList, windowRows, seed) => {
        const dim = lengthList.length;
        const lengthOf = Int32Array.from(lengthList);
        // Start from a shuffled order, as a breadth-first renumbering would give.
        const rng = seededUniform(seed);
        const take = Int32Array.from({ length: dim }, (_, i) => i);
        for (let i = dim - 1; i > 0; i--) {
          const j = Math.floor(rng.next() * (i + 1));
          [take[i], take[j]] = [take[j]!, take[i]!];
        }
        const before = Array.from(take);
        const posOf = new Int32Array(dim);
        take.forEach((r, i) => (posOf[r] = i));
        lengthSorted(take, posOf, lengthOf, windowRows);
        for (let w0 = 0; w0 < dim; w0 += windowRows) {
          const window = before.slice(w0, w0 + windowRows);
          // Stable sort by length of the same rows (Array.prototype.sort is stable since ES2019).
          const want = [...window].sort((a, b) => lengthOf[a]! - lengthOf[b]!);
          expect(Array.from(take.subarray(w0, w0 + windowRows))).toEqual(want);
        }
        for (let i = 0; i < dim; i++) expect(posOf[take[i]!]).toBe(i);
      }),
      { numRuns: 200, seed: 32 },
    );
  });
});

describe('one-value pieces and the fused replay', () => {
  it('storedFromPieces gives the same matrix from one-value pieces (UpperPiece.oneValue) as from their values written out', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 30 }), fc.integer({ min: 1, max: 1e6 }), fc.constantFrom(undefined, 'locality' as const, 'lengths' as const), (dim, seed, order) => {
        // Levels 1: every real off-diagonal value is one (-0.5 or 0.5 per seed); each piece keeps just it.
        const pieces = randomPieces(dim, false, seed, 1, 0.3);
        const compact = pieces.map((p) => (p.cols.length > 0 ? { ...p, values: p.values.slice(0, 1), oneValue: true } : p));
        const a = storedFromPieces(dim, false, pieces, false, order);
        const b = storedFromPieces(dim, false, compact, false, order);
        for (const key of ['diag', 'rowPtr', 'cols', 'codes', 'table', 'values', 'order'] as const) {
          expect(b[key] === undefined ? undefined : Array.from(b[key]!), key).toEqual(a[key] === undefined ? undefined : Array.from(a[key]!));
        }
      }),
      { numRuns: 100, seed: 33 },
    );
  });

  it('two-pass Lanczos with the fused replay (storageOrderOperator) returns bit for bit what the separate replay returns, real and complex', () => {
    for (const complex of [false, true]) {
      // Dense enough that pass 1 runs long enough for a second pass (no early exact convergence).
      const dim = 600;
      const m = storedFromPieces(dim, complex, randomPieces(dim, complex, 41, 3, 0.01));
      const unfused = { dim, complex, apply: (x: Float64Array, y: Float64Array) => applyStoredRows(m, x, y) };
      const opts = { eigs: 1, strategy: 'two-pass' as const, tol: 1e-10, seed: 5 };
      const want = lanczos(unfused, opts);
      const got = lanczos(storageOrderOperator(m), opts);
      expect(want.iterations).toBeGreaterThan(2);
      expect(Array.from(got.values)).toEqual(Array.from(want.values));
      expect(Array.from(got.vectors[0]!)).toEqual(Array.from(want.vectors[0]!));
      // And it is the lowest eigenvalue: ml-matrix on the dense matrix (real case; outside reference).
      if (!complex) {
        const dense = toDense(toSparseMatrix(m));
        const rows = Array.from({ length: dim }, (_, i) => Array.from(dense.re.subarray(i * dim, (i + 1) * dim)));
        const lowest = Math.min(...new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true }).realEigenvalues);
        expect(Math.abs(got.values[0]! - lowest)).toBeLessThan(1e-8);
      }
    }
  });
});

