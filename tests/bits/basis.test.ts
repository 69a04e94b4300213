import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { makeBasis, sortOrder } from '../../src/bits/basis.js';

/** A configuration as a BigInt (word k is bits 32k..32k+31), so the reference order is plain integer comparison. */
function asBig(states: Uint32Array, i: number, nWords: number): bigint {
  let v = 0n;
  for (let k = nWords - 1; k >= 0; k--) v = (v << 32n) | BigInt(states[i * nWords + k]!);
  return v;
}

// Words drawn from a few patterns so digits repeat, agree across entries (skipped passes) and tie.
const wordArb = fc.oneof(fc.constantFrom(0, 1, 0x800, 0x400000, 0xffffffff, 0x80000000), fc.integer({ min: 0, max: 0xffffffff }));
const setArb = fc.integer({ min: 1, max: 4 }).chain((nWords) =>
  fc.record({ nWords: fc.constant(nWords), words: fc.array(wordArb, { minLength: 0, maxLength: 120 * nWords }).map((a) => a.slice(0, a.length - (a.length % nWords))) }),
);

describe('sortOrder', () => {
  it('sortOrder sorts ascending as binary numbers and keeps ties in input order (property)', () => {
    fc.assert(
      fc.property(setArb, ({ nWords, words }) => {
        const states = Uint32Array.from(words);
        const count = states.length / nWords;
        const order = Array.from(sortOrder(states, count, nWords));
        // Reference: Array.prototype.sort, stable since ES2019, on BigInt keys.
        const expected = Array.from({ length: count }, (_, i) => i).sort((a, b) => {
          const x = asBig(states, a, nWords);
          const y = asBig(states, b, nWords);
          return x < y ? -1 : x > y ? 1 : 0;
        });
        expect(order).toEqual(expected);
      }),
      { seed: 11, numRuns: 200 },
    );
  });

  it('sortOrder with a subset returns exactly those entries, in the order the full sort lists them', () => {
    fc.assert(
      fc.property(setArb, fc.integer({ min: 1, max: 1000 }), ({ nWords, words }, seed) => {
        const states = Uint32Array.from(words);
        const count = states.length / nWords;
        const subset = Int32Array.from({ length: count }, (_, i) => i).filter((i) => (i * 7919 + seed) % 3 !== 0);
        const full = Array.from(sortOrder(states, count, nWords));
        const keep = new Set(subset);
        expect(Array.from(sortOrder(states, subset.length, nWords, subset))).toEqual(full.filter((i) => keep.has(i)));
      }),
      { seed: 12, numRuns: 150 },
    );
  });
});

describe('makeBasis', () => {
  it('makeBasis with pick equals makeBasis of the picked entries copied out', () => {
    const nWords = 2;
    const n = 5000;
    const states = new Uint32Array(n * nWords);
    const counts = new Float64Array(n);
    // Distinct configurations: entry i holds i spread over both words.
    for (let i = 0; i < n; i++) {
      states[i * 2] = Math.imul(i, 0x9e3779b1) >>> 0;
      states[i * 2 + 1] = i;
      counts[i] = (i % 13) + 1;
    }
    const pick = Int32Array.from({ length: n }, (_, i) => n - 1 - i).filter((i) => i % 4 !== 1);
    const copied = new Uint32Array(pick.length * nWords);
    const copiedCounts = new Float64Array(pick.length);
    pick.forEach((src, i) => {
      copied.set(states.subarray(src * 2, src * 2 + 2), i * 2);
      copiedCounts[i] = counts[src]!;
    });
    const a = makeBasis(64, nWords, states, pick.length, counts, false, pick);
    const b = makeBasis(64, nWords, copied, pick.length, copiedCounts);
    expect(a.dim).toBe(pick.length);
    expect(Array.from(a.states)).toEqual(Array.from(b.states));
    expect(Array.from(a.counts)).toEqual(Array.from(b.counts));
    expect(Array.from(a.slots)).toEqual(Array.from(b.slots));
    for (let i = 1; i < a.dim; i++) expect(asBig(a.states, i - 1, 2) < asBig(a.states, i, 2)).toBe(true);
  });
});
