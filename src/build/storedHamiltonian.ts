import type { UpperPiece } from './projectedHamiltonian.js';
import type { SparseMatrix } from './sparseMatrix.js';
import { PieceSlab, SLAB_MIN_DIM } from './pieceSlab.js';
import { newBuffer } from '../util/buffers.js';
import { REPLAY_BLOCK, replayFusedRange } from '../solvers/lanczosSweeps.js';

/**
 * H_S as the solver stores it: the diagonal as a dense vector, the off-diagonal entries (both
 * triangles, so each product row is a plain gather that threads split without conflicts) in CSR
 * with 32-bit columns, and their values as 8- or 16-bit codes into a table of distinct values
 * when there are few (lattice models have a handful), else as doubles. At 6 entries a row this
 * is 5 bytes an entry instead of 12.
 */
export interface StoredHamiltonian {
  dim: number;
  complex: boolean;
  /** Diagonal (re, im interleaved when complex). */
  diag: Float64Array;
  /** Off-diagonal row starts: 32-bit while the entries fit, doubles past 2^31 entries (see `rowStarts`). */
  rowPtr: Float64Array | Int32Array;
  cols: Int32Array;
  /**
   * Value codes into `table`, or undefined when `values` holds the entries; when both are undefined
   * every off-diagonal entry is table[0] (a real one-value matrix, e.g. a lattice model's hopping).
   */
  codes?: Uint8Array | Uint16Array;
  /** Distinct values (re, im pairs when complex). */
  table?: Float64Array;
  values?: Float64Array;
  /**
   * Storage row i holds basis row order[i] (see `reorderForLocality`); undefined when rows are in
   * basis order. Products in storage order act on vectors permuted the same way.
   */
  order?: Int32Array;
}

/** Row-start array for `nnz` entries: 32-bit (half the bytes, and int loads in the product) while they fit. */
function rowStarts(dim: number, nnz: number, alloc: (bytes: number) => ArrayBufferLike): Float64Array | Int32Array {
  return rowStartBytes(nnz) === 4 ? new Int32Array(alloc(4 * (dim + 1))) : new Float64Array(alloc(8 * (dim + 1)));
}

/** Bytes of one row start for a matrix of `nnz` stored entries (the memory plan sizes by this too). */
export function rowStartBytes(nnz: number): 4 | 8 {
  return nnz < 2 ** 31 ? 4 : 8;
}

/** Bytes of the stored arrays: what one product must stream at least, besides the vectors. */
export function storedBytes(m: StoredHamiltonian): number {
  return m.diag.byteLength + m.rowPtr.byteLength + m.cols.byteLength + (m.codes?.byteLength ?? 0) + (m.table?.byteLength ?? 0) + (m.values?.byteLength ?? 0);
}

/** Most distinct values a code table holds. */
const MAX_CODES = 65536;

/** Stored entries, counted as in a full CSR matrix: both triangles plus the nonzero diagonal. */
export function storedNonzeros(m: StoredHamiltonian): number {
  let diagonals = 0;
  for (let i = 0; i < m.dim; i++) if (m.complex ? m.diag[2 * i] !== 0 || m.diag[2 * i + 1] !== 0 : m.diag[i] !== 0) diagonals++;
  return m.rowPtr[m.dim]! + diagonals;
}

/** A renumbering of the rows: storage row i holds basis row take[i], and basis row r sits at posOf[r]. */
export interface StorageOrder {
  take: Int32Array;
  posOf: Int32Array;
}

/**
 * Join upper-triangle pieces (in row order) into a stored Hamiltonian: each row gets its mirrored
 * lower entries (ascending columns) then its upper ones. `shared`: arrays on SharedArrayBuffers.
 * With `order` the rows are stored in that order and the result records it. 'locality' finds
 * `localityOrder`'s order in the arrays about to be filled (so it costs no memory beyond the
 * order itself) and 'lengths' starts from basis order; both then sort rows by length within
 * windows (`lengthSorted`) for the product kernels. The result has the arrays that
 * `sortRowsByLength(reorderForLocality(m))` or `sortRowsByLength(m)` would make from the
 * basis-order matrix m, which never exists.
 */
