import { describe, expect, it } from 'vitest';
import { ConfigTable } from '../../src/bits/configTable.js';
import type { SampleSet } from '../../src/io/readSamples.js';
import { sampleDiagnostics } from '../../src/analysis/sampleDiagnostics.js';
import { seededUniform } from '../../src/util/random.js';
import { closeTo } from '../helpers.js';

/** Draw `shots` samples from p over configurations 0..p.length−1, returning a dump as a ConfigTable. */
function draw(p: number[], shots: number, seed: number): { table: ConfigTable; seen: Set<number> } {
  const rng = seededUniform(seed);
  const cdf: number[] = [];
  p.reduce((acc, x, i) => (cdf[i] = acc + x), 0);
  const table = new ConfigTable(1);
  const seen = new Set<number>();
  const w = new Uint32Array(1);
  for (let s = 0; s < shots; s++) {
    const u = rng.next() * cdf[cdf.length - 1]!;
    let i = 0;
    while (cdf[i]! < u) i++;
    w[0] = i;
    table.add(w, 0, 1);
    seen.add(i);
  }
  return { table, seen };
}

describe('sampleDiagnostics', () => {
  it('sampleDiagnostics: Good–Turing matches a direct count of singletons on a known distribution', () => {
    // Known distribution: Zipf p_i ∝ 1/(i+1) over 5000 configurations. The Good–Turing estimate
    // n1/N (Good, Biometrika 40 (1953) 237) is checked (a) against a direct count of configurations
    // seen once and (b) against the true unseen mass Σ_{i unseen} p_i, which it estimates with a
    // bias of order 1/N (Robbins 1968): over 20 seeded dumps the mean error is a few percent.
    const K = 5000;
    const raw = Array.from({ length: K }, (_, i) => 1 / (i + 1));
    const Z = raw.reduce((a, b) => a + b, 0);
    const p = raw.map((x) => x / Z);
    let meanTrue = 0;
    let meanGT = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const shots = 2000;
      const { table, seen } = draw(p, shots, seed);
      const samples: SampleSet = { qubits: 13, nWords: 1, groups: [{ file: `g${seed}`, rows: shots, shots, table }] };
      const d = sampleDiagnostics(samples);
      let singletons = 0;
      for (let i = 0; i < table.size; i++) if (table.counts[i] === 1) singletons++;
      expect(d.groups[0]!.singletons).toBe(singletons);
      closeTo(d.groups[0]!.goodTuring, singletons / shots, 1e-15, 'n1 / N');
      closeTo(d.groups[0]!.duplicateRate, 1 - table.size / shots, 1e-15, 'duplicate rate');
      let unseen = 0;
      for (let i = 0; i < K; i++) if (!seen.has(i)) unseen += p[i]!;
      meanTrue += unseen / 20;
      meanGT += d.groups[0]!.goodTuring / 20;
    }
    expect(Math.abs(meanGT - meanTrue) / meanTrue).toBeLessThan(0.05);
  });

  it('sampleDiagnostics counts novelty against earlier dumps and pools singletons across dumps', () => {
    const t = (entries: Array<[number, number]>): ConfigTable => {
      const c = new ConfigTable(1);
      for (const [k, n] of entries) c.add(Uint32Array.of(k), 0, n);
      return c;
    };
    const samples: SampleSet = {
      qubits: 4,
      nWords: 1,
      groups: [
        { file: 'a', rows: 3, shots: 6, table: t([[1, 3], [2, 1], [3, 2]]) },
        { file: 'b', rows: 3, shots: 5, table: t([[2, 1], [4, 1], [5, 3]]) },
      ],
    };
    const d = sampleDiagnostics(samples);
    expect(d.groups[1]!.newConfigs).toBe(2); // 4 and 5
    expect(d.groups[1]!.newWeight).toBe(4);
    closeTo(d.groups[1]!.newWeightFraction, 0.8, 1e-15, 'new weight fraction');
    expect(d.groups[1]!.cumulativeDistinct).toBe(5);
    // Pooled counts: 1→3, 2→2, 3→2, 4→1, 5→3: one singleton of 11 shots.
    expect(d.total.singletons).toBe(1);
    closeTo(d.total.goodTuring, 1 / 11, 1e-15, 'pooled Good–Turing');
    closeTo(d.groups[1]!.cumulativeGoodTuring, 1 / 11, 1e-15, 'cumulative Good–Turing');
  });
});
