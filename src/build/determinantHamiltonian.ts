import type { Basis } from '../bits/basis.js';
import { buildPairSlots, lookupPair } from '../bits/pairIndex.js';
import type { Integrals } from '../operators/integrals.js';
import { joinRowPieces, type SparseMatrix, type SparseMatrixPiece } from './sparseMatrix.js';
import { splitSpinStrings, type SpinSplit, type SpinStrings } from './spinStrings.js';
import { stringConnections, type StringConnections } from './stringConnections.js';

/**
 * Everything the determinant-basis row builder reads, prepared once and shared by every row range
 * (all typed arrays, so worker threads can receive them). Rows are Jordan–Wigner determinants:
 * spin-up orbital p on qubit p, spin-down orbital p on qubit M + p.
 */
export interface DeterminantContext {
  dim: number;
  orbitals: number;
  core: number;
  eri: Float64Array;
  split: SpinSplit;
  alphaLinks: StringConnections;
  betaLinks: StringConnections;
  /** Hash over (spin-up index, spin-down index) → row; empty when the basis is a full product. */
  pairSlots: Int32Array;
  /** (pp|qq), M×M: the opposite-spin Coulomb term of the diagonal. */
  coulomb: Float64Array;
  /** Per a·M + i: whether (ai|··) has any nonzero, so opposite-spin doubles through it can be skipped. */
  liveExc: Uint8Array;
  /** Rows by spin-down string: rows betaStart[ib] .. betaStart[ib+1] (the basis is sorted spin-down first). */
  betaStart: Int32Array;
  /** Rows by spin-up string (CSR): alphaRows[alphaStart[ia] .. alphaStart[ia+1]]. */
  alphaStart: Int32Array;
  alphaRows: Int32Array;
  /** Spin-down string of each alphaRows entry, side by side so the walk reads memory in order. */
  alphaRowsBeta: Int32Array;
  /**
   * Sampled bases: walk the rows sharing a string when there are at most `scanFactor` times as many
   * as the connections to probe by hash (a walk step is much cheaper than a probe). Default 4.
   */
  scanFactor: number;
}

/** Split the basis into spin strings and find every string connection (the work shared by all rows). */
export function prepareDeterminants(basis: Basis, ints: Integrals, opts: { scanFactor?: number } = {}): DeterminantContext {
  const m = ints.orbitals;
  const split = splitSpinStrings(basis, m);
  const alphaLinks = stringConnections(split.alpha, ints);
  // Symmetric samples often give both spins the same strings: connect them once.
  const betaLinks = sameStrings(split.alpha, split.beta) ? alphaLinks : stringConnections(split.beta, ints);
  const coulomb = new Float64Array(m * m);
  for (let p = 0; p < m; p++) for (let q = 0; q < m; q++) coulomb[p * m + q] = ints.eri[((p * m + p) * m + q) * m + q]!;
  const liveExc = new Uint8Array(m * m);
  const m2 = m * m;
  for (let x = 0; x < m2; x++) {
    for (let y = 0; y < m2; y++) {
      if (ints.eri[x * m2 + y] !== 0) {
        liveExc[x] = 1;
        break;
      }
    }
  }
  const dim = basis.dim;
  const pairSlots = split.product ? new Int32Array(1) : buildPairSlots(split.rowAlpha, split.rowBeta, dim);
  const betaStart = new Int32Array(split.beta.count + 1);
  for (let r = 0; r < dim; r++) {
    if (r > 0 && split.rowBeta[r]! < split.rowBeta[r - 1]!) throw new Error('determinant basis is not sorted (spin-down string first)');
    betaStart[split.rowBeta[r]! + 1]!++;
  }
  for (let b = 0; b < split.beta.count; b++) betaStart[b + 1]! += betaStart[b]!;
  const alphaStart = new Int32Array(split.alpha.count + 1);
  for (let r = 0; r < dim; r++) alphaStart[split.rowAlpha[r]! + 1]!++;
  for (let a = 0; a < split.alpha.count; a++) alphaStart[a + 1]! += alphaStart[a]!;
  const fill = alphaStart.slice(0, split.alpha.count);
  const alphaRows = new Int32Array(dim);
  const alphaRowsBeta = new Int32Array(dim);
  for (let r = 0; r < dim; r++) {
    const at = fill[split.rowAlpha[r]!]!++;
    alphaRows[at] = r;
    alphaRowsBeta[at] = split.rowBeta[r]!;
  }
  return { dim, orbitals: m, core: ints.core, eri: ints.eri, split, alphaLinks, betaLinks, pairSlots, coulomb, liveExc, betaStart, alphaStart, alphaRows, alphaRowsBeta, scanFactor: opts.scanFactor ?? 4 };
}