export function storedFromPieces(dim: number, complex: boolean, pieces: UpperPiece[], shared = false, order?: StorageOrder | 'locality' | 'lengths'): StoredHamiltonian {
  if (order) return storedInOrder(dim, complex, pieces, order, shared);
  const alloc = (bytes: number): ArrayBufferLike => newBuffer(bytes, shared);
  const w = complex ? 2 : 1;
  // Pieces that wrote into one whole diagonal (see BuildRowsOptions.diag) hand it over as it is.
  const whole = wholeDiagonal(pieces, w, dim, shared);
  const diag = whole ?? new Float64Array(alloc(w * dim * 8));
  // Transients from a slab of their own on large matrices (see pieceSlab.ts): their pages go back when it is dropped.
  const scratch = dim >= SLAB_MIN_DIM ? new PieceSlab() : undefined;
  const lower = scratch ? scratch.int32(dim) : new Int32Array(dim);
  let upper = 0;
  for (const p of pieces) {
    if (!whole) diag.set(p.diag, w * p.r0);
    for (let e = 0; e < p.cols.length; e++) lower[p.cols[e]!]!++;
    upper += p.cols.length;
  }
  const coding = valueCodes(pieces, complex);
  const nnz = 2 * upper;
  const rowPtr = rowStarts(dim, nnz, alloc);
  const lowerPos = scratch ? scratch.float64(dim) : new Float64Array(dim);
  let at = 0;
  for (const p of pieces) {
    for (let r = p.r0; r < p.r1; r++) {
      const i = r - p.r0;
      rowPtr[r] = at;
      lowerPos[r] = at;
      at += lower[r]! + p.rowEnd[i]! - (i === 0 ? 0 : p.rowEnd[i - 1]!);
    }
  }
  rowPtr[dim] = at;
  const cols = new Int32Array(alloc(nnz * 4));
  const { codes, values } = entryValues(coding, nnz, w, alloc);
  let codeAt = 0;
  for (const p of pieces) {
    let e = 0;
    for (let r = p.r0; r < p.r1; r++) {
      let pos = rowPtr[r]! + lower[r]!;
      for (const end = p.rowEnd[r - p.r0]!; e < end; e++, pos++) {
        const c = p.cols[e]!;
        placePair(cols, codes, values, coding?.conjugate, complex, codes ? coding!.codeOf[codeAt++]! : 0, p.values, p.oneValue ? 0 : e, pos, c, lowerPos[c]!++, r);
      }
    }
  }
  return coding ? { dim, complex, diag, rowPtr, cols, codes, table: coding.table } : { dim, complex, diag, rowPtr, cols, values };
}

/**
 * Storage row i = basis row take[i]. Every upper entry (r, c) lands in storage row posOf[r] and
 * its mirror in posOf[c]. Pieces come in row order, so each row lists its entries in ascending
 * basis index (its mirrored lower ones, then its upper ones), as `permuteStored` keeps them.
 */
function storedInOrder(dim: number, complex: boolean, pieces: UpperPiece[], order: StorageOrder | 'locality' | 'lengths', shared: boolean): StoredHamiltonian {
  const alloc = (bytes: number): ArrayBufferLike => newBuffer(bytes, shared);
  const w = complex ? 2 : 1;
  let upper = 0;
  for (const p of pieces) upper += p.cols.length;
  const nnz = 2 * upper;
  const cols = new Int32Array(alloc(nnz * 4));
  // Entries of each basis row: the mirrors of upper entries in its column, plus its upper ones.
  // Transients from a slab of their own on large matrices (see pieceSlab.ts).
  const scratch = dim >= SLAB_MIN_DIM ? new PieceSlab() : undefined;
  const count = scratch ? scratch.uint32(dim) : new Uint32Array(dim);
  let take: Int32Array;
  let posOf: Int32Array;
  if (order === 'locality') {
    // The search's scratch is `count` (lower-list ends) and the first half of `cols`.
    ({ take, posOf } = breadthFirst(dim, pieces, count, cols.subarray(0, Math.max(1, upper)), scratch));
    for (let r = dim - 1; r > 0; r--) count[r]! -= count[r - 1]!;
  } else {
    ({ take, posOf } = order === 'lengths' ? identityOrder(dim, scratch) : order);
    for (const p of pieces) for (let e = 0; e < p.cols.length; e++) count[p.cols[e]!]!++;
  }
  for (const p of pieces) {
    for (let r = p.r0; r < p.r1; r++) {
      const i = r - p.r0;
      count[r]! += p.rowEnd[i]! - (i === 0 ? 0 : p.rowEnd[i - 1]!);
    }
  }
  if (typeof order === 'string') lengthSorted(take, posOf, count);
  const diag = new Float64Array(alloc(w * dim * 8));
  for (const p of pieces) {
    if (w === 1) for (let r = p.r0; r < p.r1; r++) diag[posOf[r]!] = p.diag[r - p.r0]!;
    else for (let r = p.r0; r < p.r1; r++) for (let k = 0; k < w; k++) diag[w * posOf[r]! + k] = p.diag[w * (r - p.r0) + k]!;
  }
  const coding = valueCodes(pieces, complex);
  // rowPtr[i + 1] starts as row i's start and moves along as the row fills: it then ends the row.
  const rowPtr = rowStarts(dim, nnz, alloc);
  let at = 0;
  for (let i = 0; i < dim; i++) {
    rowPtr[i + 1] = at;
    at += count[take[i]!]!;
  }
  const { codes, values } = entryValues(coding, nnz, w, alloc);
  let codeAt = 0;
  for (const p of pieces) {
    let e = 0;
    for (let r = p.r0; r < p.r1; r++) {
      const i = posOf[r]!;
      const end = p.rowEnd[r - p.r0]!;
      if (!codes && !values) {
        // One value: only the columns are placed (the common lattice case, kept free of placePair's branches).
        for (; e < end; e++) {
          const j = posOf[p.cols[e]!]!;
          cols[rowPtr[i + 1]!++] = j;
          cols[rowPtr[j + 1]!++] = i;
        }
        continue;
      }
      for (; e < end; e++) {
        const j = posOf[p.cols[e]!]!;
        placePair(cols, codes, values, coding?.conjugate, complex, codes ? coding!.codeOf[codeAt++]! : 0, p.values, p.oneValue ? 0 : e, rowPtr[i + 1]!++, j, rowPtr[j + 1]!++, i);
      }
    }
  }
  const out: StoredHamiltonian = coding ? { dim, complex, diag, rowPtr, cols, codes, table: coding.table } : { dim, complex, diag, rowPtr, cols, values };
  out.order = take;
  return out;
}

