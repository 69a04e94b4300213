import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { ConfigTable } from '../../src/bits/configTable.js';

/** Entries of a table as bitstring-key → [index, count], the reference being a plain Map (common practice for dedupe). */
function entries(t: ConfigTable): Map<string, [number, number]> {
  const m = new Map<string, [number, number]>();
  for (let i = 0; i < t.size; i++) m.set(Array.from(t.states.subarray(i * t.nWords, (i + 1) * t.nWords)).join(':'), [i, t.counts[i]!]);
  return m;
}

const rowsArb = fc.integer({ min: 1, max: 4 }).chain((nWords) =>
  fc.record({
    nWords: fc.constant(nWords),
    // Few distinct values per word, so rows repeat often.
    rows: fc.array(fc.tuple(fc.array(fc.integer({ min: 0, max: 3 }).map((v) => (v * 0x9e3779b1) >>> 0), { minLength: nWords, maxLength: nWords }), fc.integer({ min: 0, max: 9 })), {
      minLength: 1,
      maxLength: 300,
    }),
  }),
);

describe('ConfigTable', () => {
  it('ConfigTable.add deduplicates in first-seen order with summed counts, across growth (property)', () => {
    fc.assert(
      fc.property(rowsArb, ({ nWords, rows }) => {
        const t = new ConfigTable(nWords, 1);
        const expected = new Map<string, [number, number]>();
        for (const [w, c] of rows) {
          const key = w.join(':');
          const at = t.add(Uint32Array.from(w), 0, c);
          const e = expected.get(key);
          if (e) e[1] += c;
          else expected.set(key, [expected.size, c]);
          expect(at).toBe(expected.get(key)![0]);
        }
        expect(entries(t)).toEqual(expected);
      }),
      { seed: 5, numRuns: 150 },
    );
  });

  it('ConfigTable.addMany gives the same table and indices as add row by row (property)', () => {
    fc.assert(
      fc.property(rowsArb, fc.integer({ min: 1, max: 64 }), ({ nWords, rows }, batch) => {
        const one = new ConfigTable(nWords, 4);
        const many = new ConfigTable(nWords, 4);
        const words = new Uint32Array(batch * nWords);
        const counts = new Float64Array(batch);
        const at = new Int32Array(batch);
        for (let r0 = 0; r0 < rows.length; r0 += batch) {
          const n = Math.min(batch, rows.length - r0);
          const want: number[] = [];
          for (let r = 0; r < n; r++) {
            const [w, c] = rows[r0 + r]!;
            words.set(w, r * nWords);
            counts[r] = c;
            want.push(one.add(Uint32Array.from(w), 0, c));
          }
          many.addMany(words, counts, n, at);
          expect(Array.from(at.subarray(0, n))).toEqual(want);
        }
        expect(entries(many)).toEqual(entries(one));
      }),
      { seed: 6, numRuns: 150 },
    );
  });

  it('ConfigTable.releaseIndex keeps the entries and a later add or indexOf still finds them', () => {
    const t = new ConfigTable(2, 16);
    for (let i = 0; i < 100; i++) t.add(Uint32Array.of(i % 37, 7), 0, 1);
    const before = entries(t);
    t.releaseIndex();
    expect(entries(t)).toEqual(before);
    expect(t.indexOf(Uint32Array.of(5, 7), 0)).toBe(5);
    expect(t.indexOf(Uint32Array.of(5, 8), 0)).toBe(-1);
    t.releaseIndex();
    expect(t.add(Uint32Array.of(36, 7), 0, 2)).toBe(36);
    expect(t.counts[36]).toBe(4); // 36 appears twice in 0..99 (36 and 73), plus 2
    expect(t.add(Uint32Array.of(99, 7), 0, 1)).toBe(37);
    expect(t.size).toBe(38);
  });
});