function sameStrings(a: SpinStrings, b: SpinStrings): boolean {
  if (a === b) return true;
  if (a.count !== b.count || a.electrons !== b.electrons || a.nWords !== b.nWords) return false;
  for (let i = 0; i < a.count * a.nWords; i++) if (a.states[i] !== b.states[i]) return false;
  return true;
}

/** Row of the determinant (spin-up string ia, spin-down string ib), or −1 when it is not in the basis. */
export function determinantRow(ctx: DeterminantContext, ia: number, ib: number): number {
  const s = ctx.split;
  return s.product ? ib * s.alpha.count + ia : lookupPair(s.rowAlpha, s.rowBeta, ctx.pairSlots, ia, ib);
}

/** The diagonal element ⟨D|H|D⟩ of row r (core energy included). */
export function determinantDiagonal(ctx: DeterminantContext, r: number): number {
  const { split, alphaLinks, betaLinks, coulomb, orbitals: m } = ctx;
  const ia = split.rowAlpha[r]!;
  const ib = split.rowBeta[r]!;
  const na = split.alpha.electrons;
  const nb = split.beta.electrons;
  let e = ctx.core + alphaLinks.diagonal[ia]! + betaLinks.diagonal[ib]!;
  for (let x = 0; x < na; x++) {
    const p = split.alpha.occ[ia * na + x]!;
    for (let y = 0; y < nb; y++) e += coulomb[p * m + split.beta.occ[ib * nb + y]!]!;
  }
  return e;
}

/**
 * Rows r0..r1 of H in the determinant basis by the Slater–Condon rules: the diagonal, single and
 * double excitations of each spin, and opposite-spin doubles, each looked up among the basis rows;
 * connected determinants outside the basis are skipped. Real symmetric; within a row the columns
 * come in a deterministic order (diagonal first, then by excitation kind), not sorted. `rowEnd`
 * may be passed when the rows were already counted (`countDeterminantRows`).
 */
export function buildDeterminantRows(ctx: DeterminantContext, r0: number, r1: number, rowEnd: Float64Array = countDeterminantRows(ctx, r0, r1)): SparseMatrixPiece {
  // Counted first (or by the caller), then filled into arrays of the exact size: enumeration is
  // cheap next to growing and copying arrays of hundreds of megabytes.
  const out = RowSink.store(r1 > r0 ? rowEnd[r1 - r0 - 1]! : 0);
  forEachRow(ctx, r0, r1, out, () => undefined);
  return { r0, r1, rowEnd, cols: out.cols, values: out.values };
}

/** Entries of rows r0..r1 without storing them: rowEnd[i] is the running count after row r0 + i. */
export function countDeterminantRows(ctx: DeterminantContext, r0: number, r1: number): Float64Array {
  const rowEnd = new Float64Array(r1 - r0);
  const counter = RowSink.counter();
  forEachRow(ctx, r0, r1, counter, (r) => {
    rowEnd[r - r0] = counter.size;
  });
  return rowEnd;
}

/** The whole determinant-basis Hamiltonian on one thread. */
export function buildDeterminantHamiltonian(basis: Basis, ints: Integrals): SparseMatrix {
  return pieceMatrix(basis.dim, buildDeterminantRows(prepareDeterminants(basis, ints), 0, basis.dim));
}

/** A matrix made of one piece holding every row, without copying its arrays (unlike `joinRowPieces`). */
export function pieceMatrix(dim: number, piece: SparseMatrixPiece): SparseMatrix {
  if (piece.r0 !== 0 || piece.r1 !== dim) return joinRowPieces(dim, false, [piece]);
  const rowPtr = new Float64Array(dim + 1);
  rowPtr.set(piece.rowEnd, 1);
  return { dim, complex: false, rowPtr, cols: piece.cols, values: piece.values };
}

/**
 * An upper bound on the stored entries of rows r0..r1 (exact for a full product basis, where every
 * connected determinant is present), computed from the string connections without building.
 */
export function determinantNonzeroBound(ctx: DeterminantContext, r0 = 0, r1 = ctx.dim): number {
  const { split, alphaLinks: A, betaLinks: B } = ctx;
  let total = 0;
  for (let r = r0; r < r1; r++) {
    const ia = split.rowAlpha[r]!;
    const ib = split.rowBeta[r]!;
    const sa = A.singleStart[ia + 1]! - A.singleStart[ia]!;
    const sb = B.singleStart[ib + 1]! - B.singleStart[ib]!;
    total += 1 + sa + sb + sa * sb + (A.doubleStart[ia + 1]! - A.doubleStart[ia]!) + (B.doubleStart[ib + 1]! - B.doubleStart[ib]!);
  }
  return total;
}

