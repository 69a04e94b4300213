import { buildConfigFilter, buildHashSlots, filterWordsFor, lookupConfig, slotCountFor } from './hashIndex.js';

/**
 * The sampled subspace: distinct configurations sorted as binary numbers, with a hash index.
 * `states` and `slots` may sit on SharedArrayBuffers so worker threads read them without copying.
 */
export interface Basis {
  qubits: number;
  nWords: number;
  dim: number;
  /** dim × nWords packed configurations, ascending. */
  states: Uint32Array;
  /** Open-addressing slots: basis index or −1. */
  slots: Int32Array;
  /** Sampled weight (summed counts) of each configuration; zero for configurations added by expansion. */
  counts: Float64Array;
  /** Blocked Bloom filter of the configurations (see `buildConfigFilter`). */
  filter: Uint32Array;
}

/** Bits per radix digit: three digits cover a word, and 2048 buckets keep the scatter cache-friendly. */
const DIGIT_BITS = 11;
const DIGIT_MASK = (1 << DIGIT_BITS) - 1;
const DIGITS_PER_WORD = 3;

/**
 * Sort order of `count` packed configurations, ascending as binary numbers: a stable LSD radix
 * sort on 11-bit digits, skipping digits on which all configurations agree. With `subset`, sorts
 * only the entries `subset[0..count)` and returns them in order.
 */
export function sortOrder(states: Uint32Array, count: number, nWords: number, subset?: Int32Array): Int32Array {
  let order = new Int32Array(count);
  if (subset) order.set(subset.subarray(0, count));
  else for (let i = 0; i < count; i++) order[i] = i;
  if (count < 2) return order;
  let next = new Int32Array(count);
  // The word being sorted on travels with the order, so each digit pass reads sequentially; only
  // the gather at the start of each word touches `states` out of order.
  let key = new Uint32Array(count);
  let nextKey = new Uint32Array(count);
  const hist = new Int32Array(DIGITS_PER_WORD << DIGIT_BITS);
  for (let k = 0; k < nWords; k++) {
    hist.fill(0);
    for (let i = 0; i < count; i++) {
      const v = states[order[i]! * nWords + k]!;
      key[i] = v;
      hist[v & DIGIT_MASK]!++;
      hist[(1 << DIGIT_BITS) + ((v >>> DIGIT_BITS) & DIGIT_MASK)]!++;
      hist[(2 << DIGIT_BITS) + (v >>> (2 * DIGIT_BITS))]!++;
    }
    for (let d = 0; d < DIGITS_PER_WORD; d++) {
      const h0 = d << DIGIT_BITS;
      const shift = d * DIGIT_BITS;
      // Exclusive prefix sums give each bucket's first slot; a full bucket means nothing to do.
      let sum = 0;
      let uniform = false;
      for (let b = 0; b <= DIGIT_MASK; b++) {
        const c = hist[h0 + b]!;
        if (c === count) uniform = true;
        hist[h0 + b] = sum;
        sum += c;
      }
      if (uniform) continue;
      for (let i = 0; i < count; i++) {
        const v = key[i]!;
        const at = hist[h0 + ((v >>> shift) & DIGIT_MASK)]!++;
        nextKey[at] = v;
        next[at] = order[i]!;
      }
      const t = order;
      order = next;
      next = t;
      const tk = key;
      key = nextKey;
      nextKey = tk;
    }
  }
  return order;
}

/**
 * Make a basis from distinct configurations (any order). When `shared` is set the arrays live on
 * SharedArrayBuffers. With `pick`, the basis holds only the entries `pick[0..count)` of `states`
 * and `counts`, so callers need not copy a subset out first.
 */
export function makeBasis(
  qubits: number,
  nWords: number,
  states: Uint32Array,
  count: number,
  counts?: Float64Array,
  shared = false,
  pick?: Int32Array,
): Basis {
  const order = sortOrder(states, count, nWords, pick);
  const alloc = (bytes: number): ArrayBufferLike => (shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes));
  const sorted = new Uint32Array(alloc(Math.max(1, count * nWords) * 4));
  const sortedCounts = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const src = order[i]!;
    for (let k = 0; k < nWords; k++) sorted[i * nWords + k] = states[src * nWords + k]!;
    if (counts) sortedCounts[i] = counts[src]!;
  }
  const slots = buildHashSlots(sorted, count, nWords, new Int32Array(alloc(slotCountFor(count) * 4)));
  const filter = buildConfigFilter(sorted, count, nWords, new Uint32Array(alloc(filterWordsFor(count) * 4)));
  return { qubits, nWords, dim: count, states: sorted, slots, counts: sortedCounts, filter };
}

/** Index of a configuration in the basis, or −1. */
export function basisIndexOf(basis: Basis, words: Uint32Array, offset = 0): number {
  return lookupConfig(basis.states, basis.slots, basis.nWords, words, offset);
}
