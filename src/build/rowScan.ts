import type { Basis } from '../bits/basis.js';
import { linearHash, linearHashTables } from '../bits/configFilter.js';
import { fingerprintOf, hashConfig, lookupConfigHashed, slotHolds, slotLayout } from '../bits/hashIndex.js';
import { popcount32 } from '../bits/packed.js';
import type { FlipGroups } from '../operators/pauliSum.js';
import type { SectorFlipTest } from './projectedHamiltonian.js';

/**
 * Everything the row loop needs about the Hamiltonian, flattened into typed arrays (so it crosses
 * to worker threads by copy) and reduced to the words each term or flip actually touches.
 * Off-diagonal groups that can never keep a configuration in the sector are left out.
 */
export interface RowScanPlan {
  nWords: number;
  complex: boolean;
  constant: number;
  /**
   * Real two-qubit Z terms, pooled by (word of the low qubit, word of the high qubit, bit distance,
   * phase): pool p counts the bits q of pairMask[p] where a[pairLow[p]] and
   * align(a[pairHigh[p]], pairShift[p]) differ, each adding −2·phase.
   */
  pairLow: Int32Array;
  pairHigh: Int32Array;
  pairShift: Int32Array;
  pairMask: Uint32Array;
  pairRe: Float64Array;
  /** Other diagonal terms: words [diagStart[t], diagStart[t+1]) of diagWord/diagMask, phase diagRe/diagIm. */
  diagStart: Int32Array;
  diagWord: Int32Array;
  diagMask: Uint32Array;
  diagRe: Float64Array;
  diagIm: Float64Array;
  /** Off-diagonal groups, in FlipGroups order: the group index behind each. */
  offGroup: Int32Array;
  /**
   * Two-qubit flips, pooled by (word of the low qubit, word of the high qubit, bit distance, kind):
   * for pool p, the candidates of a row are the set bits of
   * (a[flipPoolLow[p]] | flipPoolFree[p]) & ~align(a[flipPoolHigh[p]], flipPoolShift[p]) & flipPoolMask[p],
   * i.e. top qubit 0 (a ⊕ flip above a) and, when a sector constraint holds both qubits
   * (flipPoolFree 0), low qubit 1; bit q of pool p is group flipPoolGroup[32p + q] (index into offGroup).
   */
  flipPoolLow: Int32Array;
  flipPoolHigh: Int32Array;
  /** Bit of the high qubit minus bit of the low qubit (negative across words is possible). */
  flipPoolShift: Int32Array;
  flipPoolMask: Uint32Array;
  flipPoolFree: Uint32Array;
  flipPoolGroup: Int32Array;
  /** The other off-diagonal groups (indices into offGroup), tested one by one. */
  generalGroups: Int32Array;
  /** Word and bit of the flip's highest qubit: a 1 there means a ⊕ flip < a (lower triangle). */
  topWord: Int32Array;
  topBit: Uint32Array;
  /** The flip's nonzero words: [flipStart[g], flipStart[g+1]) of flipWord/flipMask. */
  flipStart: Int32Array;
  flipWord: Int32Array;
  flipMask: Uint32Array;
  /** Linear hashes of each flip mask (h(a ⊕ m) = h(a) ⊕ h(m)). */
  flipHash1: Uint32Array;
  flipHash2: Uint32Array;
  /**
   * Sector checks of each group: [checkStart[g], checkStart[g+1]) of units; unit u keeps a iff
   * Σ popcount(a & checkMask) over words [unitStart[u], unitStart[u+1]) equals unitHalf[u].
   */
  checkStart: Int32Array;
  unitStart: Int32Array;
  unitHalf: Int32Array;
  unitWord: Int32Array;
  unitMask: Uint32Array;
  /** The Pauli terms of each group, for the matrix element (see `groups`). */
  termStart: Int32Array;
  zMasks: Uint32Array;
  phaseRe: Float64Array;
  phaseIm: Float64Array;
}

