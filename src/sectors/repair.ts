import { ConfigTable } from '../bits/configTable.js';
import { hashConfig } from '../bits/hashIndex.js';
import type { SampleGroup, SampleSet } from '../io/readSamples.js';
import { sectorViolation, type CompiledSector } from './sector.js';

/** What one repair pass did to the shots. */
export interface RepairAccount {
  /** Distinct configurations and shots outside the sector before repair. */
  offSector: { configs: number; shots: number };
  /** Off-sector configurations and shots moved into the sector. */
  recovered: { configs: number; shots: number };
  /** Off-sector configurations repair cannot fix (a parity constraint, or overlapping registers). */
  unrecoverable: { configs: number; shots: number };
}

/**
 * Move one configuration into the sector by flipping the fewest bits of each register whose
 * Hamming weight is wrong: with too many ones, clear the set bits of lowest occupation; with too
 * few, set the clear bits of highest occupation. Equal occupations are ordered by a pseudo-random
 * key from the configuration's hash and `seed`, so the same configuration always repairs the same
 * way. Works in place on `words[offset..]`; returns whether the result lies in the sector.
 */
export function repairConfiguration(sector: CompiledSector, words: Uint32Array, offset: number, occupation: Float64Array, seed: number): boolean {
  const nWords = sector.nWords;
  const h = hashConfig(words, offset, nWords) ^ Math.imul(seed | 0, 0x2c1b3c6d);
  for (let c = 0; c < sector.count; c++) {
    const maskAt = c * nWords;
    let w = 0;
    for (let k = 0; k < nWords; k++) {
      let x = (words[offset + k]! & sector.masks[maskAt + k]!) >>> 0;
      while (x) {
        w++;
        x &= x - 1;
      }
    }
    const target = sector.targets[c]!;
    const tooMany = w > target;
    for (let flips = Math.abs(w - target); flips > 0; flips--) {
      // One scan per flip: the register's best candidate among bits currently in the state to change.
      let best = -1;
      let bestOcc = 0;
      let bestTie = 0;
      for (let k = 0; k < nWords; k++) {
        const m = sector.masks[maskAt + k]!;
        let cand = (tooMany ? words[offset + k]! & m : ~words[offset + k]! & m) >>> 0;
        while (cand) {
          const low = cand & -cand;
          const q = k * 32 + 31 - Math.clz32(low);
          cand = (cand ^ low) >>> 0;
          const o = occupation[q] ?? 0;
          const better = best < 0 || (tooMany ? o < bestOcc : o > bestOcc);
          if (better || o === bestOcc) {
            const tie = tieKey(h, q);
            if (better || tie < bestTie) {
              best = q;
              bestOcc = o;
              bestTie = tie;
            }
          }
        }
      }
      if (best < 0) break;
      words[offset + (best >>> 5)]! ^= 1 << (best & 31);
    }
  }
  return sectorViolation(sector, words, offset) < 0;
}

/** A well-mixed 32-bit key for (configuration hash, qubit). */
function tieKey(h: number, q: number): number {
  let x = (h + Math.imul(q + 1, 0x9e3779b9)) | 0;
  x ^= x >>> 16;
  x = Math.imul(x, 0x7feb352d);
  x ^= x >>> 15;
  x = Math.imul(x, 0x846ca68b);
  x ^= x >>> 16;
  return x >>> 0;
}

/**
 * Repair every off-sector configuration of every dump (see `repairConfiguration`), keeping
 * in-sector ones untouched; repaired configurations merge with equal ones and add their counts.
 * Configurations that cannot be repaired are kept as they are, for the sector filter to drop.
 */
export function repairSamples(samples: SampleSet, sector: CompiledSector, occupation: Float64Array, seed: number): { samples: SampleSet; account: RepairAccount } {
  const nWords = samples.nWords;
  const account: RepairAccount = { offSector: { configs: 0, shots: 0 }, recovered: { configs: 0, shots: 0 }, unrecoverable: { configs: 0, shots: 0 } };
  // Count distinct configurations over all groups once, as the sector filter does.
  const seen = new ConfigTable(nWords);
  const scratch = new Uint32Array(nWords);
  const groups: SampleGroup[] = samples.groups.map((g) => {
    const table = new ConfigTable(nWords, g.table.size);
    for (let i = 0; i < g.table.size; i++) {
      const count = g.table.counts[i]!;
      const off = i * nWords;
      if (sectorViolation(sector, g.table.states, off) < 0) {
        table.add(g.table.states, off, count);
        continue;
      }
      const first = seen.indexOf(g.table.states, off) < 0;
      if (first) seen.add(g.table.states, off, count);
      for (let k = 0; k < nWords; k++) scratch[k] = g.table.states[off + k]!;
      const ok = repairConfiguration(sector, scratch, 0, occupation, seed);
      const into = ok ? account.recovered : account.unrecoverable;
      account.offSector.shots += count;
      into.shots += count;
      if (first) {
        account.offSector.configs++;
        into.configs++;
      }
      table.add(ok ? scratch : g.table.states, ok ? 0 : off, count);
    }
    return { file: g.file, rows: g.rows, shots: g.shots, table };
  });
  return { samples: { qubits: samples.qubits, nWords, groups }, account };
}
