import { BitspanError } from '../errors.js';
import { popcount32, rangeMask } from '../bits/packed.js';

/** Exactly `weight` ones among qubits lo..hi (inclusive). */
export interface WeightConstraint {
  lo: number;
  hi: number;
  weight: number;
}

/** A symmetry sector: Hamming-weight constraints on registers and an optional total parity. */
export interface Sector {
  weights: WeightConstraint[];
  parity?: 'even' | 'odd';
}

/** A sector compiled to masks for the hot path. */
export interface CompiledSector {
  nWords: number;
  count: number;
  masks: Uint32Array;
  targets: Int32Array;
  /** 0 even, 1 odd, −1 none. */
  parity: number;
}

/**
 * Parse a `--weight` value: `K` (whole register) or `A-B=K` (qubits A..B inclusive).
 * `qubits` resolves the whole-register form.
 */
export function parseWeightSpec(spec: string): WeightConstraint & { whole: boolean } {
  const whole = /^\s*(\d+)\s*$/.exec(spec);
  if (whole) return { lo: 0, hi: -1, weight: Number(whole[1]), whole: true };
  const ranged = /^\s*(\d+)\s*-\s*(\d+)\s*=\s*(\d+)\s*$/.exec(spec);
  if (!ranged) {
    throw new BitspanError('bad-argument', `--weight '${spec}' is not K or A-B=K`, 'e.g. --weight 8, or --weight 0-7=4 --weight 8-15=4 for two registers');
  }
  const lo = Number(ranged[1]);
  const hi = Number(ranged[2]);
  if (hi < lo) throw new BitspanError('bad-argument', `--weight '${spec}': range ${lo}-${hi} is empty`, 'write the lower qubit first');
  return { lo, hi, weight: Number(ranged[3]), whole: false };
}

/** Check a sector against the register size and compile it to masks. */
export function compileSector(sector: Sector, qubits: number, nWords: number): CompiledSector {
  const masks = new Uint32Array(Math.max(1, sector.weights.length) * nWords);
  const targets = new Int32Array(sector.weights.length);
  sector.weights.forEach((w, i) => {
    const hi = w.hi < 0 ? qubits - 1 : w.hi;
    if (hi >= qubits) {
      throw new BitspanError('bad-argument', `--weight ${w.lo}-${w.hi}=${w.weight} names qubit ${hi} but the samples have ${qubits} qubits`, 'qubit indices are 0-based');
    }
    if (w.weight > hi - w.lo + 1) {
      throw new BitspanError('bad-argument', `--weight asks for ${w.weight} ones among ${hi - w.lo + 1} qubits`, 'the weight cannot exceed the register size');
    }
    masks.set(rangeMask(w.lo, hi, nWords), i * nWords);
    targets[i] = w.weight;
  });
  return { nWords, count: sector.weights.length, masks, targets, parity: sector.parity === undefined ? -1 : sector.parity === 'even' ? 0 : 1 };
}

/** Which constraint a configuration breaks: −1 none, `count` for parity, else the constraint index. */
export function sectorViolation(s: CompiledSector, words: Uint32Array, offset: number): number {
  const nWords = s.nWords;
  const masks = s.masks;
  for (let c = 0; c < s.count; c++) {
    let w = 0;
    for (let k = 0; k < nWords; k++) w += popcount32(words[offset + k]! & masks[c * nWords + k]!);
    if (w !== s.targets[c]) return c;
  }
  if (s.parity >= 0) {
    let p = 0;
    for (let k = 0; k < nWords; k++) p ^= popcount32(words[offset + k]!) & 1;
    if (p !== s.parity) return s.count;
  }
  return -1;
}

/** Whether a configuration lies in the sector. */
export function inSector(s: CompiledSector, words: Uint32Array, offset: number): boolean {
  return sectorViolation(s, words, offset) < 0;
}

/** Describe a sector for reports, e.g. `weight 8` or `weight[0-7]=4, weight[8-15]=4, parity even`. */
export function describeSector(sector: Sector, qubits: number): string {
  const parts = sector.weights.map((w) => (w.lo === 0 && (w.hi < 0 || w.hi === qubits - 1) ? `weight ${w.weight}` : `weight[${w.lo}-${w.hi}]=${w.weight}`));
  if (sector.parity) parts.push(`parity ${sector.parity}`);
  return parts.length ? parts.join(', ') : 'none';
}