/** Flatten the flip groups and their sector test into a row-scan plan. */
export function rowScanPlan(groups: FlipGroups, test: SectorFlipTest): RowScanPlan {
  const nWords = groups.nWords;
  const nc = test.constraints;
  const diagStart: number[] = [0];
  const diagWord: number[] = [];
  const diagMask: number[] = [];
  const diagRe: number[] = [];
  const diagIm: number[] = [];
  const pools = new Map<string, { low: number; high: number; shift: number; mask: number; re: number }>();
  let constant = groups.constant;
  const flipPools = new Map<string, { low: number; high: number; shift: number; mask: number; free: number; groups: Int32Array }>();
  const generalGroups: number[] = [];
  const off: number[] = [];
  const flipStart: number[] = [0];
  const flipWord: number[] = [];
  const flipMask: number[] = [];
  const checkStart: number[] = [0];
  const unitStart: number[] = [0];
  const unitHalf: number[] = [];
  const unitWord: number[] = [];
  const unitMask: number[] = [];
  const flipHash1: number[] = [];
  const flipHash2: number[] = [];
  const tables = linearHashTables(nWords);
  const h = new Uint32Array(2);
  for (let g = 0; g < groups.count; g++) {
    if (test.topWord[g]! < 0) {
      for (let t = groups.termStart[g]!; t < groups.termStart[g + 1]!; t++) {
        const pair = groups.phaseIm[t] === 0 ? twoQubits(groups.zMasks, t * nWords, nWords) : undefined;
        if (pair) {
          // (−1)^{a_q ⊕ a_q'} = 1 − 2·[a_q ≠ a_q']: the 1 goes to the constant.
          const re = groups.phaseRe[t]!;
          const at = wordPair(pair);
          const key = `${at.low},${at.high},${at.shift},${re}`;
          let pool = pools.get(key);
          if (!pool) pools.set(key, (pool = { ...at, mask: 0, re }));
          pool.mask = (pool.mask | (1 << (pair.low & 31))) >>> 0;
          constant += re;
          continue;
        }
        pushNonzeroWords(groups.zMasks, t * nWords, nWords, diagWord, diagMask);
        diagStart.push(diagWord.length);
        diagRe.push(groups.phaseRe[t]!);
        diagIm.push(groups.phaseIm[t]!);
      }
      continue;
    }
    if (test.groupAllowed[g] === 0) continue;
    off.push(g);
    pushNonzeroWords(groups.flipMasks, g * nWords, nWords, flipWord, flipMask);
    flipStart.push(flipWord.length);
    const pair = twoQubitFlip(groups.flipMasks, g * nWords, nWords, test, g);
    if (pair) {
      const at = wordPair(pair);
      const key = `${at.low},${at.high},${at.shift},${pair.free}`;
      let pool = flipPools.get(key);
      if (!pool) flipPools.set(key, (pool = { ...at, mask: 0, free: pair.free, groups: new Int32Array(32) }));
      pool.mask = (pool.mask | (1 << (pair.low & 31))) >>> 0;
      pool.groups[pair.low & 31] = off.length - 1;
    } else generalGroups.push(off.length - 1);
    linearHash(tables, groups.flipMasks, g * nWords, nWords, h);
    flipHash1.push(h[0]!);
    flipHash2.push(h[1]!);
    for (let c = 0; c < nc; c++) {
      const weight = test.flipWeight[g * nc + c]!;
      // A constraint the flip does not touch always holds.
      if (weight === 0) continue;
      pushNonzeroWords(test.flipMasked, (g * nc + c) * nWords, nWords, unitWord, unitMask);
      unitStart.push(unitWord.length);
      unitHalf.push(weight / 2);
    }
    checkStart.push(unitHalf.length);
  }
  const offGroup = Int32Array.from(off);
  const pooled = [...pools.values()];
  const flipPooled = [...flipPools.values()];
  const flipPoolGroup = new Int32Array(32 * flipPooled.length);
  flipPooled.forEach((p, i) => flipPoolGroup.set(p.groups, 32 * i));
  return {
    nWords,
    complex: groups.complex,
    constant,
    pairLow: Int32Array.from(pooled, (p) => p.low),
    pairHigh: Int32Array.from(pooled, (p) => p.high),
    pairShift: Int32Array.from(pooled, (p) => p.shift),
    pairMask: Uint32Array.from(pooled, (p) => p.mask),
    pairRe: Float64Array.from(pooled, (p) => p.re),
    diagStart: Int32Array.from(diagStart),
    diagWord: Int32Array.from(diagWord),
    diagMask: Uint32Array.from(diagMask),
    diagRe: Float64Array.from(diagRe),
    diagIm: Float64Array.from(diagIm),
    offGroup,
    flipPoolLow: Int32Array.from(flipPooled, (p) => p.low),
    flipPoolHigh: Int32Array.from(flipPooled, (p) => p.high),
    flipPoolShift: Int32Array.from(flipPooled, (p) => p.shift),
    flipPoolMask: Uint32Array.from(flipPooled, (p) => p.mask),
    flipPoolFree: Uint32Array.from(flipPooled, (p) => p.free),
    flipPoolGroup,
    generalGroups: Int32Array.from(generalGroups),
    topWord: Int32Array.from(off, (g) => test.topWord[g]!),
    topBit: Uint32Array.from(off, (g) => test.topBit[g]!),
    flipStart: Int32Array.from(flipStart),
    flipWord: Int32Array.from(flipWord),
    flipMask: Uint32Array.from(flipMask),
    flipHash1: Uint32Array.from(flipHash1),
    flipHash2: Uint32Array.from(flipHash2),
    checkStart: Int32Array.from(checkStart),
    unitStart: Int32Array.from(unitStart),
    unitHalf: Int32Array.from(unitHalf),
    unitWord: Int32Array.from(unitWord),
    unitMask: Uint32Array.from(unitMask),
    termStart: groups.termStart,
    zMasks: groups.zMasks,
    phaseRe: groups.phaseRe,
    phaseIm: groups.phaseIm,
  };
}

