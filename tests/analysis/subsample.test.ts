import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { readSamples } from '../../src/io/readSamples.js';
import { firstShots, randomShots } from '../../src/analysis/subsample.js';
import { tempDir } from '../helpers.js';

async function twoDumps() {
  const dir = tempDir();
  const a = join(dir, 'a.csv');
  const b = join(dir, 'b.csv');
  writeFileSync(a, 'bitstring,count\n0011,4\n0101,1\n0011,2\n1001,3\n');
  writeFileSync(b, 'bitstring,count\n1100,5\n0101,2\n');
  return readSamples([a, b], { keepOrder: true });
}

describe('firstShots', () => {
  it('firstShots takes rows in file order, dumps in the order given, cutting the last row', async () => {
    const s = await twoDumps();
    const f = firstShots(s, 6);
    expect(f.groups).toHaveLength(1);
    expect(f.groups[0]!.shots).toBe(6);
    // Rows: 0011×4, 0101×1, then 1 of the second 0011 row.
    expect(f.groups[0]!.table.size).toBe(2);
    const g = firstShots(s, 12);
    expect(g.groups.map((x) => x.shots)).toEqual([10, 2]);
    expect(firstShots(s, 100).groups.map((x) => x.shots)).toEqual([10, 7]);
  });
});

describe('randomShots', () => {
  it('randomShots gives nested, seeded subsamples whose sizes follow the fractions', async () => {
    const s = await twoDumps();
    const big = { ...s, groups: s.groups.map((g) => ({ ...g, table: g.table })) };
    // Scale the counts up so the binomial fractions are measurable.
    for (const g of big.groups) for (let i = 0; i < g.table.size; i++) g.table.counts[i]! *= 1000;
    const total = big.groups.reduce((n, g) => n + g.table.counts.subarray(0, g.table.size).reduce((a, b) => a + b, 0), 0);
    const fr = [0.1, 0.5, 1];
    const subsets = randomShots(big, fr, 7);
    const again = randomShots(big, fr, 7);
    expect(JSON.stringify(again.map((x) => x.groups.map((g) => g.shots)))).toBe(JSON.stringify(subsets.map((x) => x.groups.map((g) => g.shots))));
    const sizes = subsets.map((x) => x.groups.reduce((n, g) => n + g.shots, 0));
    // Binomial thinning: mean f·N, standard deviation √(N f (1−f)) ≈ 38 at N = 17000 (common practice).
    expect(Math.abs(sizes[0]! - 0.1 * total)).toBeLessThan(200);
    expect(Math.abs(sizes[1]! - 0.5 * total)).toBeLessThan(400);
    expect(sizes[2]).toBe(total);
    // Nested: every count at a smaller fraction is at most the count at a larger one.
    for (let j = 1; j < fr.length; j++) {
      for (let gi = 0; gi < subsets[j - 1]!.groups.length; gi++) {
        const small = subsets[j - 1]!.groups[gi]!.table;
        const large = subsets[j]!.groups.find((g) => g.file === subsets[j - 1]!.groups[gi]!.file)!.table;
        for (let i = 0; i < small.size; i++) expect(small.counts[i]!).toBeLessThanOrEqual(large.counts[large.indexOf(small.states, i)]!);
      }
    }
  });
});
