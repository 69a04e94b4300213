import { hashConfig, slotCountFor } from './hashIndex.js';

// Where `addMany` leaves the values of its prefetching loads, so the compiler keeps them.
const prefetchSink = new Int32Array(1);

/** Rows whose memory `addMany` touches ahead of inserting them. */
const PREFETCH_ROWS = 64;

/**
 * A growable set of distinct packed configurations with a weight (shot count) per entry, used to
 * deduplicate samples while streaming. Entries keep insertion order; `states` and `counts` are the
 * flat storage (only the first `size` entries are meaningful).
 */
export class ConfigTable {
  readonly nWords: number;
  states: Uint32Array;
  counts: Float64Array;
  size = 0;
  // Slot value is entry index + 1, so a fresh (zero-filled) array is already empty; null once released.
  private slots: Int32Array | null;

  constructor(nWords: number, capacity = 1024) {
    this.nWords = nWords;
    const cap = Math.max(16, capacity);
    this.states = new Uint32Array(cap * nWords);
    this.counts = new Float64Array(cap);
    this.slots = new Int32Array(slotCountFor(cap));
  }

  /** Add `count` to the configuration at `words[offset..]`, inserting it if new; returns its index. */
  add(words: Uint32Array, offset: number, count: number): number {
    const nWords = this.nWords;
    let slots = this.slots ?? this.rehash(this.size);
    const states = this.states;
    let mask = slots.length - 1;
    let s = hashConfig(words, offset, nWords) & mask;
    for (;;) {
      const idx = slots[s]! - 1;
      if (idx < 0) break;
      const base = idx * nWords;
      let k = 0;
      while (k < nWords && states[base + k] === words[offset + k]) k++;
      if (k === nWords) {
        this.counts[idx]! += count;
        return idx;
      }
      s = (s + 1) & mask;
    }
    const idx = this.size;
    if ((idx + 1) * 2 > slots.length) {
      slots = this.rehash(idx + 1);
      mask = slots.length - 1;
      s = hashConfig(words, offset, nWords) & mask;
      while (slots[s] !== 0) s = (s + 1) & mask;
    }
    if (idx * nWords + nWords > this.states.length) this.growStorage();
    const out = this.states;
    const base = idx * nWords;
    for (let k = 0; k < nWords; k++) out[base + k] = words[offset + k]!;
    this.counts[idx] = count;
    slots[s] = idx + 1;
    this.size = idx + 1;
    return idx;
  }

  /**
   * `add` for `n` configurations stored back to back in `words`, with weights `counts`, in order;
   * the index of each goes to `at`. Same result as `n` calls to `add`, but faster on large tables.
   */
  addMany(words: Uint32Array, counts: Float64Array, n: number, at: Int32Array): void {
    for (let r0 = 0; r0 < n; r0 += PREFETCH_ROWS) {
      const r1 = Math.min(n, r0 + PREFETCH_ROWS);
      this.prefetch(words, r0, r1, at);
      for (let r = r0; r < r1; r++) at[r] = this.add(words, r * this.nWords, counts[r]!);
    }
  }

  /**
   * Touch the slot of each of rows r0..r1, then the entry it points at: the loads are independent,
   * so their cache misses overlap instead of being paid one row after another by `add`.
   */
  private prefetch(words: Uint32Array, r0: number, r1: number, scratch: Int32Array): void {
    const nWords = this.nWords;
    const slots = this.slots ?? this.rehash(this.size);
    const mask = slots.length - 1;
    const states = this.states;
    const weights = this.counts;
    let touched = 0;
    for (let r = r0; r < r1; r++) {
      const v = slots[hashConfig(words, r * nWords, nWords) & mask]!;
      scratch[r] = v;
    }
    for (let r = r0; r < r1; r++) {
      const idx = scratch[r]! - 1;
      if (idx >= 0) touched ^= states[idx * nWords]! ^ (weights[idx]! | 0);
    }
    prefetchSink[0]! ^= touched;
  }

  /** Index of a configuration, or -1. */
  indexOf(words: Uint32Array, offset: number): number {
    const nWords = this.nWords;
    const slots = this.slots ?? this.rehash(this.size);
    const states = this.states;
    const mask = slots.length - 1;
    let s = hashConfig(words, offset, nWords) & mask;
    for (;;) {
      const idx = slots[s]! - 1;
      if (idx < 0) return -1;
      const base = idx * nWords;
      let k = 0;
      while (k < nWords && states[base + k] === words[offset + k]) k++;
      if (k === nWords) return idx;
      s = (s + 1) & mask;
    }
  }

  /**
   * Drop the hash slots (the larger part of the table at low fill) once no more lookups are
   * expected; `states`, `counts` and `size` stay, and a later `add` or `indexOf` rebuilds the slots.
   */
  releaseIndex(): void {
    this.slots = null;
  }

  private growStorage(): void {
    const cap = Math.max(16, this.counts.length * 2);
    const states = new Uint32Array(cap * this.nWords);
    states.set(this.states);
    const counts = new Float64Array(cap);
    counts.set(this.counts);
    this.states = states;
    this.counts = counts;
  }

  /** Rebuild the slots for at least `entries` entries (at most half full) and return them. */
  private rehash(entries: number): Int32Array {
    const old = this.slots;
    let n = slotCountFor(entries);
    if (old && n <= old.length) n = old.length * 2;
    const slots = new Int32Array(n);
    const mask = n - 1;
    for (let i = 0; i < this.size; i++) {
      let s = hashConfig(this.states, i * this.nWords, this.nWords) & mask;
      while (slots[s] !== 0) s = (s + 1) & mask;
      slots[s] = i + 1;
    }
    this.slots = slots;
    return slots;
  }
}