/** Append the nonzero words of masks[off..off+nWords) to words (their index) and out (the word). */
function pushNonzeroWords(masks: Uint32Array, off: number, nWords: number, words: number[], out: number[]): void {
  for (let k = 0; k < nWords; k++) {
    const m = masks[off + k]!;
    if (m !== 0) {
      words.push(k);
      out.push(m);
    }
  }
}

/** A qubit pair as a pool locates it: the words of its low and high qubit and their bit distance. */
function wordPair(pair: { low: number; high: number }): { low: number; high: number; shift: number } {
  return { low: pair.low >>> 5, high: pair.high >>> 5, shift: (pair.high & 31) - (pair.low & 31) };
}

/** The two qubits (low, high) of a mask that has exactly two, else undefined. */
function twoQubits(masks: Uint32Array, off: number, nWords: number): { low: number; high: number } | undefined {
  const qubits: number[] = [];
  for (let k = 0; k < nWords; k++) {
    let m = masks[off + k]!;
    while (m !== 0) {
      const low = m & -m;
      qubits.push(32 * k + 31 - Math.clz32(low));
      if (qubits.length > 2) return undefined;
      m ^= low;
    }
  }
  return qubits.length === 2 ? { low: qubits[0]!, high: qubits[1]! } : undefined;
}

/**
 * A flip of exactly two qubits, as its low and high qubit and the pool kind: without sector
 * constraints on it only the ordering test remains (top qubit 0, free = all ones); with them (which
 * then hold both qubits, else the group is disallowed) the weight is kept iff exactly one qubit is 1,
 * so together: low qubit 1, top qubit 0 (free = 0). Undefined for other flips.
 */
function twoQubitFlip(masks: Uint32Array, off: number, nWords: number, test: SectorFlipTest, g: number): { low: number; high: number; free: number } | undefined {
  const pair = twoQubits(masks, off, nWords);
  if (!pair) return undefined;
  const nc = test.constraints;
  let constrained = false;
  for (let c = 0; c < nc; c++) {
    const w = test.flipWeight[g * nc + c]!;
    if (w === 1) return undefined;
    if (w === 2) constrained = true;
  }
  return { ...pair, free: constrained ? 0 : 0xffffffff };
}

/** Scratch space for `scanRows`, one per thread; a block holds up to `blockRows` rows. */
export interface RowScratch {
  blockRows: number;
  /** Linear hashes of the current row. */
  h: Uint32Array;
  /** Candidate groups of the current row. */
  cand: Int32Array;
  /** Filter survivors of the block: row (within the block), group, flipped configuration, hash, slot. */
  survRow: Int32Array;
  survGroup: Int32Array;
  survConfig: Uint32Array;
  survHash: Uint32Array;
  survSlot: Int32Array;
  /** The block's diagonal elements (re, im per row). */
  diag: Float64Array;
  /** End of each block row's entries in cols/values. */
  rowEnd: Int32Array;
  /** Columns (> row) of the block's upper entries, row by row, in group order within a row. */
  cols: Int32Array;
  /** Their values (re, im interleaved). */
  values: Float64Array;
}

