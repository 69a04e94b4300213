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
  return fmix32(h);
}

/** The murmur3 finaliser: every input bit reaches every output bit; returns an unsigned 32-bit value. */
export function fmix32(h: number): number {
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
 * Slots hold the entry index in their low log2(slots) bits and a fingerprint (the hash's top bits)
 * above it, so a probe past a different configuration rarely has to read that configuration.
 */
export function slotLayout(slots: Int32Array): { indexBits: number; indexMask: number; fingerprintShift: number } {
  const indexBits = 31 - Math.clz32(slots.length);
  const fingerprintBits = Math.max(0, 31 - indexBits);
  return { indexBits, indexMask: indexBits >= 31 ? 0x7fffffff : (1 << indexBits) - 1, fingerprintShift: 32 - fingerprintBits };
}

/** The fingerprint of hash h in a layout (0 when no bits are left for one). */
export function fingerprintOf(h: number, shift: number): number {
  return shift >= 32 ? 0 : h >>> shift;
}

/**
 * Build the slot array for `count` configurations stored in `states`: −1 when empty, else the
 * entry index and a fingerprint (see `slotLayout`). The caller guarantees the configurations are distinct.
 */
export function buildHashSlots(states: Uint32Array, count: number, nWords: number, slots: Int32Array = new Int32Array(slotCountFor(count))): Int32Array {
  slots.fill(-1);
  const mask = slots.length - 1;
  const { indexBits, fingerprintShift } = slotLayout(slots);
  for (let i = 0; i < count; i++) {
    const h = hashConfig(states, i * nWords, nWords);
    let s = h & mask;
    while (slots[s] !== -1) s = (s + 1) & mask;
    slots[s] = i | (fingerprintOf(h, fingerprintShift) << indexBits);
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

/** Like `lookupConfig` but with the hash already computed. */
export function lookupConfigHashed(states: Uint32Array, slots: Int32Array, nWords: number, query: Uint32Array, qOffset: number, h: number): number {
  const mask = slots.length - 1;
  const layout = slotLayout(slots);
  const fp = fingerprintOf(h, layout.fingerprintShift);
  let s = h & mask;
  for (;;) {
    const v = slots[s]!;
    if (v === -1) return -1;
    const idx = slotHolds(states, nWords, v, layout, fp, query, qOffset);
    if (idx >= 0) return idx;
    s = (s + 1) & mask;
  }
}

/**
 * The basis index held by an occupied slot value `v` when it is the query's (fingerprint `fp`
 * and every word equal), else −1: one probe step, shared by `lookupConfigHashed` and callers that
 * batch their first probes.
 */
export function slotHolds(states: Uint32Array, nWords: number, v: number, layout: { indexBits: number; indexMask: number }, fp: number, query: Uint32Array, qOffset: number): number {
  if (v >>> layout.indexBits !== fp) return -1;
  const idx = v & layout.indexMask;
  const base = idx * nWords;
  let k = 0;
  while (k < nWords && states[base + k] === query[qOffset + k]) k++;
  return k === nWords ? idx : -1;
}