/**
 * Receives the entries of one row at a time: counts them, stores them, or accumulates Σ v·x[col].
 * One class for the three uses keeps the builder's call site monomorphic, so the JIT inlines it.
 */
export class RowSink {
  /** Entries seen (count and store), or stored so far. */
  size = 0;
  /** Running Σ value · x[col] of the current row (dot mode). */
  sum = 0;
  private constructor(
    private readonly mode: 0 | 1 | 2,
    readonly cols: Int32Array,
    readonly values: Float64Array,
    private readonly x: Float64Array,
  ) {}

  /** A sink that only counts entries. */
  static counter(): RowSink {
    return new RowSink(0, new Int32Array(0), new Float64Array(0), new Float64Array(0));
  }

  /** A sink storing up to `capacity` entries in `cols` and `values`. */
  static store(capacity: number): RowSink {
    return new RowSink(1, new Int32Array(capacity), new Float64Array(capacity), new Float64Array(0));
  }

  /** A sink accumulating the row's product with `x` in `sum`. */
  static dot(x: Float64Array): RowSink {
    return new RowSink(2, new Int32Array(0), new Float64Array(0), x);
  }

  add(col: number, value: number): void {
    if (this.mode === 2) this.sum += value * this.x[col]!;
    else {
      if (this.mode === 1) {
        this.cols[this.size] = col;
        this.values[this.size] = value;
      }
      this.size++;
    }
  }
}

/**
 * Visit every nonzero ⟨row|H|col⟩ of rows r0..r1, calling `done(r)` after each row. The one
 * implementation of the Slater–Condon rules, shared by the stored and the matrix-free forms.
 */
export function forEachRow(ctx: DeterminantContext, r0: number, r1: number, sink: RowSink, done: (r: number) => void): void {
  // One call per row keeps the hot functions small, so the JIT optimises them within the first rows.
  if (ctx.split.product) {
    for (let r = r0; r < r1; r++) {
      productRow(ctx, r, sink);
      done(r);
    }
    return;
  }
  const batch = new BetaBatch(ctx.split.alpha.count, ctx.split.beta.count);
  for (let r = r0; r < r1; r++) {
    if (ctx.split.rowBeta[r] !== batch.beta) batch.prepare(ctx, ctx.split.rowBeta[r]!);
    sampledRow(ctx, r, sink, batch);
    done(r);
  }
}

/** Row of a full product basis: every connected determinant is present at iβ·nα + iα. */
function productRow(ctx: DeterminantContext, r: number, sink: RowSink): void {
  const { split, alphaLinks: A, betaLinks: B, eri, liveExc, orbitals: m } = ctx;
  const na = split.alpha.electrons;
  const nb = split.beta.electrons;
  const aOcc = split.alpha.occ;
  const bOcc = split.beta.occ;
  const nA = split.alpha.count;
  const m2 = m * m;
  const diagStride = m + 1;
  const ia = split.rowAlpha[r]!;
  const ib = split.rowBeta[r]!;
  const diagonal = determinantDiagonal(ctx, r);
  if (diagonal !== 0) sink.add(r, diagonal);
  // Spin-up singles: the same-spin part is stored; add the Coulomb term with the spin-down electrons.
  for (let e = A.singleStart[ia]!; e < A.singleStart[ia + 1]!; e++) {
    const row = A.singleExc[e]! * m2;
    let v = A.singlePartial[e]!;
    for (let y = 0; y < nb; y++) v += eri[row + bOcc[ib * nb + y]! * diagStride]!;
    if (v !== 0) sink.add(ib * nA + A.singleTarget[e]!, A.singleSign[e]! * v);
  }
  for (let e = B.singleStart[ib]!; e < B.singleStart[ib + 1]!; e++) {
    const row = B.singleExc[e]! * m2;
    let v = B.singlePartial[e]!;
    for (let x = 0; x < na; x++) v += eri[row + aOcc[ia * na + x]! * diagStride]!;
    if (v !== 0) sink.add(B.singleTarget[e]! * nA + ia, B.singleSign[e]! * v);
  }
  for (let e = A.doubleStart[ia]!; e < A.doubleStart[ia + 1]!; e++) sink.add(ib * nA + A.doubleTarget[e]!, A.doubleValue[e]!);
  for (let e = B.doubleStart[ib]!; e < B.doubleStart[ib + 1]!; e++) sink.add(B.doubleTarget[e]! * nA + ia, B.doubleValue[e]!);
  // Opposite-spin doubles: ±(ai|bj) for spin-up i → a and spin-down j → b.
  const bStart = B.singleStart[ib]!;
  const bEnd = B.singleStart[ib + 1]!;
  for (let e = A.singleStart[ia]!; e < A.singleStart[ia + 1]!; e++) {
    const excA = A.singleExc[e]!;
    if (!liveExc[excA]) continue;
    const ja = A.singleTarget[e]!;
    const row = excA * m2;
    const sa = A.singleSign[e]!;
    for (let f = bStart; f < bEnd; f++) {
      const v = eri[row + B.singleExc[f]!]!;
      if (v !== 0) sink.add(B.singleTarget[f]! * nA + ja, sa * B.singleSign[f]! * v);
    }
  }
}