/** Survivors one block may hold at most, so blocks stay in cache whatever the number of groups. */
const BLOCK_SURVIVORS = 4096;

/** Scratch sized for `plan`. */
export function rowScratch(plan: RowScanPlan): RowScratch {
  const n = plan.offGroup.length;
  const blockRows = Math.max(1, Math.min(32, Math.floor(BLOCK_SURVIVORS / Math.max(1, n))));
  const cap = Math.max(1, blockRows * n);
  return {
    blockRows,
    h: new Uint32Array(2),
    cand: new Int32Array(Math.max(1, n)),
    survRow: new Int32Array(cap),
    survGroup: new Int32Array(cap),
    survConfig: new Uint32Array(cap * plan.nWords),
    survHash: new Uint32Array(cap),
    survSlot: new Int32Array(cap),
    diag: new Float64Array(2 * blockRows),
    rowEnd: new Int32Array(blockRows),
    cols: new Int32Array(cap),
    values: new Float64Array(2 * cap),
  };
}

/**
 * Rows r0..r1 (at most s.blockRows) of H_S = P H P: the diagonal into s.diag and the entries right of
 * the diagonal into s.cols/s.values, row by row (s.rowEnd); returns their count. Cheapest rejections
 * first: the ordering bit, then the sector, then the Bloom filter; the hash table is probed only for
 * likely hits, and for a whole block at once, so the cache misses of different lookups overlap.
 */
export function scanRows(plan: RowScanPlan, basis: Basis, tables: Uint32Array, r0: number, r1: number, s: RowScratch, rows?: Int32Array): number {
  const nWords = plan.nWords;
  const states = basis.states;
  const nOff = plan.offGroup.length;
  const { flipHash1, flipHash2, generalGroups } = plan;
  const { flipPoolLow, flipPoolHigh, flipPoolShift, flipPoolMask, flipPoolFree, flipPoolGroup } = plan;
  const filter = basis.filter;
  const wordMask = filter.length - 1;
  const { cand, survRow, survGroup } = s;
  let nSurv = 0;
  for (let r = r0; r < r1; r++) {
    const aOff = (rows ? rows[r]! : r) * nWords;
    diagonalOf(plan, states, aOff, s.diag, 2 * (r - r0));
    if (nOff === 0) continue;
    // Candidates: pooled two-qubit flips bit-parallel, the others one by one.
    let n = 0;
    for (let p = 0, np = flipPoolMask.length; p < np; p++) {
      const hi = states[aOff + flipPoolHigh[p]!]!;
      const sh = flipPoolShift[p]!;
      let x = (states[aOff + flipPoolLow[p]!]! | flipPoolFree[p]!) & ~(sh >= 0 ? hi >>> sh : hi << -sh) & flipPoolMask[p]!;
      while (x !== 0) {
        cand[n++] = flipPoolGroup[32 * p + 31 - Math.clz32(x & -x)]!;
        x &= x - 1;
      }
    }
    for (let i = 0, ng = generalGroups.length; i < ng; i++) {
      const g = generalGroups[i]!;
      if (passesGeneralTests(plan, states, aOff, g)) cand[n++] = g;
    }
    // Probe the filter for all of them, branch-free, so the CPU overlaps the cache misses.
    linearHash(tables, states, aOff, nWords, s.h);
    const ha1 = s.h[0]!;
    const ha2 = s.h[1]!;
    const local = r - r0;
    for (let i = 0; i < n; i++) {
      const g = cand[i]!;
      const h1 = ha1 ^ flipHash1[g]!;
      // filterBits, inlined: this loop runs some fifty times a row.
      let b = Math.imul(ha2 ^ flipHash2[g]! ^ (h1 >>> 16), 0x85ebca6b);
      b ^= b >>> 15;
      const v = filter[h1 & wordMask]!;
      survGroup[nSurv] = g;
      survRow[nSurv] = local;
      nSurv += (v >>> (b & 31)) & (v >>> ((b >>> 5) & 31)) & (v >>> ((b >>> 10) & 31)) & 1;
    }
  }
  lookUpSurvivors(plan, basis, r0, nSurv, s, rows);
  // Elements, in row order.
  const { survSlot, survConfig, rowEnd, cols, values } = s;
  let hits = 0;
  let row = 0;
  for (let i = 0; i < nSurv; i++) {
    const local = survRow[i]!;
    while (row < local) rowEnd[row++] = hits;
    const col = survSlot[i]!;
    if (col < 0) continue;
    if (elementOf(plan, plan.offGroup[survGroup[i]!]!, survConfig, i * nWords, values, 2 * hits)) cols[hits++] = col;
  }
  while (row < r1 - r0) rowEnd[row++] = hits;
  return hits;
}

