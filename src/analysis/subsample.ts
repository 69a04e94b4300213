import { BitspanError } from '../errors.js';
import { ConfigTable } from '../bits/configTable.js';
import type { SampleGroup, SampleSet } from '../io/readSamples.js';
import { seededUniform } from '../util/random.js';

/**
 * The first `shots` shots of a sample set: rows in file order, dumps in the order given; a row of
 * count c is c shots and the last row taken may be cut. Needs row order (`readSamples` with
 * `keepOrder`). Later budgets hold earlier ones, so this is a cumulative axis.
 */
export function firstShots(samples: SampleSet, shots: number): SampleSet {
  const nWords = samples.nWords;
  const groups: SampleGroup[] = [];
  let left = shots;
  for (const g of samples.groups) {
    if (left <= 0) break;
    if (!g.order) throw new BitspanError('internal', 'first-shots subsampling needs the row order', 'read the samples with keepOrder');
    const table = new ConfigTable(nWords, 64);
    let taken = 0;
    let rows = 0;
    for (let r = 0; r < g.order.length && left > 0; r++) {
      const c = Math.min(g.order.count[r]!, left);
      table.add(g.table.states, g.order.index[r]! * nWords, c);
      taken += c;
      left -= c;
      rows++;
    }
    if (table.size > 0) groups.push({ file: g.file, rows, shots: taken, table });
  }
  return { qubits: samples.qubits, nWords, groups };
}

/**
 * Nested random subsamples at the given fractions (ascending): every shot draws one seeded
 * uniform u and belongs to the subsample at fraction f when u < f (Bernoulli thinning), so the
 * subsample at a smaller fraction is contained in every larger one. Counts above 10⁴ per
 * configuration use the normal approximation to the binomial increments. Empty dumps are dropped.
 */
export function randomShots(samples: SampleSet, fractions: readonly number[], seed: number): SampleSet[] {
  const nWords = samples.nWords;
  const m = fractions.length;
  for (let j = 1; j < m; j++) if (!(fractions[j]! >= fractions[j - 1]!)) throw new BitspanError('bad-argument', 'subsample fractions must be ascending', 'e.g. --values 0.25,0.5,1');
  const rng = seededUniform(seed);
  const out: SampleSet[] = fractions.map(() => ({ qubits: samples.qubits, nWords, groups: [] }));
  const kept = new Float64Array(m);
  for (const g of samples.groups) {
    const tables = fractions.map(() => new ConfigTable(nWords, 64));
    const shots = new Float64Array(m);
    for (let i = 0; i < g.table.size; i++) {
      thin(g.table.counts[i]!, fractions, rng, kept);
      for (let j = 0; j < m; j++) {
        if (kept[j]! > 0) {
          tables[j]!.add(g.table.states, i * nWords, kept[j]!);
          shots[j]! += kept[j]!;
        }
      }
    }
    for (let j = 0; j < m; j++) if (tables[j]!.size > 0) out[j]!.groups.push({ file: g.file, rows: tables[j]!.size, shots: shots[j]!, table: tables[j]! });
  }
  return out;
}

/** Cumulative kept counts of one configuration of count c at each fraction (nested thinning). */
function thin(c: number, fractions: readonly number[], rng: { next(): number }, kept: Float64Array): void {
  const m = fractions.length;
  kept.fill(0);
  const whole = Math.floor(c);
  const frac = c - whole;
  if (whole <= 10000) {
    for (let s = 0; s < whole; s++) {
      const u = rng.next();
      for (let j = 0; j < m; j++) if (u < fractions[j]!) kept[j]!++;
    }
  } else {
    // Binomial increments between successive fractions, normal approximation (mean np, var np(1−p)).
    let left = whole;
    let prevF = 0;
    let acc = 0;
    for (let j = 0; j < m; j++) {
      const f = Math.min(1, fractions[j]!);
      const p = prevF >= 1 ? 0 : (f - prevF) / (1 - prevF);
      const u1 = Math.max(rng.next(), 1e-300);
      const u2 = rng.next();
      const gauss = Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
      const draw = Math.min(left, Math.max(0, Math.round(left * p + gauss * Math.sqrt(left * p * (1 - p)))));
      acc += draw;
      left -= draw;
      kept[j] = acc;
      prevF = f;
    }
  }
  // A fractional remainder (weighted dumps) is kept whole or not at all, like one more shot.
  if (frac > 0) {
    const u = rng.next();
    for (let j = 0; j < m; j++) if (u < fractions[j]!) kept[j]! += frac;
  }
}