/** The entries' value storage: 8- or 16-bit codes when the values were coded, none for one real value, else doubles. */
function entryValues(coding: { count: number } | undefined, nnz: number, w: number, alloc: (bytes: number) => ArrayBufferLike): { codes?: Uint8Array | Uint16Array; values?: Float64Array } {
  if (!coding) return { values: new Float64Array(alloc(w * nnz * 8)) };
  // One real value: nothing per entry (a complex value and its conjugate are two codes).
  if (coding.count === 1 && w === 1) return {};
  return { codes: coding.count <= 256 ? new Uint8Array(alloc(nnz)) : new Uint16Array(alloc(nnz * 2)) };
}

/**
 * Upper entry e of a piece (values pv) at position pos in column col, and its mirror (the conjugate)
 * at position lp in column row: coded (the mirror gets the code's conjugate partner) or plain.
 */
function placePair(
  cols: Int32Array,
  codes: Uint8Array | Uint16Array | undefined,
  values: Float64Array | undefined,
  conjugate: Uint16Array | undefined,
  complex: boolean,
  code: number,
  pv: Float64Array,
  e: number,
  pos: number,
  col: number,
  lp: number,
  row: number,
): void {
  cols[pos] = col;
  cols[lp] = row;
  if (codes) {
    codes[pos] = code;
    codes[lp] = conjugate![code]!;
  } else if (!values) {
    // One-value matrix: the entry is table[0].
  } else if (complex) {
    values![2 * pos] = pv[2 * e]!;
    values![2 * pos + 1] = pv[2 * e + 1]!;
    values![2 * lp] = pv[2 * e]!;
    values![2 * lp + 1] = -pv[2 * e + 1]!;
  } else {
    values![pos] = pv[e]!;
    values![lp] = pv[e]!;
  }
}

/** The diagonal the pieces' `diag` views share, when they cover [0, dim) of one buffer in place; else undefined. */
function wholeDiagonal(pieces: UpperPiece[], w: number, dim: number, shared: boolean): Float64Array | undefined {
  const buffer = pieces[0]?.diag.buffer;
  if (!buffer || buffer instanceof SharedArrayBuffer !== shared || buffer.byteLength < w * dim * 8) return undefined;
  let rows = 0;
  for (const p of pieces) {
    if (p.diag.buffer !== buffer || p.diag.byteOffset !== w * p.r0 * 8 || p.diag.length !== w * (p.r1 - p.r0)) return undefined;
    rows += p.r1 - p.r0;
  }
  return rows === dim ? new Float64Array(buffer, 0, w * dim) : undefined;
}

/** The value every entry of the pieces has, when they are real one-value pieces (UpperPiece.oneValue) of one value, bit for bit; else undefined. */
function sharedOneValue(pieces: UpperPiece[], complex: boolean): number | undefined {
  if (complex) return undefined;
  let value: number | undefined;
  for (const p of pieces) {
    if (p.cols.length === 0) continue;
    if (!p.oneValue || (value !== undefined && !Object.is(p.values[0], value))) return undefined;
    value = p.values[0]!;
  }
  return value;
}

/**
 * The code of every upper entry (in piece order), the table of distinct values, and for each code
 * the code of its conjugate; undefined when there are more than MAX_CODES distinct values.
 */