/** Diagonal element of the row at aOff into out[at], out[at+1]. */
function diagonalOf(plan: RowScanPlan, states: Uint32Array, aOff: number, out: Float64Array, at: number): void {
  const { diagStart, diagWord, diagMask, diagRe, diagIm, pairLow, pairHigh, pairShift, pairMask, pairRe } = plan;
  let dr = plan.constant;
  let di = 0;
  for (let p = 0, np = pairRe.length; p < np; p++) {
    const hi = states[aOff + pairHigh[p]!]!;
    const sh = pairShift[p]!;
    dr -= 2 * popcount32((states[aOff + pairLow[p]!]! ^ (sh >= 0 ? hi >>> sh : hi << -sh)) & pairMask[p]!) * pairRe[p]!;
  }
  for (let t = 0, nt = diagRe.length; t < nt; t++) {
    let x = 0;
    for (let e = diagStart[t]!, end = diagStart[t + 1]!; e < end; e++) x ^= states[aOff + diagWord[e]!]! & diagMask[e]!;
    if (popcount32(x) & 1) {
      dr -= diagRe[t]!;
      di -= diagIm[t]!;
    } else {
      dr += diagRe[t]!;
      di += diagIm[t]!;
    }
  }
  out[at] = dr;
  out[at + 1] = di;
}

/**
 * Basis index of every survivor's flipped configuration into s.survSlot (−1 when absent), in three
 * sweeps: flip and hash all and load their first slots, then compare the configurations those slots
 * point to, then finish the few probes that must walk on. Each sweep's loads are independent.
 */
function lookUpSurvivors(plan: RowScanPlan, basis: Basis, r0: number, nSurv: number, s: RowScratch, rows: Int32Array | undefined): void {
  const nWords = plan.nWords;
  const { states, slots } = basis;
  const { survRow, survGroup, survConfig, survHash, survSlot } = s;
  const { flipStart, flipWord, flipMask } = plan;
  const mask = slots.length - 1;
  for (let i = 0; i < nSurv; i++) {
    const row = r0 + survRow[i]!;
    const aOff = (rows ? rows[row]! : row) * nWords;
    const bOff = i * nWords;
    for (let k = 0; k < nWords; k++) survConfig[bOff + k] = states[aOff + k]!;
    const g = survGroup[i]!;
    for (let e = flipStart[g]!, end = flipStart[g + 1]!; e < end; e++) survConfig[bOff + flipWord[e]!]! ^= flipMask[e]!;
    const h = hashConfig(survConfig, bOff, nWords);
    survHash[i] = h;
    survSlot[i] = slots[h & mask]!;
  }
  const layout = slotLayout(slots);
  for (let i = 0; i < nSurv; i++) {
    const v = survSlot[i]!;
    if (v === -1) continue;
    const idx = slotHolds(states, nWords, v, layout, fingerprintOf(survHash[i]!, layout.fingerprintShift), survConfig, i * nWords);
    // −2: the first slot holds another configuration, so the probe walks on below.
    survSlot[i] = idx >= 0 ? idx : -2;
  }
  for (let i = 0; i < nSurv; i++) {
    if (survSlot[i] === -2) survSlot[i] = lookupConfigHashed(states, slots, nWords, survConfig, i * nWords, survHash[i]!);
  }
}

/** The ordering test (a ⊕ flip above a) and the sector test for flip group g. */
function passesGeneralTests(plan: RowScanPlan, states: Uint32Array, aOff: number, g: number): boolean {
  if ((states[aOff + plan.topWord[g]!]! & plan.topBit[g]!) !== 0) return false;
  const { checkStart, unitStart, unitHalf, unitWord, unitMask } = plan;
  for (let u = checkStart[g]!, uEnd = checkStart[g + 1]!; u < uEnd; u++) {
    let w = 0;
    for (let e = unitStart[u]!, end = unitStart[u + 1]!; e < end; e++) w += popcount32(states[aOff + unitWord[e]!]! & unitMask[e]!);
    if (w !== unitHalf[u]) return false;
  }
  return true;
}

