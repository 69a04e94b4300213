import { hashConfig, slotCountFor } from './hashIndex.js';

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
  private slots: Int32Array;

  constructor(nWords: number, capacity = 1024) {
    this.nWords = nWords;
    const cap = Math.max(16, capacity);
    this.states = new Uint32Array(cap * nWords);
    this.counts = new Float64Array(cap);
    this.slots = new Int32Array(slotCountFor(cap)).fill(-1);
  }

  /** Add `count` to the configuration at `words[offset..]`, inserting it if new; returns its index. */
  add(words: Uint32Array, offset: number, count: number): number {
    const nWords = this.nWords;
    let mask = this.slots.length - 1;
    let s = hashConfig(words, offset, nWords) & mask;
    for (;;) {
      const idx = this.slots[s]!;
      if (idx === -1) break;
      const base = idx * nWords;
      let k = 0;
      while (k < nWords && this.states[base + k] === words[offset + k]) k++;
      if (k === nWords) {
        this.counts[idx]! += count;
        return idx;
      }
      s = (s + 1) & mask;
    }
    if ((this.size + 1) * 2 > this.slots.length) {
      this.grow();
      mask = this.slots.length - 1;
      s = hashConfig(words, offset, nWords) & mask;
      while (this.slots[s] !== -1) s = (s + 1) & mask;
    }
    const idx = this.size++;
    if (idx * nWords + nWords > this.states.length) this.growStorage();
    this.states.set(words.subarray(offset, offset + nWords), idx * nWords);
    this.counts[idx] = count;
    this.slots[s] = idx;
    return idx;
  }

  /** Index of a configuration, or -1. */
  indexOf(words: Uint32Array, offset: number): number {
    const nWords = this.nWords;
    const mask = this.slots.length - 1;
    let s = hashConfig(words, offset, nWords) & mask;
    for (;;) {
      const idx = this.slots[s]!;
      if (idx === -1) return -1;
      const base = idx * nWords;
      let k = 0;
      while (k < nWords && this.states[base + k] === words[offset + k]) k++;
      if (k === nWords) return idx;
      s = (s + 1) & mask;
    }
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

  private grow(): void {
    const slots = new Int32Array(this.slots.length * 2).fill(-1);
    const mask = slots.length - 1;
    for (let i = 0; i < this.size; i++) {
      let s = hashConfig(this.states, i * this.nWords, this.nWords) & mask;
      while (slots[s] !== -1) s = (s + 1) & mask;
      slots[s] = i;
    }
    this.slots = slots;
  }
}