function valueCodes(pieces: UpperPiece[], complex: boolean): { codeOf: Uint16Array; table: Float64Array; conjugate: Uint16Array; count: number } | undefined {
  const one = sharedOneValue(pieces, complex);
  // Every entry has one real value (a lattice hopping): no per-entry codes are needed or stored.
  if (one !== undefined) return { codeOf: new Uint16Array(0), table: Float64Array.of(one), conjugate: Uint16Array.of(0), count: 1 };
  let upper = 0;
  for (const p of pieces) upper += p.cols.length;
  const w = complex ? 2 : 1;
  // Open addressing on the values' bits; 4·MAX_CODES slots keep it at most a quarter full.
  const slots = new Int32Array(4 * MAX_CODES).fill(-1);
  const mask = slots.length - 1;
  const table = new Float64Array(w * 2 * MAX_CODES);
  const bits = new Uint32Array(table.buffer);
  let count = 0;
  const codeOf = new Uint16Array(upper);
  const probe = new Float64Array(2);
  const probeBits = new Uint32Array(probe.buffer);
  const find = (re: number, im: number): number => {
    probe[0] = re;
    probe[1] = im;
    let h = Math.imul(probeBits[0]! ^ Math.imul(probeBits[1]!, 0x9e3779b1), 0x85ebca6b);
    if (complex) h = Math.imul(h ^ probeBits[2]! ^ Math.imul(probeBits[3]!, 0x27d4eb2f), 0xc2b2ae35);
    let s = (h ^ (h >>> 15)) & mask;
    for (;;) {
      const c = slots[s]!;
      if (c === -1) break;
      // Compare bit patterns so −0 and 0 stay distinct codes (products keep signs exactly).
      const b = 2 * w * c;
      if (bits[b] === probeBits[0] && bits[b + 1] === probeBits[1] && (!complex || (bits[b + 2] === probeBits[2] && bits[b + 3] === probeBits[3]))) return c;
      s = (s + 1) & mask;
    }
    if (count === MAX_CODES) return -1;
    slots[s] = count;
    table[w * count] = re;
    if (complex) table[w * count + 1] = im;
    return count++;
  };
  let at = 0;
  // Runs of equal values are common (a lattice model has one hopping value): skip the hash for them.
  let lastRe = NaN;
  let lastIm = NaN;
  let lastCode = -1;
  for (const p of pieces) {
    for (let e = 0; e < p.cols.length; e++) {
      const k = p.oneValue ? 0 : e;
      const re = complex ? p.values[2 * k]! : p.values[k]!;
      const im = complex ? p.values[2 * k + 1]! : 0;
      if (!Object.is(re, lastRe) || !Object.is(im, lastIm)) {
        lastCode = find(re, im);
        if (lastCode < 0) return undefined;
        lastRe = re;
        lastIm = im;
      }
      codeOf[at++] = lastCode;
    }
  }
  const conjugate = new Uint16Array(Math.max(1, count));
  for (let c = 0; c < count; c++) {
    if (!complex) {
      conjugate[c] = c;
      continue;
    }
    const code = find(table[2 * c]!, -table[2 * c + 1]!);
    if (code < 0) return undefined;
    conjugate[c] = code;
  }
  return { codeOf, table: table.slice(0, w * count), conjugate, count };
}

/*
 * The real product kernels. The entry index is carried across rows (one row start read a row);
 * with 32-bit row starts it stays an int. Four rows of one length are summed together: rows are
 * short (about 3 entries) and of random length, so a loop per row pays a mispredicted exit per
 * row, which costs more than its gathers; where rows are stored sorted by length (`lengthSorted`)
 * nearly every group of four qualifies, and the exit is predictable. Each row's sum is taken in
 * the same order either way, so results do not depend on which path a row took.
 */

/** A one-value matrix (a lattice model's hopping): the value is factored out of each row's sum. */
function oneValueRows(m: StoredHamiltonian, x: Float64Array, y: Float64Array, r0: number, r1: number, yAt: number): void {
  const { rowPtr, cols, diag } = m;
  const v = m.table![0]!;
  let e = rowPtr[r0]!;
  for (let r = r0; r < r1; ) {
    const len = rowPtr[r + 1]! - e;
    if (r + 4 <= r1 && rowPtr[r + 2]! - e === 2 * len && rowPtr[r + 3]! - e === 3 * len && rowPtr[r + 4]! - e === 4 * len) {
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (const end = e + len; e < end; e++) {
        s0 += x[cols[e]!]!;
        s1 += x[cols[e + len]!]!;
        s2 += x[cols[e + 2 * len]!]!;
        s3 += x[cols[e + 3 * len]!]!;
      }
      e += 3 * len;
      y[r - yAt] = diag[r]! * x[r]! + v * s0;
      y[r - yAt + 1] = diag[r + 1]! * x[r + 1]! + v * s1;
      y[r - yAt + 2] = diag[r + 2]! * x[r + 2]! + v * s2;
      y[r - yAt + 3] = diag[r + 3]! * x[r + 3]! + v * s3;
      r += 4;
    } else {
      let s = 0;
      for (const end = e + len; e < end; e++) s += x[cols[e]!]!;
      y[r - yAt] = diag[r]! * x[r]! + v * s;
      r++;
    }
  }
}

