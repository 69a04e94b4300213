import type { Basis } from '../bits/basis.js';
import { lookupConfig } from '../bits/hashIndex.js';
import { popcount32 } from '../bits/packed.js';
import type { FlipGroups } from '../operators/pauliSum.js';
import type { CompiledSector } from '../sectors/sector.js';
import { joinRowPieces, type SparseMatrix, type SparseMatrixPiece } from './sparseMatrix.js';

/**
 * Per-group sector test data: a flip keeps a configuration a of the sector in it iff for every
 * constraint c, 2·popcount(a & flip & mask_c) = popcount(flip & mask_c), and the flip has even
 * weight when a parity is fixed. `groupAllowed` holds the part that does not depend on a.
 */
export interface SectorFlipTest {
  constraints: number;
  /** count × constraints: popcount(flip & mask_c). */
  flipWeight: Int32Array;
  /** count × constraints × nWords: flip & mask_c. */
  flipMasked: Uint32Array;
  groupAllowed: Uint8Array;
}

/** Precompute the sector test for every flip group (pass `undefined` for no sector). */
export function sectorFlipTest(groups: FlipGroups, sector: CompiledSector | undefined): SectorFlipTest {
  const nWords = groups.nWords;
  const nc = sector ? sector.count : 0;
  const flipWeight = new Int32Array(groups.count * nc);
  const flipMasked = new Uint32Array(groups.count * nc * nWords);
  const groupAllowed = new Uint8Array(groups.count);
  for (let g = 0; g < groups.count; g++) {
    let total = 0;
    for (let k = 0; k < nWords; k++) total += popcount32(groups.flipMasks[g * nWords + k]!);
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
  return { constraints: nc, flipWeight, flipMasked, groupAllowed };
}

/**
 * Build rows r0..r1 of H_S = P H P: for each row configuration a and flip group, the column is
 * b = a ⊕ flip, skipped early when b leaves the sector, then looked up in the basis hash index.
 */
export function buildRows(basis: Basis, groups: FlipGroups, test: SectorFlipTest, r0: number, r1: number): SparseMatrixPiece {
  const nWords = basis.nWords;
  const { states, slots } = basis;
  const { flipMasks, termStart, zMasks, phaseRe, phaseIm, complex } = groups;
  const nc = test.constraints;
  const rows = r1 - r0;
  let cap = Math.max(16, rows * 8);
  let cols = new Int32Array(cap);
  let values = new Float64Array(complex ? 2 * cap : cap);
  const rowEnd = new Float64Array(rows);
  const b = new Uint32Array(nWords);
  let nnz = 0;
  const diag = groups.count > 0 && isZeroMask(flipMasks, 0, nWords) ? 0 : -1;

  for (let r = r0; r < r1; r++) {
    const aOff = r * nWords;
    const rowStart = nnz;
    for (let g = 0; g < groups.count; g++) {
      let col: number;
      if (g === diag) {
        col = r;
        for (let k = 0; k < nWords; k++) b[k] = states[aOff + k]!;
      } else {
        if (!test.groupAllowed[g]) continue;
        let stays = true;
        for (let c = 0; c < nc && stays; c++) {
          let w = 0;
          const mOff = (g * nc + c) * nWords;
          for (let k = 0; k < nWords; k++) w += popcount32(states[aOff + k]! & test.flipMasked[mOff + k]!);
          stays = 2 * w === test.flipWeight[g * nc + c];
        }
        if (!stays) continue;
        for (let k = 0; k < nWords; k++) b[k] = states[aOff + k]! ^ flipMasks[g * nWords + k]!;
        col = lookupConfig(states, slots, nWords, b, 0);
        if (col < 0) continue;
      }
      // ⟨a|P|b⟩ = coeff · i^{#Y} · (−1)^{popcount(b & z)}
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
      if (g === diag) vr += groups.constant;
      if (vr === 0 && vi === 0) continue;
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
        values[2 * nnz] = vr;
        values[2 * nnz + 1] = vi;
      } else values[nnz] = vr;
      nnz++;
    }
    if (diag < 0 && groups.constant !== 0) {
      // No diagonal Pauli terms but a constant: still a diagonal entry.
      if (nnz === cap) {
        cap *= 2;
        const c2 = new Int32Array(cap);
        c2.set(cols);
        cols = c2;
        const v2 = new Float64Array(complex ? 2 * cap : cap);
        v2.set(values);
        values = v2;
      }
      cols[nnz] = r;
      if (complex) {
        values[2 * nnz] = groups.constant;
        values[2 * nnz + 1] = 0;
      } else values[nnz] = groups.constant;
      nnz++;
    }
    sortRow(cols, values, rowStart, nnz, complex);
    rowEnd[r - r0] = nnz;
  }
  return { r0, r1, rowEnd, cols: cols.slice(0, nnz), values: values.slice(0, complex ? 2 * nnz : nnz) };
}

/** Build the whole projected Hamiltonian on one thread. */
export function buildProjectedHamiltonian(basis: Basis, groups: FlipGroups, sector: CompiledSector | undefined): SparseMatrix {
  const piece = buildRows(basis, groups, sectorFlipTest(groups, sector), 0, basis.dim);
  return joinRowPieces(basis.dim, groups.complex, [piece]);
}

function isZeroMask(m: Uint32Array, g: number, nWords: number): boolean {
  for (let k = 0; k < nWords; k++) if (m[g * nWords + k] !== 0) return false;
  return true;
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