/**
 * Per-thread scratch for sampled bases. The basis is sorted spin-down string first, so the rows of
 * one spin-down string ib form a batch; everything that depends only on ib is prepared once per
 * batch: where each spin-up string sits in the batch, the marks of ib's connected spin-down strings,
 * and, bucketed by spin-up string, every row whose spin-down string is a single of ib. A row then
 * finds its opposite-spin doubles by looking up the buckets of its connected spin-up strings.
 */
class BetaBatch {
  beta = -1;
  /** Row of spin-up string ja within the batch (valid where posStamp[ja] = beta + 1). */
  readonly posRow: Int32Array;
  readonly posStamp: Int32Array;
  /** Marks of ib's connected spin-down strings: entry f ≥ 0 single, −f − 1 double. */
  readonly stampB: Int32Array;
  readonly entryB: Int32Array;
  /** Buckets by spin-up string of rows whose spin-down string is a single of ib (linked lists). */
  readonly head: Int32Array;
  readonly headStamp: Int32Array;
  next = new Int32Array(64);
  itemRow = new Int32Array(64);
  itemEntry = new Int32Array(64);

  constructor(nA: number, nB: number) {
    this.posRow = new Int32Array(nA);
    this.posStamp = new Int32Array(nA);
    this.stampB = new Int32Array(nB);
    this.entryB = new Int32Array(nB);
    this.head = new Int32Array(nA);
    this.headStamp = new Int32Array(nA);
  }

  prepare(ctx: DeterminantContext, ib: number): void {
    const { split, betaLinks: B, betaStart } = ctx;
    const rowAlpha = split.rowAlpha;
    const stamp = ib + 1;
    this.beta = ib;
    for (let c = betaStart[ib]!; c < betaStart[ib + 1]!; c++) {
      this.posRow[rowAlpha[c]!] = c;
      this.posStamp[rowAlpha[c]!] = stamp;
    }
    let items = 0;
    for (let f = B.singleStart[ib]!; f < B.singleStart[ib + 1]!; f++) {
      const jb = B.singleTarget[f]!;
      this.stampB[jb] = stamp;
      this.entryB[jb] = f;
      items += betaStart[jb + 1]! - betaStart[jb]!;
    }
    for (let f = B.doubleStart[ib]!; f < B.doubleStart[ib + 1]!; f++) {
      this.stampB[B.doubleTarget[f]!] = stamp;
      this.entryB[B.doubleTarget[f]!] = -f - 1;
    }
    if (items > this.next.length) {
      const size = Math.max(items, 2 * this.next.length);
      this.next = new Int32Array(size);
      this.itemRow = new Int32Array(size);
      this.itemEntry = new Int32Array(size);
    }
    let item = 0;
    for (let f = B.singleStart[ib]!; f < B.singleStart[ib + 1]!; f++) {
      const jb = B.singleTarget[f]!;
      for (let c = betaStart[jb]!; c < betaStart[jb + 1]!; c++) {
        const ja = rowAlpha[c]!;
        if (this.headStamp[ja] !== stamp) {
          this.headStamp[ja] = stamp;
          this.head[ja] = -1;
        }
        this.itemRow[item] = c;
        this.itemEntry[item] = f;
        this.next[item] = this.head[ja]!;
        this.head[ja] = item++;
      }
    }
  }
}

/**
 * Row of a sampled basis, where most connected determinants are absent: spin-up excitations are
 * found in the batch's position table, opposite-spin doubles in its buckets, and spin-down
 * excitations either by walking the rows that share the spin-up string or by probing the pair
 * hash, whichever touches fewer entries.
 */