/**
 * Entry values from a table: table[codes[e]] (8- or 16-bit codes) or, without codes, the doubles
 * table[e] of `values`. The choice is one predictable branch per entry.
 */
function tabledRows(m: StoredHamiltonian, t: Float64Array, codes: Uint8Array | Uint16Array | undefined, x: Float64Array, y: Float64Array, r0: number, r1: number, yAt: number): void {
  const { rowPtr, cols, diag } = m;
  let e = rowPtr[r0]!;
  for (let r = r0; r < r1; ) {
    const len = rowPtr[r + 1]! - e;
    if (r + 4 <= r1 && rowPtr[r + 2]! - e === 2 * len && rowPtr[r + 3]! - e === 3 * len && rowPtr[r + 4]! - e === 4 * len) {
      let s0 = diag[r]! * x[r]!;
      let s1 = diag[r + 1]! * x[r + 1]!;
      let s2 = diag[r + 2]! * x[r + 2]!;
      let s3 = diag[r + 3]! * x[r + 3]!;
      for (const end = e + len; e < end; e++) {
        s0 += t[codes ? codes[e]! : e]! * x[cols[e]!]!;
        s1 += t[codes ? codes[e + len]! : e + len]! * x[cols[e + len]!]!;
        s2 += t[codes ? codes[e + 2 * len]! : e + 2 * len]! * x[cols[e + 2 * len]!]!;
        s3 += t[codes ? codes[e + 3 * len]! : e + 3 * len]! * x[cols[e + 3 * len]!]!;
      }
      e += 3 * len;
      y[r - yAt] = s0;
      y[r - yAt + 1] = s1;
      y[r - yAt + 2] = s2;
      y[r - yAt + 3] = s3;
      r += 4;
    } else {
      let s = diag[r]! * x[r]!;
      for (const end = e + len; e < end; e++) s += t[codes ? codes[e]! : e]! * x[cols[e]!]!;
      y[r - yAt] = s;
      r++;
    }
  }
}

/**
 * y = H x over rows r0..r1 (vectors interleaved when complex); row r goes to y[r − yAt], so a
 * caller can take a block of rows into a short buffer (see `replayFusedRange`).
 */
export function applyStoredRows(m: StoredHamiltonian, x: Float64Array, y: Float64Array, r0 = 0, r1 = m.dim, yAt = 0): void {
  const { rowPtr, cols, diag } = m;
  if (!m.complex) {
    if (!m.codes && !m.values) oneValueRows(m, x, y, r0, r1, yAt);
    else tabledRows(m, m.values ?? m.table!, m.codes, x, y, r0, r1, yAt);
    return;
  }
  // Complex: entries as (re, im) pairs, from the table or the values.
  const pairs = m.values ?? m.table!;
  const codes = m.codes;
  for (let r = r0; r < r1; r++) {
    const d = diag[2 * r]!;
    let sr = d * x[2 * r]!;
    let si = d * x[2 * r + 1]!;
    for (let e = rowPtr[r]!, end = rowPtr[r + 1]!; e < end; e++) {
      const v = 2 * (codes ? codes[e]! : e);
      const c = 2 * cols[e]!;
      const vr = pairs[v]!;
      const vi = pairs[v + 1]!;
      const xr = x[c]!;
      const xi = x[c + 1]!;
      sr += vr * xr - vi * xi;
      si += vr * xi + vi * xr;
    }
    y[2 * (r - yAt)] = sr;
    y[2 * (r - yAt) + 1] = si;
  }
}

/** This thread's block buffer for fused replays (each worker thread has its own module instance). */
let replayScratch = new Float64Array(0);

/**
 * One replayed two-pass Lanczos step fused with the product over rows [r0, r1), in storage order
 * (`replayFusedRange`): x += yj·v and vPrev ← (H v − a·v − b·vPrev)·inv.
 */
