import { sortOrder } from '../bits/basis.js';
import { popcount32 } from '../bits/packed.js';
import type { Integrals } from '../operators/integrals.js';
import type { SpinStrings } from './spinStrings.js';

/**
 * For every string of one spin register, the strings of the same set one or two electrons away,
 * with what the Slater–Condon rules need about each (CSR over source strings, targets ascending).
 * Signs follow the Jordan–Wigner order: a†_a a_i on a string gives (−1)^{occupied orbitals strictly
 * between i and a}.
 */
export interface StringConnections {
  singleStart: Int32Array;
  singleTarget: Int32Array;
  /** a·M + i for the excitation i → a (i left the source, a entered), the row of (ai|··) in the tensor. */
  singleExc: Int32Array;
  /** ±1. */
  singleSign: Float64Array;
  /** h_ai + Σ_{j occupied in the source} [(ai|jj) − (aj|ji)]: the same-spin part of the element, unsigned. */
  singlePartial: Float64Array;
  doubleStart: Int32Array;
  doubleTarget: Int32Array;
  /** The signed element ±[(ai|bj) − (aj|bi)]; exact zeros are left out. */
  doubleValue: Float64Array;
  /** Σ_{p occ} h_pp + ½ Σ_{p,q occ} [(pp|qq) − (pq|qp)] of each string. */
  diagonal: Float64Array;
}

/**
 * Find all single and double connections within a string set by shared residues: two strings
 * differ by one electron iff they share an (n−1)-electron residue, and by two iff they share an
 * (n−2)-electron residue and are not singles. Sorting the residues groups the partners, so the cost
 * follows the connections present rather than all excitations of every string.
 */
export function stringConnections(strings: SpinStrings, ints: Integrals): StringConnections {
  const m = ints.orbitals;
  const { count, electrons: n, occ } = strings;
  const h = ints.h1;
  const eri = ints.eri;
  const m2 = m * m;
  const m3 = m2 * m;

  const diagonal = new Float64Array(count);
  for (let s = 0; s < count; s++) {
    let e = 0;
    for (let x = 0; x < n; x++) {
      const p = occ[s * n + x]!;
      e += h[p * m + p]!;
      for (let y = 0; y < n; y++) {
        const q = occ[s * n + y]!;
        e += 0.5 * (eri[p * m3 + p * m2 + q * m + q]! - eri[p * m3 + q * m2 + q * m + p]!);
      }
    }
    diagonal[s] = e;
  }

  const singles = toCsr(residuePairs(strings, 1), count);
  const ns = singles.target.length;
  const singleExc = new Int32Array(ns);
  const singleSign = new Float64Array(ns);
  const singlePartial = new Float64Array(ns);
  const removed = new Int32Array(2);
  const added = new Int32Array(2);
  for (let s = 0; s < count; s++) {
    for (let e = singles.start[s]!; e < singles.start[s + 1]!; e++) {
      const t = singles.target[e]!;
      differing(strings, s, t, removed, added);
      const i = removed[0]!;
      const a = added[0]!;
      singleExc[e] = a * m + i;
      singleSign[e] = between(occ, s * n, n, i, a) & 1 ? -1 : 1;
      let v = h[a * m + i]!;
      const row = (a * m + i) * m2;
      for (let x = 0; x < n; x++) {
        const j = occ[s * n + x]!;
        v += eri[row + j * m + j]! - eri[a * m3 + j * m2 + j * m + i]!;
      }
      singlePartial[e] = v;
    }
  }

  const doubles = toCsr(residuePairs(strings, 2), count);
  const keep = new Uint8Array(doubles.target.length);
  const values = new Float64Array(doubles.target.length);
  for (let s = 0; s < count; s++) {
    for (let e = doubles.start[s]!; e < doubles.start[s + 1]!; e++) {
      differing(strings, s, doubles.target[e]!, removed, added);
      const i = removed[0]!;
      const j = removed[1]!;
      const a = added[0]!;
      const b = added[1]!;
      // a†_a a_i a†_b a_j: apply j → b first, then i → a on the result.
      let parity = between(occ, s * n, n, j, b);
      parity += between(occ, s * n, n, i, a) - (strictlyBetween(j, i, a) ? 1 : 0) + (strictlyBetween(b, i, a) ? 1 : 0);
      const v = eri[((a * m + i) * m + b) * m + j]! - eri[((a * m + j) * m + b) * m + i]!;
      if (v === 0) continue;
      values[e] = parity & 1 ? -v : v;
      keep[e] = 1;
    }
  }
  const packed = compact(doubles, keep, values, count);
  return {
    singleStart: singles.start,
    singleTarget: singles.target,
    singleExc,
    singleSign,
    singlePartial,
    doubleStart: packed.start,
    doubleTarget: packed.target,
    doubleValue: packed.values,
    diagonal,
  };
}

function strictlyBetween(x: number, lo: number, hi: number): boolean {
  return lo < hi ? x > lo && x < hi : x > hi && x < lo;
}

/** Occupied orbitals of string `at` strictly between p and q. */
function between(occ: Int32Array, at: number, n: number, p: number, q: number): number {
  const lo = Math.min(p, q);
  const hi = Math.max(p, q);
  let c = 0;
  for (let x = 0; x < n; x++) {
    const o = occ[at + x]!;
    if (o > lo && o < hi) c++;
  }
  return c;
}

/**
 * Orbitals occupied in s but not t (into removed, ascending) and in t but not s (into added);
 * returns how many of each.
 */
