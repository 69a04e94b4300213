import { BitspanError } from '../errors.js';
import { packBitstring, wordsFor } from '../bits/packed.js';

/** Which end of a written bitstring is qubit 0. */
export type Qubit0 = 'right' | 'left';

/** Upper bound on the register size accepted from a dump (guards absurd inputs). */
export const MAX_QUBITS = 8192;

/**
 * Turns bitstring cells into packed words, learning the register size from the first one (or
 * taking it from `qubits`) and holding every later one to it. Hexadecimal (`0x1f3`) is accepted
 * only when the size is given, and means the N-character binary string it spells.
 */
export class BitstringParser {
  qubits: number;
  nWords: number;
  readonly qubit0: Qubit0;
  readonly fixed: boolean;
  /** Scratch words holding the last parsed configuration. */
  words: Uint32Array;
  private firstPlace = '';

  constructor(opts: { qubits?: number; qubit0?: Qubit0 } = {}) {
    this.qubits = opts.qubits ?? 0;
    this.fixed = opts.qubits !== undefined;
    this.qubit0 = opts.qubit0 ?? 'right';
    this.nWords = wordsFor(Math.max(1, this.qubits));
    this.words = new Uint32Array(this.nWords);
  }

  /** Parse `raw` (already trimmed) into `this.words`; throws a located BitspanError. */
  parse(raw: string, file: string, line: number): Uint32Array {
    if (raw.length === 0) {
      throw new BitspanError('bad-bitstring', 'empty bitstring', 'every row needs a bitstring of 0s and 1s', { file, line });
    }
    if (raw.length > 1 && raw.charCodeAt(0) === 48 && (raw.charCodeAt(1) | 32) === 120) return this.parseHex(raw, file, line);
    const n = raw.length;
    if (this.qubits === 0) {
      if (n > MAX_QUBITS) {
        throw new BitspanError('bad-bitstring', `bitstring of ${n} characters is longer than the ${MAX_QUBITS}-qubit limit`, 'check that the column holds bitstrings', { file, line });
      }
      this.setQubits(n);
      this.firstPlace = `${file}:${line}`;
    } else if (n !== this.qubits) {
      const since = this.fixed ? `--qubits ${this.qubits}` : `${this.firstPlace}`;
      throw new BitspanError(
        'inconsistent-length',
        `bitstring has ${n} characters but ${this.qubits} were expected (from ${since})`,
        'every bitstring in every dump must have the same number of qubits; pad with leading zeros',
        { file, line },
      );
    }
    const bad = packBitstring(raw, 0, n, this.words, 0, this.nWords, this.qubit0);
    if (bad >= 0) {
      throw new BitspanError(
        'bad-bitstring',
        `character '${printable(raw[bad]!)}' at position ${bad + 1} of the bitstring is not 0 or 1`,
        this.fixed ? 'bitstrings are 0/1 strings or 0x-prefixed hexadecimal' : 'bitstrings are 0/1 strings; for hexadecimal give --qubits N',
        { file, line },
      );
    }
    return this.words;
  }

  private setQubits(n: number): void {
    this.qubits = n;
    this.nWords = wordsFor(n);
    this.words = new Uint32Array(this.nWords);
  }

  private parseHex(raw: string, file: string, line: number): Uint32Array {
    if (!this.fixed) {
      throw new BitspanError('bad-bitstring', `hexadecimal bitstring '${clip(raw)}' needs the register size`, 'give --qubits N so hexadecimal samples can be expanded', { file, line });
    }
    const n = this.qubits;
    const w = this.words;
    w.fill(0);
    // Read the hex digits as an integer: bit b of the integer is character n-1-b of the binary string.
    let bit = 0;
    for (let i = raw.length - 1; i >= 2; i--) {
      const c = raw.charCodeAt(i);
      let v: number;
      if (c >= 48 && c <= 57) v = c - 48;
      else if ((c | 32) >= 97 && (c | 32) <= 102) v = (c | 32) - 87;
      else {
        throw new BitspanError('bad-bitstring', `character '${printable(raw[i]!)}' in hexadecimal bitstring '${clip(raw)}' is not a hex digit`, 'hexadecimal bitstrings look like 0x1f3', { file, line });
      }
      for (let j = 0; j < 4; j++, bit++) {
        if (!((v >>> j) & 1)) continue;
        if (bit >= n) {
          throw new BitspanError('bad-bitstring', `hexadecimal bitstring '${clip(raw)}' does not fit in ${n} qubits`, 'check --qubits', { file, line });
        }
        const q = this.qubit0 === 'right' ? bit : n - 1 - bit;
        w[q >>> 5]! |= 1 << (q & 31);
      }
    }
    if (raw.length === 2) {
      throw new BitspanError('bad-bitstring', `hexadecimal bitstring '${raw}' has no digits`, 'hexadecimal bitstrings look like 0x1f3', { file, line });
    }
    return w;
  }
}

function printable(c: string): string {
  const code = c.charCodeAt(0);
  return code < 32 || code === 127 ? `\\x${code.toString(16).padStart(2, '0')}` : c;
}

function clip(s: string): string {
  return s.length > 40 ? `${s.slice(0, 37)}...` : s;
}