export function replayStoredRows(m: StoredHamiltonian, v: Float64Array, vPrev: Float64Array, x: Float64Array, a: number, b: number, inv: number, yj: number, r0 = 0, r1 = m.dim): void {
  const width = m.complex ? 2 : 1;
  if (replayScratch.length < width * REPLAY_BLOCK) replayScratch = new Float64Array(width * REPLAY_BLOCK);
  replayFusedRange((y, rb, re) => applyStoredRows(m, v, y, rb, re, rb), width, v, vPrev, x, a, b, inv, yj, r0, r1, replayScratch);
}

/**
 * The same matrix with storage row i taken from row `take[i]` of `m`; `posOf` is the inverse map
 * (old row → new row). Columns are renumbered; each row keeps its entries' order (ascending basis
 * index in every matrix made here) unless `ascending` sorts them by their new column.
 */
function permuteStored(m: StoredHamiltonian, take: Int32Array, posOf: Int32Array, order: Int32Array | undefined, shared: boolean, ascending = false): StoredHamiltonian {
  const alloc = (bytes: number): ArrayBufferLike => newBuffer(bytes, shared);
  const { dim, complex } = m;
  const w = complex ? 2 : 1;
  const nnz = m.rowPtr[dim]!;
  const rowPtr = rowStarts(dim, nnz, alloc);
  const cols = new Int32Array(alloc(nnz * 4));
  const diag = new Float64Array(alloc(w * dim * 8));
  const codes = m.codes ? (m.codes instanceof Uint8Array ? new Uint8Array(alloc(nnz)) : new Uint16Array(alloc(2 * nnz))) : undefined;
  const values = m.values ? new Float64Array(alloc(w * nnz * 8)) : undefined;
  let at = 0;
  for (let i = 0; i < dim; i++) {
    const r = take[i]!;
    rowPtr[i] = at;
    for (let k = 0; k < w; k++) diag[w * i + k] = m.diag[w * r + k]!;
    const start = at;
    for (let e = m.rowPtr[r]!, end = m.rowPtr[r + 1]!; e < end; e++, at++) {
      // Insertion by column: rows hold a handful of entries.
      const c = posOf[m.cols[e]!]!;
      let j = at;
      while (ascending && j > start && cols[j - 1]! > c) {
        cols[j] = cols[j - 1]!;
        if (codes) codes[j] = codes[j - 1]!;
        else if (values) for (let k = 0; k < w; k++) values[w * j + k] = values[w * (j - 1) + k]!;
        j--;
      }
      cols[j] = c;
      if (codes) codes[j] = m.codes![e]!;
      else if (values) for (let k = 0; k < w; k++) values[w * j + k] = m.values![w * e + k]!;
    }
  }
  rowPtr[dim] = at;
  const out: StoredHamiltonian = { dim, complex, diag, rowPtr, cols };
  if (m.table) out.table = m.table;
  if (codes) out.codes = codes;
  else if (values) out.values = values;
  if (order) out.order = order;
  return out;
}

/**
 * The breadth-first order `reorderForLocality` finds, read straight from upper-triangle pieces (in
 * row order) before any stored matrix exists. A row's neighbours are visited as its stored row
 * lists them: the mirrored lower ones, then its upper ones. Only the lower ones need a transposed
 * copy (4 bytes an upper entry); the upper ones are read from the pieces.
 */
export function localityOrder(dim: number, pieces: UpperPiece[]): StorageOrder {
  let upper = 0;
  for (const p of pieces) upper += p.cols.length;
  return breadthFirst(dim, pieces, new Uint32Array(dim), new Int32Array(Math.max(1, upper)));
}

/**
 * `localityOrder` in caller-given scratch: `lowEnd` (dim zeros) ends up holding where each row's
 * list of lower neighbours ends in `lowAdj` (at least one slot per upper entry).
 */
function breadthFirst(dim: number, pieces: UpperPiece[], lowEnd: Uint32Array, lowAdj: Int32Array, scratch?: PieceSlab): StorageOrder {
  // Lower-list lengths, then starts, then (after the fill) ends. 32 bits suffice: they index a typed array.
  for (const p of pieces) for (let e = 0; e < p.cols.length; e++) lowEnd[p.cols[e]!]!++;
  let at = 0;
  for (let r = 0; r < dim; r++) {
    const n = lowEnd[r]!;
    lowEnd[r] = at;
    at += n;
  }
  for (const p of pieces) {
    let e = 0;
    for (let r = p.r0; r < p.r1; r++) for (const end = p.rowEnd[r - p.r0]!; e < end; e++) lowAdj[lowEnd[p.cols[e]!]!++] = r;
  }
  return breadthFirstOrder(
    dim,
    (r, visit) => {
      for (let e = r === 0 ? 0 : lowEnd[r - 1]!, end = lowEnd[r]!; e < end; e++) visit(lowAdj[e]!);
      // The piece holding row r: a binary search over the few pieces' first rows.
      let lo = 0;
      for (let hi = pieces.length - 1; lo < hi; ) {
        const mid = (lo + hi + 1) >> 1;
        if (pieces[mid]!.r0 <= r) lo = mid;
        else hi = mid - 1;
      }
      while (pieces[lo]!.r1 <= r) lo--; // past empty pieces that start at r
      const p = pieces[lo]!;
      const i = r - p.r0;
      for (let e = i === 0 ? 0 : p.rowEnd[i - 1]!, end = p.rowEnd[i]!; e < end; e++) visit(p.cols[e]!);
    },
    scratch?.int32(dim),
  );
}

