/**
 * Open-addressing hash index over packed configurations stored back to back in one Uint32Array.
 * Free functions over flat arrays, so worker threads can share the same buffers without copying.
 */

/** Hash of the configuration at `words[offset .. offset+nWords)`; 32-bit, well mixed (murmur3 finaliser). */
export function hashConfig(words: Uint32Array, offset: number, nWords: number): number {
  let h = 0x9e3779b9 ^ nWords;
  for (let k = 0; k < nWords; k++) {
    h = Math.imul(h ^ words[offset + k]!, 0xcc9e2d51);
    h = (h << 15) | (h >>> 17);
    h = Math.imul(h, 0x1b873593);
  }
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** Slot count for `size` entries: a power of two at most half full. */
export function slotCountFor(size: number): number {
  let cap = 16;
  while (cap < size * 2) cap *= 2;
  return cap;
}

/**
 * Build the slot array for `count` configurations stored in `states`: slot value is the entry index,
 * -1 when empty. The caller guarantees the configurations are distinct.
 */
export function buildHashSlots(states: Uint32Array, count: number, nWords: number, slots: Int32Array = new Int32Array(slotCountFor(count))): Int32Array {
  slots.fill(-1);
  const mask = slots.length - 1;
  for (let i = 0; i < count; i++) {
    let s = hashConfig(states, i * nWords, nWords) & mask;
    while (slots[s] !== -1) s = (s + 1) & mask;
    slots[s] = i;
  }
  return slots;
}

/** Index of the configuration `query[qOffset..]` among `states`, or -1 when absent. */
export function lookupConfig(
  states: Uint32Array,
  slots: Int32Array,
  nWords: number,
  query: Uint32Array,
  qOffset: number,
): number {
  return lookupConfigHashed(states, slots, nWords, query, qOffset, hashConfig(query, qOffset, nWords));
}

/**
 * A blocked Bloom filter over the configurations' hashes: 512-bit lines, two bits per entry in one
 * line, about 8 bits per entry (small enough to stay in a core's cache at D ~ 10^6). It answers "certainly absent" for most flipped configurations from
 * cache, so the builder touches the large slot array only for the few that may be present.
 */
export function buildConfigFilter(states: Uint32Array, count: number, nWords: number, filter?: Uint32Array): Uint32Array {
  const f = filter ?? new Uint32Array(filterWordsFor(count));
  f.fill(0);
  const lineMask = f.length / 16 - 1;
  for (let i = 0; i < count; i++) {
    const h = hashConfig(states, i * nWords, nWords);
    const line = (h & lineMask) << 4;
    const h2 = Math.imul(h ^ (h >>> 16), 0x9e3779b1);
    f[line + ((h2 >>> 5) & 15)]! |= 1 << (h2 & 31);
    f[line + ((h2 >>> 14) & 15)]! |= 1 << ((h2 >>> 9) & 31);
  }
  return f;
}

/** Words of filter storage for `count` entries (a power-of-two number of 16-word lines). */
export function filterWordsFor(count: number): number {
  let lines = 1;
  while (lines * 512 < count * 8) lines *= 2;
  return lines * 16;
}

/** False when the configuration with hash `h` is certainly not in the set the filter was built from. */
export function filterMayContain(f: Uint32Array, h: number): boolean {
  const line = (h & (f.length / 16 - 1)) << 4;
  const h2 = Math.imul(h ^ (h >>> 16), 0x9e3779b1);
  return ((f[line + ((h2 >>> 5) & 15)]! >>> (h2 & 31)) & (f[line + ((h2 >>> 14) & 15)]! >>> ((h2 >>> 9) & 31)) & 1) === 1;
}

/** Like `lookupConfig` but with the hash already computed. */
export function lookupConfigHashed(states: Uint32Array, slots: Int32Array, nWords: number, query: Uint32Array, qOffset: number, h: number): number {
  const mask = slots.length - 1;
  let s = h & mask;
  for (;;) {
    const idx = slots[s]!;
    if (idx === -1) return -1;
    const base = idx * nWords;
    let k = 0;
    while (k < nWords && states[base + k] === query[qOffset + k]) k++;
    if (k === nWords) return idx;
    s = (s + 1) & mask;
  }
}
