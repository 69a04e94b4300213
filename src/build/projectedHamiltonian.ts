import type { Basis } from '../bits/basis.js';
import { filterMayContain, hashConfig, lookupConfigHashed } from '../bits/hashIndex.js';
import { popcount32 } from '../bits/packed.js';
import type { FlipGroups } from '../operators/pauliSum.js';
import type { CompiledSector } from '../sectors/sector.js';
import type { SparseMatrix } from './sparseMatrix.js';

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
  values: Float64Array;
}

/**
 * The entry of row a (at `aOff` in the basis) produced by flip group g when it lies on the diagonal
 * or in the upper triangle: returns the column (−1 when b = a ⊕ flip is below a, leaves the sector,
 * or is not sampled) and writes ⟨a|H_g|b⟩ = Σ_t coeff_t · i^{#Y} · (−1)^{popcount(b & z_t)} to
 * out[0] (re) and out[1] (im). The Bloom filter rejects most absent b before the hash lookup.
 */
export function upperEntry(basis: Basis, groups: FlipGroups, test: SectorFlipTest, row: number, g: number, b: Uint32Array, out: Float64Array): number {
  const nWords = basis.nWords;
  const states = basis.states;
  const aOff = row * nWords;
  const topWord = test.topWord[g]!;
  let col = row;
  if (topWord < 0) {
    for (let k = 0; k < nWords; k++) b[k] = states[aOff + k]!;
  } else {
    if (test.groupAllowed[g] === 0 || (states[aOff + topWord]! & test.topBit[g]!) !== 0) return -1;
    const nc = test.constraints;
    for (let c = 0; c < nc; c++) {
      let w = 0;
      const mOff = (g * nc + c) * nWords;
      for (let k = 0; k < nWords; k++) w += popcount32(states[aOff + k]! & test.flipMasked[mOff + k]!);
      if (2 * w !== test.flipWeight[g * nc + c]) return -1;
    }
    for (let k = 0; k < nWords; k++) b[k] = states[aOff + k]! ^ groups.flipMasks[g * nWords + k]!;
    const h = hashConfig(b, 0, nWords);
    if (!filterMayContain(basis.filter, h)) return -1;
    col = lookupConfigHashed(states, basis.slots, nWords, b, 0, h);
    if (col < 0) return -1;
  }
  const { termStart, zMasks, phaseRe, phaseIm } = groups;
  let vr = 0;
  let vi = 0;
  for (let t = termStart[g]!; t < termStart[g + 1]!; t++) {
    let par = 0;
    for (let k = 0; k < nWords; k++) par ^= popcount32(b[k]! & zMasks[t * nWords + k]!);
    if (par & 1) {
      vr -= phaseRe[t]!;
      vi -= phaseIm[t]!;
    } else {
      vr += phaseRe[t]!;
      vi += phaseIm[t]!;
    }
  }
  out[0] = vr;
  out[1] = vi;
  return col;
}

/**
 * Build the upper-triangle rows r0..r1 (plus the diagonal) of H_S = P H P; each unordered pair
 * is looked up once and `assembleHermitian` mirrors it.
 */
export function buildUpperRows(basis: Basis, groups: FlipGroups, test: SectorFlipTest, r0: number, r1: number): UpperPiece {
  const complex = groups.complex;
  const rows = r1 - r0;
  let cap = Math.max(64, rows * 4);
  let cols = new Int32Array(cap);
  let values = new Float64Array(complex ? 2 * cap : cap);
  const diag = new Float64Array(complex ? 2 * rows : rows);
  const rowEnd = new Int32Array(rows);
  const b = new Uint32Array(basis.nWords);
  const v = new Float64Array(2);
  let nnz = 0;
  for (let r = r0; r < r1; r++) {
    const rowStart = nnz;
    let dr = groups.constant;
    let di = 0;
    const aOff = r * basis.nWords;
    for (let g = 0; g < groups.count; g++) {
      // Cheapest rejections first, before the call: about half the flips point below the diagonal.
      const tw = test.topWord[g]!;
      if (tw >= 0 && (test.groupAllowed[g] === 0 || (basis.states[aOff + tw]! & test.topBit[g]!) !== 0)) continue;
      const col = upperEntry(basis, groups, test, r, g, b, v);
      if (col < 0) continue;
      if (col === r) {
        dr += v[0]!;
        di += v[1]!;
        continue;
      }
      if (v[0] === 0 && v[1] === 0) continue;
      if (nnz === cap) {
        cap *= 2;
        const c2 = new Int32Array(cap);
        c2.set(cols);
        cols = c2;
        const v2 = new Float64Array(complex ? 2 * cap : cap);
        v2.set(values);
        values = v2;
      }
      cols[nnz] = col;
      if (complex) {
        values[2 * nnz] = v[0]!;
        values[2 * nnz + 1] = v[1]!;
      } else values[nnz] = v[0]!;
      nnz++;
    }
    if (complex) {
      diag[2 * (r - r0)] = dr;
      diag[2 * (r - r0) + 1] = di;
    } else diag[r - r0] = dr;
    sortRow(cols, values, rowStart, nnz, complex);
    rowEnd[r - r0] = nnz;
  }
  return { r0, r1, diag, rowEnd, cols: cols.slice(0, nnz), values: values.slice(0, complex ? 2 * nnz : nnz) };
}

