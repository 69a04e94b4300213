import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { depositBits, extractBits } from '../../src/bits/bitRange.js';
import { buildPairSlots, lookupPair } from '../../src/bits/pairIndex.js';
import { wordsFor } from '../../src/bits/packed.js';

describe('extractBits', () => {
  it('extractBits reads qubits lo..lo+count−1 and depositBits writes them back, across word boundaries', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 150 }), fc.integer({ min: 0, max: 1 << 30 }), fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (qubits, seed, a, b) => {
        const nWords = wordsFor(qubits);
        const src = new Uint32Array(nWords);
        let x = seed | 1;
        for (let k = 0; k < nWords; k++) {
          x = Math.imul(x ^ (x >>> 15), 0x2c1b3c6d) >>> 0;
          src[k] = x;
        }
        const top = qubits - 32 * (nWords - 1);
        if (top < 32) src[nWords - 1]! &= (1 << top) - 1;
        const lo = Math.floor(a * qubits);
        const count = Math.max(1, Math.min(qubits - lo, Math.floor(b * (qubits - lo)) + 1));
        const w = wordsFor(count);
        const out = new Uint32Array(w);
        extractBits(src, 0, nWords, lo, count, out, 0, w);
        for (let q = 0; q < w * 32; q++) {
          const want = q < count ? (src[(lo + q) >>> 5]! >>> ((lo + q) & 31)) & 1 : 0;
          expect((out[q >>> 5]! >>> (q & 31)) & 1).toBe(want);
        }
        const back = new Uint32Array(nWords);
        depositBits(out, 0, count, back, 0, lo);
        for (let q = 0; q < qubits; q++) {
          const inside = q >= lo && q < lo + count;
          expect((back[q >>> 5]! >>> (q & 31)) & 1).toBe(inside ? (src[q >>> 5]! >>> (q & 31)) & 1 : 0);
        }
      }),
      { seed: 21, numRuns: 200 },
    );
  });
});

describe('lookupPair', () => {
  it('lookupPair finds every stored pair and nothing else', () => {
    const first = Int32Array.from([0, 0, 1, 5, 7, 7, 123456]);
    const second = Int32Array.from([0, 1, 0, 5, 2, 3, 654321]);
    const slots = buildPairSlots(first, second, first.length);
    for (let i = 0; i < first.length; i++) expect(lookupPair(first, second, slots, first[i]!, second[i]!)).toBe(i);
    for (const [x, y] of [[1, 1], [5, 0], [7, 4], [0, 2], [654321, 123456]]) expect(lookupPair(first, second, slots, x!, y!)).toBe(-1);
  });
});