/** Basis order as a StorageOrder. */
function identityOrder(dim: number, scratch?: PieceSlab): StorageOrder {
  // A plain loop: `Int32Array.from` with a map function costs tens of milliseconds at 10^6 rows.
  const take = new Int32Array(dim);
  const posOf = scratch ? scratch.int32(dim) : new Int32Array(dim);
  for (let i = 0; i < dim; i++) take[i] = posOf[i] = i;
  return { take, posOf };
}

/** Rows per window that `lengthSorted` sorts: measured at D = 10^6, 4096 beat 256 and 1024 (and the whole matrix, which loses locality). */
export const LENGTH_WINDOW = 4096;

/**
 * Sort the order's rows by their length (entries per stored row, `lengthOf` by basis row) within
 * consecutive windows of `windowRows` storage rows, stably: the rows stay near where the order put
 * them, and the product kernels find runs of four rows of one length (see `oneValueRows`).
 */
export function lengthSorted(take: Int32Array, posOf: Int32Array, lengthOf: Uint32Array | Int32Array, windowRows = LENGTH_WINDOW): void {
  const dim = take.length;
  let longest = 0;
  for (let r = 0; r < dim; r++) longest = Math.max(longest, lengthOf[r]!);
  const starts = new Int32Array(longest + 2);
  const window = new Int32Array(Math.min(dim, windowRows));
  for (let w0 = 0; w0 < dim; w0 += windowRows) {
    const w1 = Math.min(dim, w0 + windowRows);
    starts.fill(0);
    for (let i = w0; i < w1; i++) starts[lengthOf[take[i]!]! + 1]!++;
    for (let k = 1; k <= longest; k++) starts[k]! += starts[k - 1]!;
    for (let i = w0; i < w1; i++) window[starts[lengthOf[take[i]!]!]!++] = take[i]!;
    for (let i = w0; i < w1; i++) {
      const r = window[i - w0]!;
      take[i] = r;
      posOf[r] = i;
    }
  }
}

/**
 * Breadth-first order of a graph on `dim` vertices, each component from its lowest unvisited vertex;
 * `neighbours(r, visit)` calls `visit` on every neighbour of r, in the order they are to be taken.
 */
function breadthFirstOrder(dim: number, neighbours: (r: number, visit: (c: number) => void) => void, posOfArray?: Int32Array): StorageOrder {
  const take = new Int32Array(dim);
  const posOf = (posOfArray ?? new Int32Array(dim)).fill(-1);
  let head = 0;
  let tail = 0;
  const visit = (c: number): void => {
    if (posOf[c]! < 0) {
      posOf[c] = tail;
      take[tail++] = c;
    }
  };
  for (let s = 0; s < dim; s++) {
    if (posOf[s]! >= 0) continue;
    visit(s);
    while (head < tail) neighbours(take[head++]!, visit);
  }
  return { take, posOf };
}

/**
 * Renumber the rows in breadth-first order of the matrix graph (Cuthill–McKee without the degree
 * sort): a row's neighbours then sit close together, so a product's gathers from x mostly hit
 * cache lines already loaded. On a sampled Heisenberg subspace at D = 10^6 this halved the product
 * time. The result records the order; `storedOperator` and `toSparseMatrix` undo it. The solver
 * assembles this order, then sorted by length (`sortRowsByLength`), straight from the build's
 * pieces without a second copy: `storedFromPieces(..., 'locality')`.
 */
export function reorderForLocality(m: StoredHamiltonian, shared = false): StoredHamiltonian {
  const { dim, rowPtr, cols } = m;
  const renumbering = breadthFirstOrder(dim, (r, visit) => {
    for (let e = rowPtr[r]!, end = rowPtr[r + 1]!; e < end; e++) visit(cols[e]!);
  });
  return renumbered(m, renumbering, shared);
}

/**
 * The same matrix with its rows sorted by length within windows (`lengthSorted`), composed with any
 * earlier order: what the solver's 'locality' and 'lengths' assemblies make straight from the pieces.
 */