function sampledRow(ctx: DeterminantContext, r: number, sink: RowSink, batch: BetaBatch): void {
  const { split, alphaLinks: A, betaLinks: B, liveExc, orbitals: m, alphaStart, alphaRows, alphaRowsBeta, scanFactor } = ctx;
  const { rowAlpha, rowBeta } = split;
  const m2 = m * m;
  const ia = rowAlpha[r]!;
  const ib = rowBeta[r]!;
  const stamp = ib + 1;
  const diagonal = determinantDiagonal(ctx, r);
  if (diagonal !== 0) sink.add(r, diagonal);

  // Spin-up excitations: the partner row, if any, is in this batch.
  const { posRow, posStamp } = batch;
  for (let e = A.singleStart[ia]!; e < A.singleStart[ia + 1]!; e++) {
    const ja = A.singleTarget[e]!;
    if (posStamp[ja] === stamp) emitSameSpin(ctx, A, e, ib, true, posRow[ja]!, sink);
  }
  for (let e = A.doubleStart[ia]!; e < A.doubleStart[ia + 1]!; e++) {
    const ja = A.doubleTarget[e]!;
    if (posStamp[ja] === stamp) sink.add(posRow[ja]!, A.doubleValue[e]!);
  }
  // Spin-down excitations at fixed spin-up string ia.
  const { stampB, entryB } = batch;
  const bLinks = B.singleStart[ib + 1]! - B.singleStart[ib]! + B.doubleStart[ib + 1]! - B.doubleStart[ib]!;
  if (alphaStart[ia + 1]! - alphaStart[ia]! <= scanFactor * bLinks) {
    for (let k = alphaStart[ia]!; k < alphaStart[ia + 1]!; k++) {
      const jb = alphaRowsBeta[k]!;
      if (stampB[jb] === stamp) emitSameSpin(ctx, B, entryB[jb]!, ia, false, alphaRows[k]!, sink);
    }
  } else {
    const slots = ctx.pairSlots;
    for (let f = B.singleStart[ib]!; f < B.singleStart[ib + 1]!; f++) {
      const c = lookupPair(rowAlpha, rowBeta, slots, ia, B.singleTarget[f]!);
      if (c >= 0) emitSameSpin(ctx, B, f, ia, false, c, sink);
    }
    for (let f = B.doubleStart[ib]!; f < B.doubleStart[ib + 1]!; f++) {
      const c = lookupPair(rowAlpha, rowBeta, slots, ia, B.doubleTarget[f]!);
      if (c >= 0) emitSameSpin(ctx, B, -f - 1, ia, false, c, sink);
    }
  }
  // Opposite-spin doubles ±(ai|bj): the bucket of each connected spin-up string holds exactly the
  // rows whose spin-down string is a single of ib.
  const eri = ctx.eri;
  const { head, headStamp, next, itemRow, itemEntry } = batch;
  for (let e = A.singleStart[ia]!; e < A.singleStart[ia + 1]!; e++) {
    const excA = A.singleExc[e]!;
    const ja = A.singleTarget[e]!;
    if (!liveExc[excA] || headStamp[ja] !== stamp) continue;
    const row = excA * m2;
    const sa = A.singleSign[e]!;
    for (let item = head[ja]!; item >= 0; item = next[item]!) {
      const f = itemEntry[item]!;
      const v = eri[row + B.singleExc[f]!]!;
      if (v !== 0) sink.add(itemRow[item]!, sa * B.singleSign[f]! * v);
    }
  }
}

/**
 * Emit a same-spin single (entry ≥ 0) or double (entry = −e − 1) of spin `links` from the row with
 * strings (own, other) to column c; singles add the Coulomb term with the other spin's electrons.
 */
function emitSameSpin(ctx: DeterminantContext, links: StringConnections, entry: number, other: number, up: boolean, c: number, sink: RowSink): void {
  if (entry < 0) {
    sink.add(c, links.doubleValue[-entry - 1]!);
    return;
  }
  const m = ctx.orbitals;
  const strings = up ? ctx.split.beta : ctx.split.alpha;
  const n = strings.electrons;
  const occ = strings.occ;
  const row = links.singleExc[entry]! * m * m;
  let v = links.singlePartial[entry]!;
  for (let y = 0; y < n; y++) v += ctx.eri[row + occ[other * n + y]! * (m + 1)]!;
  if (v !== 0) sink.add(c, links.singleSign[entry]! * v);
}
