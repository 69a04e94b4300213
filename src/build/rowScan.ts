import type { Basis } from '../bits/basis.js';
import { linearHash, linearHashTables } from '../bits/configFilter.js';
import { hashConfig, lookupConfigHashed } from '../bits/hashIndex.js';
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
   * Real two-qubit Z terms within one word, pooled by (word, distance, phase): pool p counts the pairs
   * (q, q + pairShift[p]) with q in pairMask[p] whose bits differ, each adding −2·phase.
   */
  pairWord: Int32Array;
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
   * Two-qubit flips within one word pass both the ordering and the sector test iff
   * (a[patternWord] & patternMask) === patternWant; patternWord is −1 for flips that need the
   * general tests below.
   */
  patternWord: Int32Array;
  patternMask: Uint32Array;
  /** Signed, to compare with `&` results. */
  patternWant: Int32Array;
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
  const pools = new Map<string, { word: number; shift: number; mask: number; re: number }>();
  let constant = groups.constant;
  const patternWord: number[] = [];
  const patternMask: number[] = [];
  const patternWant: number[] = [];
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
        const pair = groups.phaseIm[t] === 0 ? sameWordPair(groups.zMasks, t * nWords, nWords) : undefined;
        if (pair) {
          // (−1)^{a_q ⊕ a_q'} = 1 − 2·[a_q ≠ a_q']: the 1 goes to the constant.
          const re = groups.phaseRe[t]!;
          const key = `${pair.word},${pair.shift},${re}`;
          const pool = pools.get(key);
          if (pool) pool.mask |= pair.low;
          else pools.set(key, { word: pair.word, shift: pair.shift, mask: pair.low, re });
          constant += re;
          continue;
        }
        for (let k = 0; k < nWords; k++) {
          const z = groups.zMasks[t * nWords + k]!;
          if (z !== 0) {
            diagWord.push(k);
            diagMask.push(z);
          }
        }
        diagStart.push(diagWord.length);
        diagRe.push(groups.phaseRe[t]!);
        diagIm.push(groups.phaseIm[t]!);
      }
      continue;
    }
    if (test.groupAllowed[g] === 0) continue;
    off.push(g);
    for (let k = 0; k < nWords; k++) {
      const m = groups.flipMasks[g * nWords + k]!;
      if (m !== 0) {
        flipWord.push(k);
        flipMask.push(m);
      }
    }
    flipStart.push(flipWord.length);
    const pattern = twoQubitPattern(groups.flipMasks, g * nWords, nWords, test, g);
    patternWord.push(pattern ? pattern.word : -1);
    patternMask.push(pattern ? pattern.mask : 0);
    patternWant.push(pattern ? pattern.want : 0);
    linearHash(tables, groups.flipMasks, g * nWords, nWords, h);
    flipHash1.push(h[0]!);
    flipHash2.push(h[1]!);
    for (let c = 0; c < nc; c++) {
      const weight = test.flipWeight[g * nc + c]!;
      // A constraint the flip does not touch always holds.
      if (weight === 0) continue;
      for (let k = 0; k < nWords; k++) {
        const m = test.flipMasked[(g * nc + c) * nWords + k]!;
        if (m !== 0) {
          unitWord.push(k);
          unitMask.push(m);
        }
      }
      unitStart.push(unitWord.length);
      unitHalf.push(weight / 2);
    }
    checkStart.push(unitHalf.length);
  }
  const offGroup = Int32Array.from(off);
  const pooled = [...pools.values()];
  return {
    nWords,
    complex: groups.complex,
    constant,
    pairWord: Int32Array.from(pooled, (p) => p.word),
    pairShift: Int32Array.from(pooled, (p) => p.shift),
    pairMask: Uint32Array.from(pooled, (p) => p.mask),
    pairRe: Float64Array.from(pooled, (p) => p.re),
    diagStart: Int32Array.from(diagStart),
    diagWord: Int32Array.from(diagWord),
    diagMask: Uint32Array.from(diagMask),
    diagRe: Float64Array.from(diagRe),
    diagIm: Float64Array.from(diagIm),
    offGroup,
    patternWord: Int32Array.from(patternWord),
    patternMask: Uint32Array.from(patternMask),
    patternWant: Int32Array.from(patternWant),
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

/** The word, distance and lower bit of a Z mask that is exactly two qubits in one word, else undefined. */
function sameWordPair(masks: Uint32Array, off: number, nWords: number): { word: number; shift: number; low: number } | undefined {
  let word = -1;
  for (let k = 0; k < nWords; k++) {
    if (masks[off + k] === 0) continue;
    if (word >= 0) return undefined;
    word = k;
  }
  if (word < 0) return undefined;
  const m = masks[off + word]!;
  if (popcount32(m) !== 2) return undefined;
  const low = m & -m;
  return { word, shift: 31 - Math.clz32(m) - (31 - Math.clz32(low)), low: low >>> 0 };
}

/**
 * The one-word test for a two-qubit flip inside one word: without sector constraints it passes
 * iff the top qubit is 0; with them (which then hold both qubits, else the group is disallowed)
 * the weight is kept iff exactly one qubit is 1, so together: low qubit 1, top qubit 0.
 */
function twoQubitPattern(masks: Uint32Array, off: number, nWords: number, test: SectorFlipTest, g: number): { word: number; mask: number; want: number } | undefined {
  const pair = sameWordPair(masks, off, nWords);
  if (!pair) return undefined;
  const nc = test.constraints;
  const mask = masks[off + pair.word]!;
  let constrained = false;
  for (let c = 0; c < nc; c++) {
    const w = test.flipWeight[g * nc + c]!;
    if (w === 1) return undefined;
    if (w === 2) constrained = true;
  }
  return constrained ? { word: pair.word, mask, want: pair.low } : { word: pair.word, mask: (mask ^ pair.low) >>> 0, want: 0 };
}

/** Scratch space for `scanRow`, one per thread. */
export interface RowScratch {
  /** The flipped configuration b. */
  b: Uint32Array;
  /** Linear hashes of the row. */
  h: Uint32Array;
  /** Columns (> row) of this row's upper entries, in group order. */
  cols: Int32Array;
  /** Their values (re, im interleaved). */
  values: Float64Array;
  /** The diagonal element (re, im). */
  diag: Float64Array;
  /** Candidate groups of the current row. */
  cand: Int32Array;
}

/** Scratch sized for `plan`. */
export function rowScratch(plan: RowScanPlan): RowScratch {
  const n = plan.offGroup.length;
  return { b: new Uint32Array(plan.nWords), h: new Uint32Array(2), cols: new Int32Array(n), values: new Float64Array(2 * n), diag: new Float64Array(2), cand: new Int32Array(n) };
}

/**
 * Row `row` of H_S = P H P: the diagonal into s.diag and the entries right of the diagonal into
 * s.cols/s.values (group order); returns their count. Cheapest rejections first: the ordering
 * bit, then the sector, then the Bloom filter; the hash table is probed only for likely hits.
 */
export function scanRow(plan: RowScanPlan, basis: Basis, tables: Uint32Array, row: number, s: RowScratch): number {
  const nWords = plan.nWords;
  const states = basis.states;
  const aOff = row * nWords;
  const { diagStart, diagWord, diagMask, diagRe, diagIm } = plan;
  let dr = plan.constant;
  let di = 0;
  const { pairWord, pairShift, pairMask, pairRe } = plan;
  for (let p = 0, np = pairRe.length; p < np; p++) {
    const w = states[aOff + pairWord[p]!]!;
    dr -= 2 * popcount32((w ^ (w >>> pairShift[p]!)) & pairMask[p]!) * pairRe[p]!;
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
  s.diag[0] = dr;
  s.diag[1] = di;
  const nOff = plan.offGroup.length;
  if (nOff === 0) return 0;
  const { patternWord, patternMask, patternWant, flipHash1, flipHash2 } = plan;
  const filter = basis.filter;
  const lineMask = filter.length / 16 - 1;
  linearHash(tables, states, aOff, nWords, s.h);
  const ha1 = s.h[0]!;
  const ha2 = s.h[1]!;
  // Three passes so the CPU overlaps the filter's cache misses: pick the groups that pass the
  // ordering and sector tests, probe the filter for all of them, then look up the survivors.
  // The first two passes are branch-free (an unpredictable branch per flip would stall them).
  const cand = s.cand;
  let n = 0;
  for (let g = 0; g < nOff; g++) {
    const pw = patternWord[g]!;
    cand[n] = g;
    if (pw >= 0) {
      const d = (states[aOff + pw]! & patternMask[g]!) ^ patternWant[g]!;
      n += 1 ^ ((d | -d) >>> 31);
    } else if (passesGeneralTests(plan, states, aOff, g)) n++;
  }
  let m = 0;
  for (let i = 0; i < n; i++) {
    const g = cand[i]!;
    const h2 = ha2 ^ flipHash2[g]!;
    const line = ((ha1 ^ flipHash1[g]!) & lineMask) << 4;
    cand[m] = g;
    m += (filter[line + ((h2 >>> 5) & 15)]! >>> (h2 & 31)) & (filter[line + ((h2 >>> 14) & 15)]! >>> ((h2 >>> 9) & 31)) & (filter[line + ((h2 >>> 23) & 15)]! >>> ((h2 >>> 18) & 31)) & 1;
  }
  let hits = 0;
  for (let i = 0; i < m; i++) {
    const g = cand[i]!;
    const col = flippedIndex(plan, basis, aOff, g, s.b);
    if (col < 0) continue;
    if (elementOf(plan, plan.offGroup[g]!, s.b, s.values, 2 * hits)) s.cols[hits++] = col;
  }
  return hits;
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

/** Index of a ⊕ flip_g in the basis (b receives a ⊕ flip_g), or −1. */
function flippedIndex(plan: RowScanPlan, basis: Basis, aOff: number, g: number, b: Uint32Array): number {
  const nWords = plan.nWords;
  for (let k = 0; k < nWords; k++) b[k] = basis.states[aOff + k]!;
  for (let e = plan.flipStart[g]!, end = plan.flipStart[g + 1]!; e < end; e++) b[plan.flipWord[e]!]! ^= plan.flipMask[e]!;
  return lookupConfigHashed(basis.states, basis.slots, nWords, b, 0, hashConfig(b, 0, nWords));
}

/**
 * ⟨a|H_g|b⟩ = Σ_t coeff_t · i^{#Y} · (−1)^{popcount(b & z_t)} into out[at], out[at+1]; false when it
 * is exactly zero (e.g. XX + YY on parallel spins), so no explicit zero is stored.
 */
function elementOf(plan: RowScanPlan, group: number, b: Uint32Array, out: Float64Array, at: number): boolean {
  const nWords = plan.nWords;
  let vr = 0;
  let vi = 0;
  for (let t = plan.termStart[group]!, end = plan.termStart[group + 1]!; t < end; t++) {
    let x = 0;
    for (let k = 0; k < nWords; k++) x ^= b[k]! & plan.zMasks[t * nWords + k]!;
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

/** Mean number of upper-triangle entries per row, from `sample` rows spread over the basis. */
export function upperPerRowEstimate(basis: Basis, plan: RowScanPlan, sample = 2000): number {
  const n = Math.min(basis.dim, sample);
  if (n === 0) return 0;
  const scratch = rowScratch(plan);
  const tables = scanTables(plan);
  let upper = 0;
  for (let s = 0; s < n; s++) upper += scanRow(plan, basis, tables, Math.floor((s * basis.dim) / n), scratch);
  return upper / n;
}
