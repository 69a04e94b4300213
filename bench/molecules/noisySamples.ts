/**
 * Synthetic hardware-like dumps, a scenario of our own: shots drawn from |ψ|² of a known state,
 * then every qubit flipped independently with probability `flip` (readout and gate noise that
 * breaks particle number), as `bitstring,count` CSV.
 */
import type { Basis } from '../../src/bits/basis.js';
import { ConfigTable } from '../../src/bits/configTable.js';
import { formatBitstring } from '../../src/bits/packed.js';
import { seededUniform } from '../../src/util/random.js';

/** Draw `shots` configurations from |v|² over `basis` and flip each qubit with probability `flip`. */
export function noisySamples(basis: Basis, v: Float64Array, shots: number, flip: number, seed: number): ConfigTable {
  const rng = seededUniform(seed);
  const cumulative = new Float64Array(basis.dim);
  let acc = 0;
  for (let i = 0; i < basis.dim; i++) cumulative[i] = acc += v[i]! ** 2;
  const table = new ConfigTable(basis.nWords);
  const words = new Uint32Array(basis.nWords);
  for (let s = 0; s < shots; s++) {
    const u = rng.next() * acc;
    let lo = 0;
    let hi = basis.dim - 1;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (cumulative[mid]! > u) hi = mid;
      else lo = mid + 1;
    }
    words.set(basis.states.subarray(lo * basis.nWords, lo * basis.nWords + basis.nWords));
    for (let q = 0; q < basis.qubits; q++) if (rng.next() < flip) words[q >>> 5]! ^= 1 << (q & 31);
    table.add(words, 0, 1);
  }
  return table;
}

/** CSV text of a table, one row per distinct configuration. */
export function samplesCsv(table: ConfigTable, qubits: number): string {
  const rows = ['bitstring,count'];
  for (let i = 0; i < table.size; i++) rows.push(`${formatBitstring(table.states, i * table.nWords, qubits)},${table.counts[i]}`);
  return rows.join('\n') + '\n';
}
