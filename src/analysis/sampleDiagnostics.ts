import { ConfigTable } from '../bits/configTable.js';
import type { SampleSet } from '../io/readSamples.js';

/** Sampling diagnostics of one dump, relative to the dumps before it. */
export interface GroupDiagnostics {
  file: string;
  shots: number;
  distinct: number;
  /** Configurations seen exactly once in this dump. */
  singletons: number;
  /** Fraction of shots that repeat a configuration already drawn in this dump: 1 − distinct/shots. */
  duplicateRate: number;
  /** Good–Turing estimate of the probability mass not yet seen: singletons ÷ shots. */
  goodTuring: number;
  /** Configurations of this dump absent from every earlier dump. */
  newConfigs: number;
  /** Shots of this dump on those new configurations, and their fraction of its shots. */
  newWeight: number;
  newWeightFraction: number;
  /** Distinct configurations of this dump and all earlier ones together. */
  cumulativeDistinct: number;
  /** Good–Turing unseen mass of this dump and all earlier ones pooled. */
  cumulativeGoodTuring: number;
}

/** Per-dump novelty, duplicates and unseen mass, plus the pooled totals. */
export interface SampleDiagnostics {
  groups: GroupDiagnostics[];
  total: { shots: number; distinct: number; singletons: number; duplicateRate: number; goodTuring: number };
}

/**
 * Novelty, duplicate rate and Good–Turing unseen mass of each dump (Good, Biometrika 40 (1953)
 * 237: the probability that the next shot is a configuration never seen is about n₁/N, with n₁ the
 * configurations seen exactly once among N shots), over all shots as read (before any filter).
 */
export function sampleDiagnostics(samples: SampleSet): SampleDiagnostics {
  const nWords = samples.nWords;
  const pooled = new ConfigTable(nWords, samples.groups.reduce((n, g) => n + g.table.size, 0));
  const groups: GroupDiagnostics[] = [];
  let shots = 0;
  let pooledSingletons = 0;
  for (const g of samples.groups) {
    const t = g.table;
    let singletons = 0;
    let newConfigs = 0;
    let newWeight = 0;
    for (let i = 0; i < t.size; i++) {
      const c = t.counts[i]!;
      if (c === 1) singletons++;
      const before = pooled.size;
      const at = pooled.add(t.states, i * nWords, c);
      const now = pooled.counts[at]!;
      if (pooled.size > before) {
        newConfigs++;
        newWeight += c;
        if (now === 1) pooledSingletons++;
      } else {
        // The pooled count moved from now − c to now: a singleton may appear or disappear.
        if (now - c === 1) pooledSingletons--;
        if (now === 1) pooledSingletons++;
      }
    }
    shots += g.shots;
    groups.push({
      file: g.file,
      shots: g.shots,
      distinct: t.size,
      singletons,
      duplicateRate: g.shots > 0 ? 1 - t.size / g.shots : 0,
      goodTuring: g.shots > 0 ? singletons / g.shots : 0,
      newConfigs,
      newWeight,
      newWeightFraction: g.shots > 0 ? newWeight / g.shots : 0,
      cumulativeDistinct: pooled.size,
      cumulativeGoodTuring: shots > 0 ? pooledSingletons / shots : 0,
    });
  }
  return {
    groups,
    total: {
      shots,
      distinct: pooled.size,
      singletons: pooledSingletons,
      duplicateRate: shots > 0 ? 1 - pooled.size / shots : 0,
      goodTuring: shots > 0 ? pooledSingletons / shots : 0,
    },
  };
}