function differing(strings: SpinStrings, s: number, t: number, removed: Int32Array, added: Int32Array): number {
  const w = strings.nWords;
  let nr = 0;
  let na = 0;
  for (let k = 0; k < w; k++) {
    const a = strings.states[s * w + k]!;
    const b = strings.states[t * w + k]!;
    let gone = (a & ~b) >>> 0;
    while (gone) {
      const low = gone & -gone;
      removed[nr++] = k * 32 + 31 - Math.clz32(low);
      gone = (gone ^ low) >>> 0;
    }
    let come = (b & ~a) >>> 0;
    while (come) {
      const low = come & -come;
      added[na++] = k * 32 + 31 - Math.clz32(low);
      come = (come ^ low) >>> 0;
    }
  }
  return nr;
}

interface PairList {
  src: Int32Array;
  dst: Int32Array;
  size: number;
}

/**
 * All ordered pairs (s, t), s ≠ t, of strings sharing an (n − remove)-electron residue, keeping for
 * remove = 2 only the pairs that differ by exactly two electrons (each then shares one residue).
 */
function residuePairs(strings: SpinStrings, remove: 1 | 2): PairList {
  const { count, electrons: n, nWords: w, occ, states } = strings;
  const perString = remove === 1 ? n : (n * (n - 1)) / 2;
  const records = count * perString;
  const out: PairList = { src: new Int32Array(64), dst: new Int32Array(64), size: 0 };
  if (records === 0 || count < 2) return out;
  const keys = new Uint32Array(records * w);
  const owner = new Int32Array(records);
  let r = 0;
  for (let s = 0; s < count; s++) {
    for (let x = 0; x < n; x++) {
      for (let y = remove === 1 ? x : x + 1; y < (remove === 1 ? x + 1 : n); y++) {
        for (let k = 0; k < w; k++) keys[r * w + k] = states[s * w + k]!;
        const p = occ[s * n + x]!;
        keys[r * w + (p >>> 5)]! &= ~(1 << (p & 31));
        if (remove === 2) {
          const q = occ[s * n + y]!;
          keys[r * w + (q >>> 5)]! &= ~(1 << (q & 31));
        }
        owner[r++] = s;
      }
    }
  }
  const order = sortOrder(keys, records, w);
  let runStart = 0;
  for (let x = 1; x <= records; x++) {
    if (x < records && sameKey(keys, order[x]!, order[runStart]!, w)) continue;
    for (let a = runStart; a < x; a++) {
      for (let b = a + 1; b < x; b++) {
        const u = owner[order[a]!]!;
        const v = owner[order[b]!]!;
        if (remove === 2) {
          let d = 0;
          for (let k = 0; k < w; k++) d += popcount32(states[u * w + k]! ^ states[v * w + k]!);
          if (d !== 4) continue;
        }
        push(out, u, v);
        push(out, v, u);
      }
    }
    runStart = x;
  }
  return out;
}

function sameKey(keys: Uint32Array, a: number, b: number, w: number): boolean {
  for (let k = 0; k < w; k++) if (keys[a * w + k] !== keys[b * w + k]) return false;
  return true;
}

function push(list: PairList, s: number, t: number): void {
  if (list.size === list.src.length) {
    const src = new Int32Array(list.size * 2);
    src.set(list.src);
    const dst = new Int32Array(list.size * 2);
    dst.set(list.dst);
    list.src = src;
    list.dst = dst;
  }
  list.src[list.size] = s;
  list.dst[list.size++] = t;
}

/** Counting sorts by target then (stably) by source: CSR with ascending targets per source. */
function toCsr(list: PairList, count: number): { start: Int32Array; target: Int32Array } {
  const n = list.size;
  const byDst = countingOrder(list.dst, n, count, null);
  const order = countingOrder(list.src, n, count, byDst);
  const start = new Int32Array(count + 1);
  for (let e = 0; e < n; e++) start[list.src[e]! + 1]!++;
  for (let s = 0; s < count; s++) start[s + 1]! += start[s]!;
  const target = new Int32Array(n);
  for (let e = 0; e < n; e++) target[e] = list.dst[order[e]!]!;
  return { start, target };
}

/** Stable order of entries by `key` (range 0..count−1), visiting them in `within` order if given. */
function countingOrder(key: Int32Array, n: number, count: number, within: Int32Array | null): Int32Array {
  const bucket = new Int32Array(count + 1);
  for (let e = 0; e < n; e++) bucket[key[e]! + 1]!++;
  for (let s = 0; s < count; s++) bucket[s + 1]! += bucket[s]!;
  const order = new Int32Array(n);
  for (let x = 0; x < n; x++) {
    const e = within ? within[x]! : x;
    order[bucket[key[e]!]!++] = e;
  }
  return order;
}

function compact(csr: { start: Int32Array; target: Int32Array }, keep: Uint8Array, values: Float64Array, count: number): { start: Int32Array; target: Int32Array; values: Float64Array } {
  let total = 0;
  for (let e = 0; e < keep.length; e++) total += keep[e]!;
  const start = new Int32Array(count + 1);
  const target = new Int32Array(total);
  const out = new Float64Array(total);
  let at = 0;
  for (let s = 0; s < count; s++) {
    for (let e = csr.start[s]!; e < csr.start[s + 1]!; e++) {
      if (!keep[e]) continue;
      target[at] = csr.target[e]!;
      out[at++] = values[e]!;
    }
    start[s + 1] = at;
  }
  return { start, target, values: out };
}