/**
 * Matrix-free y += H_S x over rows r0..r1: the same entries as the stored build, applied as they
 * are found (each pair once, mirrored), so memory stays at the basis and a few vectors.
 */
export function applyUpperRows(basis: Basis, groups: FlipGroups, test: SectorFlipTest, r0: number, r1: number, x: Float64Array, y: Float64Array): void {
  const complex = groups.complex;
  const b = new Uint32Array(basis.nWords);
  const v = new Float64Array(2);
  for (let r = r0; r < r1; r++) {
    let dr = groups.constant;
    const aOff = r * basis.nWords;
    for (let g = 0; g < groups.count; g++) {
      const tw = test.topWord[g]!;
      if (tw >= 0 && (test.groupAllowed[g] === 0 || (basis.states[aOff + tw]! & test.topBit[g]!) !== 0)) continue;
      const c = upperEntry(basis, groups, test, r, g, b, v);
      if (c < 0) continue;
      if (c === r) {
        dr += v[0]!;
        continue;
      }
      const vr = v[0]!;
      if (!complex) {
        y[r]! += vr * x[c]!;
        y[c]! += vr * x[r]!;
        continue;
      }
      const vi = v[1]!;
      const xr = x[2 * r]!, xi = x[2 * r + 1]!, cr = x[2 * c]!, ci = x[2 * c + 1]!;
      y[2 * r]! += vr * cr - vi * ci;
      y[2 * r + 1]! += vr * ci + vi * cr;
      // Lower entry is the conjugate.
      y[2 * c]! += vr * xr + vi * xi;
      y[2 * c + 1]! += vr * xi - vi * xr;
    }
    if (complex) {
      y[2 * r]! += dr * x[2 * r]!;
      y[2 * r + 1]! += dr * x[2 * r + 1]!;
    } else y[r]! += dr * x[r]!;
  }
}

/**
 * Join upper-triangle pieces (in row order) into the full Hermitian CSR matrix: each row holds
 * its mirrored lower entries, the diagonal, then its upper entries, so columns stay ascending.
 */
export function assembleHermitian(dim: number, complex: boolean, pieces: UpperPiece[], shared = false): SparseMatrix {
  const lower = new Int32Array(dim);
  let upper = 0;
  let diagonals = 0;
  // A diagonal that is exactly zero is not stored, as off-diagonal zeros are not.
  const hasDiag = (p: UpperPiece, i: number): boolean => (complex ? p.diag[2 * i] !== 0 || p.diag[2 * i + 1] !== 0 : p.diag[i] !== 0);
  for (const p of pieces) {
    for (let e = 0; e < p.cols.length; e++) lower[p.cols[e]!]!++;
    upper += p.cols.length;
    for (let i = 0; i < p.r1 - p.r0; i++) if (hasDiag(p, i)) diagonals++;
  }
  const nnz = 2 * upper + diagonals;
  const alloc = (bytes: number): ArrayBufferLike => (shared ? new SharedArrayBuffer(Math.max(8, bytes)) : new ArrayBuffer(bytes));
  const rowPtr = new Float64Array(alloc((dim + 1) * 8));
  const lowerPos = new Int32Array(dim);
  let at = 0;
  for (const p of pieces) {
    for (let r = p.r0; r < p.r1; r++) {
      const inRow = p.rowEnd[r - p.r0]! - (r === p.r0 ? 0 : p.rowEnd[r - p.r0 - 1]!);
      rowPtr[r] = at;
      lowerPos[r] = at;
      at += lower[r]! + (hasDiag(p, r - p.r0) ? 1 : 0) + inRow;
    }
  }
  rowPtr[dim] = at;
  const cols = new Int32Array(alloc(nnz * 4));
  const values = new Float64Array(alloc((complex ? 2 * nnz : nnz) * 8));
  for (const p of pieces) {
    let e = 0;
    for (let r = p.r0; r < p.r1; r++) {
      const i = r - p.r0;
      let pos = rowPtr[r]! + lower[r]!;
      if (hasDiag(p, i)) {
        cols[pos] = r;
        if (complex) {
          values[2 * pos] = p.diag[2 * i]!;
          values[2 * pos + 1] = p.diag[2 * i + 1]!;
        } else values[pos] = p.diag[i]!;
        pos++;
      }
      for (const end = p.rowEnd[i]!; e < end; e++, pos++) {
        const c = p.cols[e]!;
        cols[pos] = c;
        const lp = lowerPos[c]!++;
        cols[lp] = r;
        if (complex) {
          values[2 * pos] = p.values[2 * e]!;
          values[2 * pos + 1] = p.values[2 * e + 1]!;
          values[2 * lp] = p.values[2 * e]!;
          values[2 * lp + 1] = -p.values[2 * e + 1]!;
        } else {
          values[pos] = p.values[e]!;
          values[lp] = p.values[e]!;
        }
      }
    }
  }
  return { dim, complex, rowPtr, cols, values };
}

/** Build the whole projected Hamiltonian on the calling thread. */
export function buildProjectedHamiltonian(basis: Basis, groups: FlipGroups, sector: CompiledSector | undefined): SparseMatrix {
  const piece = buildUpperRows(basis, groups, sectorFlipTest(groups, sector), 0, basis.dim);
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
