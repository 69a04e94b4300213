import type { Basis } from '../bits/basis.js';
import type { PieceSlab } from './pieceSlab.js';
import { newBuffer } from '../util/buffers.js';
import { popcount32 } from '../bits/packed.js';
import type { FlipGroups } from '../operators/pauliSum.js';
import type { CompiledSector } from '../sectors/sector.js';
import { rowScanPlan, rowScratch, scanRows, scanTables, type RowScanPlan } from './rowScan.js';
import type { SparseMatrix } from './sparseMatrix.js';
import { storedFromPieces, toSparseMatrix } from './storedHamiltonian.js';

/**
 * Per-group data for the row loop. A flip keeps a sector configuration a in the sector iff for
 * every constraint c, 2·popcount(a & flip & mask_c) = popcount(flip & mask_c), and the flip has
 * even weight when a parity is fixed; `groupAllowed` holds the part that does not depend on a.
 * `topWord`/`topBit` locate the flip's highest bit: b = a ⊕ flip is larger than a (so lies in the
 * upper triangle of the sorted basis) exactly when a has a 0 there.
 */
export interface SectorFlipTest {
  constraints: number;
  /** count × constraints: popcount(flip & mask_c). */
  flipWeight: Int32Array;
  /** count × constraints × nWords: flip & mask_c. */
  flipMasked: Uint32Array;
  groupAllowed: Uint8Array;
  topWord: Int32Array;
  topBit: Uint32Array;
}

/** Precompute the sector and ordering tests for every flip group (`undefined`: no sector). */
export function sectorFlipTest(groups: FlipGroups, sector: CompiledSector | undefined): SectorFlipTest {
  const nWords = groups.nWords;
  const nc = sector ? sector.count : 0;
  const flipWeight = new Int32Array(groups.count * nc);
  const flipMasked = new Uint32Array(groups.count * nc * nWords);
  const groupAllowed = new Uint8Array(groups.count);
  const topWord = new Int32Array(groups.count).fill(-1);
  const topBit = new Uint32Array(groups.count);
  for (let g = 0; g < groups.count; g++) {
    let total = 0;
    for (let k = 0; k < nWords; k++) {
      const m = groups.flipMasks[g * nWords + k]!;
      total += popcount32(m);
      if (m !== 0) {
        topWord[g] = k;
        topBit[g] = (1 << (31 - Math.clz32(m))) >>> 0;
      }
    }
    let ok = !(sector && sector.parity >= 0 && total & 1);
    for (let c = 0; c < nc; c++) {
      let w = 0;
      for (let k = 0; k < nWords; k++) {
        const m = groups.flipMasks[g * nWords + k]! & sector!.masks[c * nWords + k]!;
        flipMasked[(g * nc + c) * nWords + k] = m;
        w += popcount32(m);
      }
      flipWeight[g * nc + c] = w;
      if (w & 1) ok = false;
    }
    groupAllowed[g] = ok ? 1 : 0;
  }
  return { constraints: nc, flipWeight, flipMasked, groupAllowed, topWord, topBit };
}

/**
 * Rows r0..r1 of the upper triangle of H_S = P H P (columns > row) plus the diagonal. Each
 * unordered pair is looked up once; `assembleHermitian` mirrors it.
 */
export interface UpperPiece {
  r0: number;
  r1: number;
  /** Diagonal per row (interleaved re, im when complex). */
  diag: Float64Array;
  /** End of row r0+i's entries within this piece. */
  rowEnd: Int32Array;
  cols: Int32Array;
  /** Entry values (re, im pairs when complex); with `oneValue`, the one value every entry has. */
  values: Float64Array;
  /** Every entry's value is values[0] (real pieces built with `compactValues`). */
  oneValue?: boolean;
}

/** Sizing and placement of one piece's arrays. */
export interface BuildRowsOptions {
  /** Expected upper entries per row (see `upperPerRowEstimate`), to size the arrays once. */
  upperPerRow?: number;
  /** Put the arrays on SharedArrayBuffers (built on a worker thread, read by the caller). */
  shared?: boolean;
  /** The whole matrix's diagonal: the piece writes its rows there and its `diag` is a view of them. */
  diag?: Float64Array;
  /** When every (real) entry has one value, keep just that value (`UpperPiece.oneValue`). */
  compactValues?: boolean;
  /** Carve the piece's arrays (shared) from this thread's slabs (see pieceSlab.ts). */
  slab?: PieceSlab;
}

