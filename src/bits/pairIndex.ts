import { fmix32, slotCountFor } from './hashIndex.js';

/*
 * Open-addressing hash index over pairs of non-negative integers (a spin-up string index and a
 * spin-down string index), so a determinant is found from its two string indices without touching
 * its packed words.
 */

/** Slots for the `count` distinct pairs (first[i], second[i]): slot value is i, or −1 when empty. */
export function buildPairSlots(first: Int32Array, second: Int32Array, count: number): Int32Array {
  const slots = new Int32Array(slotCountFor(count)).fill(-1);
  const mask = slots.length - 1;
  for (let i = 0; i < count; i++) {
    let s = pairHash(first[i]!, second[i]!) & mask;
    while (slots[s] !== -1) s = (s + 1) & mask;
    slots[s] = i;
  }
  return slots;
}

/** Index of the entry (x, y), or −1. */
export function lookupPair(first: Int32Array, second: Int32Array, slots: Int32Array, x: number, y: number): number {
  const mask = slots.length - 1;
  let s = pairHash(x, y) & mask;
  for (;;) {
    const idx = slots[s]!;
    if (idx === -1) return -1;
    if (first[idx] === x && second[idx] === y) return idx;
    s = (s + 1) & mask;
  }
}

/** 32-bit mix of two integers (murmur3 finaliser on a multiplicative combination). */
export function pairHash(x: number, y: number): number {
  return fmix32(Math.imul(x, 0x9e3779b1) ^ Math.imul(y + 0x7f4a7c15, 0x85ebca77));
}
