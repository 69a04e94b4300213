import { buildConfigFilter, filterWordsFor } from './configFilter.js';
import { buildHashSlots, lookupConfig, slotCountFor } from './hashIndex.js';

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
  /** Open-addressing slots (see `buildHashSlots`): −1, or a basis index with a fingerprint. */
  slots: Int32Array;
  /** Sampled weight (summed counts) of each configuration; zero for configurations added by expansion. */
  counts: Float64Array;
  /** Blocked Bloom filter of the configurations (see `buildConfigFilter`). */
  filter: Uint32Array;
}

/**
 * Sort order of `count` packed configurations, ascending as binary numbers: an LSD radix sort on
 * 16-bit digits (stable, O(count) per digit), skipping digits on which all configurations agree.
 */
export function sortOrder(states: Uint32Array, count: number, nWords: number): Int32Array {
  let order = new Int32Array(count);
  for (let i = 0; i < count; i++) order[i] = i;
  let next = new Int32Array(count);
  const bucket = new Int32Array(65537);
  for (let d = 0; d < nWords * 2; d++) {
    const k = d >>> 1;
    const shift = (d & 1) * 16;
    bucket.fill(0);
    for (let i = 0; i < count; i++) bucket[((states[i * nWords + k]! >>> shift) & 0xffff) + 1]!++;
    let uniform = false;
    for (let b = 1; b <= 65536; b++) if (bucket[b] === count) uniform = true;
    if (uniform) continue;
    for (let b = 1; b <= 65536; b++) bucket[b]! += bucket[b - 1]!;
    for (let i = 0; i < count; i++) {
      const src = order[i]!;
      next[bucket[(states[src * nWords + k]! >>> shift) & 0xffff]!++] = src;
    }
    const t = order;
    order = next;
    next = t;
  }
  return order;
}

/**
 * Make a basis from distinct configurations (any order). When `shared` is set the arrays live on
 * SharedArrayBuffers.
 */
export function makeBasis(
  qubits: number,
  nWords: number,
  states: Uint32Array,
  count: number,
  counts?: Float64Array,
  shared = false,
): Basis {
  const order = sortOrder(states, count, nWords);
  const alloc = (bytes: number): ArrayBufferLike => (shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes));
  const sorted = new Uint32Array(alloc(Math.max(1, count * nWords) * 4));
  const sortedCounts = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const src = order[i]!;
    for (let k = 0; k < nWords; k++) sorted[i * nWords + k] = states[src * nWords + k]!;
    sortedCounts[i] = counts ? counts[src]! : 0;
  }
  const slots = buildHashSlots(sorted, count, nWords, new Int32Array(alloc(slotCountFor(count) * 4)));
  const filter = buildConfigFilter(sorted, count, nWords, new Uint32Array(alloc(filterWordsFor(count) * 4)));
  return { qubits, nWords, dim: count, states: sorted, slots, counts: sortedCounts, filter };
}

/** Index of a configuration in the basis, or −1. */
export function basisIndexOf(basis: Basis, words: Uint32Array, offset = 0): number {
  return lookupConfig(basis.states, basis.slots, basis.nWords, words, offset);
}