/**
 * Per-thread staging for a piece's entries: a piece is built here, then copied out at its exact
 * size (and its values dropped when they are all one), so the pieces a build holds until assembly
 * carry no spare capacity, and growth copies happen once per thread, not once per piece.
 */
let staging = { cols: new Int32Array(0), values: new Float64Array(0) };

/** Entries the staging keeps between pieces (a build's chunks need far fewer); a larger one, made for one big piece, is let go. */
const STAGING_KEEP_ENTRIES = 1 << 17;

function stagingFor(cap: number, w: number): typeof staging {
  if (staging.cols.length < cap) staging = { cols: new Int32Array(cap), values: new Float64Array(w * cap) };
  else if (staging.values.length < w * cap) staging.values = new Float64Array(w * cap);
  return staging;
}

/**
 * Build the upper-triangle rows r0..r1 (plus the diagonal) of H_S = P H P; each unordered pair
 * is looked up once and `assembleHermitian` mirrors it.
 */
export function buildUpperRows(basis: Basis, plan: RowScanPlan, r0: number, r1: number, opts: BuildRowsOptions = {}): UpperPiece {
  const complex = plan.complex;
  const rows = r1 - r0;
  const w = complex ? 2 : 1;
  // Shared buffers cross back to the calling thread without a copy.
  const alloc = (bytes: number): ArrayBufferLike => newBuffer(bytes, opts.shared === true);
  let cap = Math.max(64, Math.ceil(rows * (opts.upperPerRow ?? 4) * 1.25) + 64);
  let { cols, values } = stagingFor(cap, w);
  cap = Math.min(cols.length, values.length / w);
  const slab = opts.slab;
  const diag = opts.diag ? opts.diag.subarray(w * r0, w * r1) : slab ? slab.float64(w * rows) : new Float64Array(alloc(w * rows * 8), 0, w * rows);
  const rowEnd = slab ? slab.int32(rows) : new Int32Array(alloc(rows * 4), 0, rows);
  const s = rowScratch(plan);
  const tables = scanTables(plan);
  let nnz = 0;
  for (let b0 = r0; b0 < r1; b0 += s.blockRows) {
    const b1 = Math.min(r1, b0 + s.blockRows);
    const hits = scanRows(plan, basis, tables, b0, b1, s);
    for (let r = b0; r < b1; r++) {
      if (complex) {
        diag[2 * (r - r0)] = s.diag[2 * (r - b0)]!;
        diag[2 * (r - r0) + 1] = s.diag[2 * (r - b0) + 1]!;
      } else diag[r - r0] = s.diag[2 * (r - b0)]!;
    }
    if (nnz + hits > cap) {
      while (nnz + hits > cap) cap *= 2;
      const c2 = new Int32Array(cap);
      c2.set(cols.subarray(0, nnz));
      const v2 = new Float64Array(w * cap);
      v2.set(values.subarray(0, w * nnz));
      staging = { cols: c2, values: v2 };
      ({ cols, values } = staging);
    }
    let e = 0;
    for (let r = b0; r < b1; r++) {
      const rowStart = nnz;
      for (const end = s.rowEnd[r - b0]!; e < end; e++, nnz++) {
        cols[nnz] = s.cols[e]!;
        if (complex) {
          values[2 * nnz] = s.values[2 * e]!;
          values[2 * nnz + 1] = s.values[2 * e + 1]!;
        } else values[nnz] = s.values[2 * e]!;
      }
      sortRow(cols, values, rowStart, nnz, complex);
      rowEnd[r - r0] = nnz;
    }
  }
  const outCols = slab ? slab.int32(nnz) : new Int32Array(alloc(nnz * 4), 0, nnz);
  outCols.set(cols.subarray(0, nnz));
  let outValues: Float64Array;
  const oneValue = opts.compactValues === true && !complex && nnz > 0 && allOneValue(values, nnz);
  if (oneValue) {
    outValues = slab ? slab.float64(1) : new Float64Array(alloc(8), 0, 1);
    outValues[0] = values[0]!;
  } else {
    outValues = slab ? slab.float64(w * nnz) : new Float64Array(alloc(w * nnz * 8), 0, w * nnz);
    outValues.set(values.subarray(0, w * nnz));
  }
  if (staging.cols.length > STAGING_KEEP_ENTRIES) staging = { cols: new Int32Array(0), values: new Float64Array(0) };
  return oneValue ? { r0, r1, diag, rowEnd, cols: outCols, values: outValues, oneValue } : { r0, r1, diag, rowEnd, cols: outCols, values: outValues };
}

