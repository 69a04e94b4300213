import type { Basis } from '../bits/basis.js';
import { buildPairSlots, lookupPair } from '../bits/pairIndex.js';
import type { Integrals } from '../operators/integrals.js';
import { joinRowPieces, type SparseMatrix, type SparseMatrixPiece } from './sparseMatrix.js';
import { splitSpinStrings, type SpinSplit } from './spinStrings.js';
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
}

/** Split the basis into spin strings and find every string connection (the work shared by all rows). */
export function prepareDeterminants(basis: Basis, ints: Integrals): DeterminantContext {
  const m = ints.orbitals;
  const split = splitSpinStrings(basis, m);
  const alphaLinks = stringConnections(split.alpha, ints);
  const betaLinks = stringConnections(split.beta, ints);
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
  const pairSlots = split.product ? new Int32Array(1) : buildPairSlots(split.rowAlpha, split.rowBeta, basis.dim);
  return { dim: basis.dim, orbitals: m, core: ints.core, eri: ints.eri, split, alphaLinks, betaLinks, pairSlots, coulomb, liveExc };
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
 * come in a fixed order (diagonal, singles, same-spin doubles, opposite-spin doubles), not sorted.
 */
export function buildDeterminantRows(ctx: DeterminantContext, r0: number, r1: number): SparseMatrixPiece {
  const out = new RowWriter(Math.max(16, (r1 - r0) * 16));
  const rowEnd = new Float64Array(r1 - r0);
  forEachRow(ctx, r0, r1, out, (r) => {
    rowEnd[r - r0] = out.size;
  });
  return { r0, r1, rowEnd, cols: out.cols.slice(0, out.size), values: out.values.slice(0, out.size) };
}

/** The whole determinant-basis Hamiltonian on one thread. */
export function buildDeterminantHamiltonian(basis: Basis, ints: Integrals): SparseMatrix {
  const ctx = prepareDeterminants(basis, ints);
  return joinRowPieces(basis.dim, false, [buildDeterminantRows(ctx, 0, basis.dim)]);
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

/** Receives the entries of one row at a time. */
export interface RowSink {
  add(col: number, value: number): void;
}

/**
 * Visit every nonzero ⟨row|H|col⟩ of rows r0..r1, calling `done(r)` after each row. The one
 * implementation of the Slater–Condon rules, shared by the stored and the matrix-free forms.
 */
export function forEachRow(ctx: DeterminantContext, r0: number, r1: number, sink: RowSink, done: (r: number) => void): void {
  // One call per row keeps the hot function small, so the JIT optimises it within the first rows.
  for (let r = r0; r < r1; r++) {
    rowEntries(ctx, r, sink);
    done(r);
  }
}

/** Every nonzero ⟨r|H|col⟩ of one row. */
function rowEntries(ctx: DeterminantContext, r: number, sink: RowSink): void {
  const { split, alphaLinks: A, betaLinks: B, eri, liveExc, orbitals: m } = ctx;
  const na = split.alpha.electrons;
  const nb = split.beta.electrons;
  const aOcc = split.alpha.occ;
  const bOcc = split.beta.occ;
  const m2 = m * m;
  const diagStride = m + 1;
  const ia = split.rowAlpha[r]!;
  const ib = split.rowBeta[r]!;
  const diagonal = determinantDiagonal(ctx, r);
  if (diagonal !== 0) sink.add(r, diagonal);

  // Spin-up singles: the same-spin part is stored; add the Coulomb term with the spin-down electrons.
  for (let e = A.singleStart[ia]!; e < A.singleStart[ia + 1]!; e++) {
    const col = determinantRow(ctx, A.singleTarget[e]!, ib);
    if (col < 0) continue;
    const row = A.singleExc[e]! * m2;
    let v = A.singlePartial[e]!;
    for (let y = 0; y < nb; y++) v += eri[row + bOcc[ib * nb + y]! * diagStride]!;
    if (v !== 0) sink.add(col, A.singleSign[e]! * v);
  }
  for (let e = B.singleStart[ib]!; e < B.singleStart[ib + 1]!; e++) {
    const col = determinantRow(ctx, ia, B.singleTarget[e]!);
    if (col < 0) continue;
    const row = B.singleExc[e]! * m2;
    let v = B.singlePartial[e]!;
    for (let x = 0; x < na; x++) v += eri[row + aOcc[ia * na + x]! * diagStride]!;
    if (v !== 0) sink.add(col, B.singleSign[e]! * v);
  }
  for (let e = A.doubleStart[ia]!; e < A.doubleStart[ia + 1]!; e++) {
    const col = determinantRow(ctx, A.doubleTarget[e]!, ib);
    if (col >= 0) sink.add(col, A.doubleValue[e]!);
  }
  for (let e = B.doubleStart[ib]!; e < B.doubleStart[ib + 1]!; e++) {
    const col = determinantRow(ctx, ia, B.doubleTarget[e]!);
    if (col >= 0) sink.add(col, B.doubleValue[e]!);
  }
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
      if (v === 0) continue;
      const col = determinantRow(ctx, ja, B.singleTarget[f]!);
      if (col >= 0) sink.add(col, sa * B.singleSign[f]! * v);
    }
  }
}

/** Growable (col, value) storage. */
class RowWriter implements RowSink {
  cols: Int32Array;
  values: Float64Array;
  size = 0;
  private capacity: number;

  constructor(capacity: number) {
    this.capacity = capacity;
    this.cols = new Int32Array(capacity);
    this.values = new Float64Array(capacity);
  }

  add(col: number, value: number): void {
    const at = this.size;
    if (at === this.capacity) this.grow();
    this.cols[at] = col;
    this.values[at] = value;
    this.size = at + 1;
  }

  private grow(): void {
    this.capacity *= 2;
    const c = new Int32Array(this.capacity);
    c.set(this.cols);
    this.cols = c;
    const v = new Float64Array(this.capacity);
    v.set(this.values);
    this.values = v;
  }
}