/**
 * ⟨a|H_g|b⟩ = Σ_t coeff_t · i^{#Y} · (−1)^{popcount(b & z_t)} into out[at], out[at+1]; false when it
 * is exactly zero (e.g. XX + YY on parallel spins), so no explicit zero is stored.
 */
function elementOf(plan: RowScanPlan, group: number, b: Uint32Array, bOff: number, out: Float64Array, at: number): boolean {
  const nWords = plan.nWords;
  let vr = 0;
  let vi = 0;
  for (let t = plan.termStart[group]!, end = plan.termStart[group + 1]!; t < end; t++) {
    let x = 0;
    for (let k = 0; k < nWords; k++) x ^= b[bOff + k]! & plan.zMasks[t * nWords + k]!;
    if (popcount32(x) & 1) {
      vr -= plan.phaseRe[t]!;
      vi -= plan.phaseIm[t]!;
    } else {
      vr += plan.phaseRe[t]!;
      vi += plan.phaseIm[t]!;
    }
  }
  out[at] = vr;
  out[at + 1] = vi;
  return vr !== 0 || vi !== 0;
}

/** The shared linear-hash tables for the plan's register width. */
export function scanTables(plan: RowScanPlan): Uint32Array {
  return linearHashTables(plan.nWords);
}

/** Filter size (bytes) from which `filterOrder` pays: below it the filter stays in a core's cache anyway. */
export const FILTER_ORDER_MIN_BYTES = 4 << 20;

/**
 * The rows in order of the filter word their configuration hashes to, by counting sort on the top 16
 * bits of that index. The filter word of a ⊕ flip is h(a) ⊕ h(flip): consecutive rows in this order
 * send each flip's probes to neighbouring words, so a large filter is read almost in sequence instead
 * of at random (a matrix-free product at D = 10^7: 25 s → 16 s on one thread).
 */
export function filterOrder(basis: Basis): Int32Array {
  const { dim, nWords, states, filter } = basis;
  const tables = linearHashTables(nWords);
  const wordBits = 31 - Math.clz32(filter.length);
  const shift = Math.max(0, wordBits - 16);
  const keys = new Uint16Array(dim);
  const counts = new Int32Array(65537);
  const h = new Uint32Array(2);
  for (let r = 0; r < dim; r++) {
    linearHash(tables, states, r * nWords, nWords, h);
    const k = ((h[0]! & (filter.length - 1)) >>> shift) & 0xffff;
    keys[r] = k;
    counts[k + 1]!++;
  }
  for (let k = 0; k < 65536; k++) counts[k + 1]! += counts[k]!;
  const rows = new Int32Array(basis.states.buffer instanceof SharedArrayBuffer ? new SharedArrayBuffer(Math.max(4, 4 * dim)) : new ArrayBuffer(4 * dim));
  for (let r = 0; r < dim; r++) rows[counts[keys[r]!]!++] = r;
  return rows;
}

/**
 * Mean number of upper-triangle entries per row, from about `sample` rows spread over the basis,
 * scanned in blocks (of the scan's block size) at evenly spaced places: a block costs little more
 * than one row, so the estimate takes a few milliseconds at D = 10^6 instead of ~20.
 */
export function upperPerRowEstimate(basis: Basis, plan: RowScanPlan, sample = 2000): number {
  const n = Math.min(basis.dim, sample);
  if (n === 0) return 0;
  const scratch = rowScratch(plan);
  const tables = scanTables(plan);
  const blocks = Math.ceil(n / scratch.blockRows);
  let upper = 0;
  let rows = 0;
  for (let b = 0; b < blocks; b++) {
    const r0 = Math.floor((b * basis.dim) / blocks);
    const r1 = Math.min(basis.dim, r0 + scratch.blockRows, Math.floor(((b + 1) * basis.dim) / blocks));
    upper += scanRows(plan, basis, tables, r0, r1, scratch);
    rows += r1 - r0;
  }
  return upper / rows;
}