export function sortRowsByLength(m: StoredHamiltonian, shared = false): StoredHamiltonian {
  const { dim, rowPtr } = m;
  const renumbering = identityOrder(dim);
  const lengthOf = Int32Array.from({ length: dim }, (_, r) => rowPtr[r + 1]! - rowPtr[r]!);
  lengthSorted(renumbering.take, renumbering.posOf, lengthOf);
  return renumbered(m, renumbering, shared);
}

/** m with its storage rows renumbered (storage row i ← row take[i] of m), the order composed with m's own. */
function renumbered(m: StoredHamiltonian, { take, posOf }: StorageOrder, shared: boolean): StoredHamiltonian {
  // Storage row i holds basis row order_old[take[i]].
  const order = m.order ? Int32Array.from(take, (r) => m.order![r]!) : take;
  return permuteStored(m, take, posOf, order, shared);
}

/** The matrix with rows back in basis order (itself when it already is). */
export function inBasisOrder(m: StoredHamiltonian): StoredHamiltonian {
  if (!m.order) return m;
  const posOf = new Int32Array(m.dim);
  for (let i = 0; i < m.dim; i++) posOf[m.order[i]!] = i;
  // Row b of the result is storage row posOf[b]; a column (storage row) c becomes basis row order[c].
  return permuteStored(m, posOf, m.order, undefined, false, true);
}

/** x in basis order → storage order (`toStorage`), or back; complex vectors move in pairs. */
export function permuteVector(m: StoredHamiltonian, x: Float64Array, out: Float64Array, toStorage: boolean): void {
  const order = m.order!;
  const w = m.complex ? 2 : 1;
  for (let i = 0; i < m.dim; i++) {
    const b = order[i]!;
    for (let k = 0; k < w; k++) {
      if (toStorage) out[w * i + k] = x[w * b + k]!;
      else out[w * b + k] = x[w * i + k]!;
    }
  }
}

/**
 * x in storage order → basis order in place, following the permutation's cycles (a byte a row to
 * mark them), so a large eigenvector is not copied.
 */
export function toBasisOrderInPlace(m: StoredHamiltonian, x: Float64Array): void {
  const order = m.order!;
  const w = m.complex ? 2 : 1;
  const done = new Uint8Array(m.dim);
  for (let s = 0; s < m.dim; s++) {
    if (done[s]) continue;
    // Carry storage row i's entry to basis row order[i], picking up the entry found there.
    let re = x[w * s]!;
    let im = w === 2 ? x[w * s + 1]! : 0;
    let i = s;
    do {
      const t = order[i]!;
      done[t] = 1;
      const re2 = x[w * t]!;
      x[w * t] = re;
      re = re2;
      if (w === 2) {
        const im2 = x[w * t + 1]!;
        x[w * t + 1] = im;
        im = im2;
      }
      i = t;
    } while (i !== s);
  }
}

/** The classic CSR form in basis order (diagonal inside each row, zero diagonals not stored), for export and tests. */
export function toSparseMatrix(stored: StoredHamiltonian): SparseMatrix {
  const m = inBasisOrder(stored);
  const { dim, complex } = m;
  const w = complex ? 2 : 1;
  const hasDiag = (r: number): boolean => (complex ? m.diag[2 * r] !== 0 || m.diag[2 * r + 1] !== 0 : m.diag[r] !== 0);
  const rowPtr = new Float64Array(dim + 1);
  let at = 0;
  for (let r = 0; r < dim; r++) {
    rowPtr[r] = at;
    at += m.rowPtr[r + 1]! - m.rowPtr[r]! + (hasDiag(r) ? 1 : 0);
  }
  rowPtr[dim] = at;
  const cols = new Int32Array(at);
  const values = new Float64Array(w * at);
  const pairs = m.values ?? m.table!;
  for (let r = 0; r < dim; r++) {
    let pos = rowPtr[r]!;
    let diagDone = !hasDiag(r);
    for (let e = m.rowPtr[r]!; e <= m.rowPtr[r + 1]!; e++) {
      // The diagonal goes before the first column above it.
      if (!diagDone && (e === m.rowPtr[r + 1]! || m.cols[e]! > r)) {
        cols[pos] = r;
        for (let k = 0; k < w; k++) values[w * pos + k] = m.diag[w * r + k]!;
        pos++;
        diagDone = true;
      }
      if (e === m.rowPtr[r + 1]!) break;
      const v = m.codes ? m.codes[e]! : m.values ? e : 0;
      cols[pos] = m.cols[e]!;
      for (let k = 0; k < w; k++) values[w * pos + k] = pairs[w * v + k]!;
      pos++;
    }
  }
  return { dim, complex, rowPtr, cols, values };
}