/** Whether values[0..n) are one value, bit for bit (−0 and 0 stay apart, as value codes keep them). */
function allOneValue(values: Float64Array, n: number): boolean {
  const v = values[0]!;
  for (let i = 1; i < n; i++) if (!Object.is(values[i], v)) return false;
  return true;
}

/**
 * Matrix-free y += H_S x over rows r0..r1: the same entries as the stored build, applied as they
 * are found (each pair once, mirrored), so memory stays at the basis and a few vectors.
 */
export function applyUpperRows(basis: Basis, plan: RowScanPlan, r0: number, r1: number, x: Float64Array, y: Float64Array, rows?: Int32Array): void {
  const complex = plan.complex;
  const s = rowScratch(plan);
  const tables = scanTables(plan);
  for (let b0 = r0; b0 < r1; b0 += s.blockRows) {
    const b1 = Math.min(r1, b0 + s.blockRows);
    scanRows(plan, basis, tables, b0, b1, s, rows);
    let e = 0;
    for (let i = b0; i < b1; i++) {
      const r = rows ? rows[i]! : i;
      const end = s.rowEnd[i - b0]!;
      const dr = s.diag[2 * (i - b0)]!;
      if (!complex) {
        const xr = x[r]!;
        let acc = dr * xr;
        for (; e < end; e++) {
          const c = s.cols[e]!;
          const v = s.values[2 * e]!;
          acc += v * x[c]!;
          y[c]! += v * xr;
        }
        y[r]! += acc;
        continue;
      }
      const xr = x[2 * r]!;
      const xi = x[2 * r + 1]!;
      y[2 * r]! += dr * xr;
      y[2 * r + 1]! += dr * xi;
      for (; e < end; e++) {
        const c = s.cols[e]!;
        const vr = s.values[2 * e]!;
        const vi = s.values[2 * e + 1]!;
        const cr = x[2 * c]!;
        const ci = x[2 * c + 1]!;
        y[2 * r]! += vr * cr - vi * ci;
        y[2 * r + 1]! += vr * ci + vi * cr;
        // Lower entry is the conjugate.
        y[2 * c]! += vr * xr + vi * xi;
        y[2 * c + 1]! += vr * xi - vi * xr;
      }
    }
  }
}

/** Join upper-triangle pieces (in row order) into the full Hermitian CSR matrix (columns ascending per row). */
export function assembleHermitian(dim: number, complex: boolean, pieces: UpperPiece[]): SparseMatrix {
  return toSparseMatrix(storedFromPieces(dim, complex, pieces));
}

/** Build the whole projected Hamiltonian on the calling thread. */
export function buildProjectedHamiltonian(basis: Basis, groups: FlipGroups, sector: CompiledSector | undefined): SparseMatrix {
  const piece = buildUpperRows(basis, rowScanPlan(groups, sectorFlipTest(groups, sector)), 0, basis.dim);
  return assembleHermitian(basis.dim, groups.complex, [piece]);
}

// Rows hold a few dozen entries: insertion sort by column keeps the output order deterministic.
function sortRow(cols: Int32Array, values: Float64Array, start: number, end: number, complex: boolean): void {
  for (let i = start + 1; i < end; i++) {
    const c = cols[i]!;
    if (c >= cols[i - 1]!) continue;
    const vr = complex ? values[2 * i]! : values[i]!;
    const vi = complex ? values[2 * i + 1]! : 0;
    let j = i - 1;
    while (j >= start && cols[j]! > c) {
      cols[j + 1] = cols[j]!;
      if (complex) {
        values[2 * j + 2] = values[2 * j]!;
        values[2 * j + 3] = values[2 * j + 1]!;
      } else values[j + 1] = values[j]!;
      j--;
    }
    cols[j + 1] = c;
    if (complex) {
      values[2 * j + 2] = vr;
      values[2 * j + 3] = vi;
    } else values[j + 1] = vr;
  }
}
