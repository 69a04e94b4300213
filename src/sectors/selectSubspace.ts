import { BitspanError } from '../errors.js';
import { ConfigTable } from '../bits/configTable.js';
import { makeBasis, sortOrder, type Basis } from '../bits/basis.js';
import { reverseQubits } from '../bits/packed.js';
import type { SampleSet } from '../io/readSamples.js';
import { compileSector, describeSector, sectorViolation, type Sector } from './sector.js';

/** Distinct configurations and shots removed by one filter. */
export interface DropCount {
  configs: number;
  shots: number;
}

/** What each filter removed, in the order they apply. */
export interface Dropped {
  weight: DropCount;
  parity: DropCount;
  minCount: DropCount;
  maxDim: DropCount;
}

/** Shot accounting for one dump or for all of them. */
export interface SampleAccount {
  shots: number;
  distinct: number;
  kept: number;
  keptShots: number;
  dropped: Dropped;
}

export interface GroupAccount extends SampleAccount {
  file: string;
  rows: number;
  /** Kept configurations not present in any earlier group. */
  newKept: number;
}

export interface SubspaceReport extends SampleAccount {
  groups: GroupAccount[];
}

export interface SelectOptions {
  sector: Sector;
  /** Keep configurations whose total count over all groups is at least this. */
  minCount?: number;
  /** Keep at most this many, the most frequent first (ties: smaller bitstring first). */
  maxDim?: number;
  /** Place basis arrays on SharedArrayBuffers for worker threads. */
  shared?: boolean;
}

const REASON_KEPT = 0;
const REASON_WEIGHT = 1;
const REASON_PARITY = 2;
const REASON_MIN_COUNT = 3;
const REASON_MAX_DIM = 4;

const emptyDropped = (): Dropped => ({
  weight: { configs: 0, shots: 0 },
  parity: { configs: 0, shots: 0 },
  minCount: { configs: 0, shots: 0 },
  maxDim: { configs: 0, shots: 0 },
});

function tally(d: Dropped, reason: number, shots: number): void {
  const key = reason === REASON_WEIGHT ? 'weight' : reason === REASON_PARITY ? 'parity' : reason === REASON_MIN_COUNT ? 'minCount' : 'maxDim';
  d[key].configs++;
  d[key].shots += shots;
}

/**
 * Merge the dumps, apply the sector, minimum-count and size filters, and return the sorted basis
 * with a full account of what happened to the shots, per group and in total. Throws
 * `empty-subspace` (with what each filter dropped) when nothing survives.
 */
export function selectSubspace(samples: SampleSet, opts: SelectOptions): { basis: Basis; report: SubspaceReport } {
  const { qubits, nWords } = samples;
  const sector = compileSector(opts.sector, qubits, nWords);
  // One dump needs no merge; several are merged once, remembering where each entry went.
  const single = samples.groups.length === 1;
  const merged = single ? samples.groups[0]!.table : new ConfigTable(nWords, samples.groups.reduce((n, g) => n + g.table.size, 0));
  const whereMerged: Int32Array[] | undefined = single
    ? undefined
    : samples.groups.map((g) => {
        const at = new Int32Array(g.table.size);
        merged.addMany(g.table.states, g.table.counts, g.table.size, at);
        return at;
      });

  const n = merged.size;
  const counts = merged.counts;
  const reason = new Uint8Array(n);
  let kept = new Int32Array(n);
  let keptCount = 0;
  for (let i = 0; i < n; i++) {
    const v = sectorViolation(sector, merged.states, i * nWords);
    if (v >= 0) reason[i] = v === sector.count ? REASON_PARITY : REASON_WEIGHT;
    else if (opts.minCount !== undefined && counts[i]! < opts.minCount) reason[i] = REASON_MIN_COUNT;
    else kept[keptCount++] = i;
  }
  if (opts.maxDim !== undefined && keptCount > opts.maxDim) {
    // Ascending configuration order (radix sort), then a stable sort by count: ties keep the smaller bitstring first.
    const byFrequency = Array.from(sortOrder(merged.states, keptCount, nWords, kept));
    byFrequency.sort((a, b) => counts[b]! - counts[a]!);
    kept = Int32Array.from(byFrequency.slice(0, opts.maxDim));
    keptCount = opts.maxDim;
    for (const i of byFrequency.slice(opts.maxDim)) reason[i] = REASON_MAX_DIM;
  }

  const total: SubspaceReport = { shots: 0, distinct: n, kept: keptCount, keptShots: 0, dropped: emptyDropped(), groups: [] };
  for (let i = 0; i < n; i++) {
    const c = counts[i]!;
    total.shots += c;
    if (reason[i] === REASON_KEPT) total.keptShots += c;
    else tally(total.dropped, reason[i]!, c);
  }
  const seenBefore = new Uint8Array(n);
  samples.groups.forEach((g, gi) => {
    const acc: GroupAccount = { file: g.file, rows: g.rows, shots: g.shots, distinct: g.table.size, kept: 0, keptShots: 0, newKept: 0, dropped: emptyDropped() };
    const where = whereMerged?.[gi];
    for (let j = 0; j < g.table.size; j++) {
      const i = where ? where[j]! : j;
      const c = g.table.counts[j]!;
      if (reason[i] === REASON_KEPT) {
        acc.kept++;
        acc.keptShots += c;
        if (!seenBefore[i]) acc.newKept++;
      } else tally(acc.dropped, reason[i]!, c);
      seenBefore[i] = 1;
    }
    total.groups.push(acc);
  });

  if (keptCount === 0) throw emptySubspaceError(samples, opts, total, merged, sector.count > 0);
  return { basis: makeBasis(qubits, nWords, merged.states, keptCount, counts, opts.shared, kept), report: total };
}

function emptySubspaceError(samples: SampleSet, opts: SelectOptions, total: SubspaceReport, merged: ConfigTable, hasWeights: boolean): BitspanError {
  const d = total.dropped;
  const parts: string[] = [];
  if (d.weight.configs) parts.push(`weight dropped ${d.weight.configs}`);
  if (d.parity.configs) parts.push(`parity dropped ${d.parity.configs}`);
  if (d.minCount.configs) parts.push(`min-count dropped ${d.minCount.configs}`);
  let hint = 'loosen the sector flags or check that they match the samples';
  // Ranged weights depend on which end is qubit 0: count what the other order would keep.
  const ranged = opts.sector.weights.some((w) => !(w.lo === 0 && (w.hi < 0 || w.hi === samples.qubits - 1)));
  if (hasWeights && ranged) {
    const sector = compileSector(opts.sector, samples.qubits, samples.nWords);
    const scratch = new Uint32Array(samples.nWords);
    const copy = new Uint32Array(samples.nWords);
    let wouldKeep = 0;
    for (let i = 0; i < merged.size; i++) {
      copy.set(merged.states.subarray(i * samples.nWords, (i + 1) * samples.nWords));
      reverseQubits(copy, 0, samples.qubits, samples.nWords, scratch);
      if (sectorViolation(sector, copy, 0) < 0) wouldKeep++;
    }
    if (wouldKeep > 0) hint = `with the other qubit order (--qubit0 left or right) the sector would keep ${wouldKeep} of ${merged.size} distinct configurations`;
  }
  return new BitspanError(
    'empty-subspace',
    `no configuration is left after filtering: ${total.distinct} distinct, ${parts.join(', ') || 'none dropped'} (sector: ${describeSector(opts.sector, samples.qubits)})`,
    hint,
  );
}
