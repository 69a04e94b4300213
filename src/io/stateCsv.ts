import { createReadStream } from 'node:fs';
import { parse } from 'csv-parse';
import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { formatBitstring } from '../bits/packed.js';
import { BitstringParser, type Qubit0 } from './bitstringParser.js';
import { checkReadable, MAX_LINE_CHARS } from './lines.js';

/** A state read from CSV: packed configurations and amplitudes. */
export interface SavedState {
  qubits: number;
  nWords: number;
  count: number;
  states: Uint32Array;
  re: Float64Array;
  im: Float64Array;
}

/**
 * The state `psi` over `basis` as CSV `bitstring,re,im,probability`, most probable first (ties in
 * basis order), amplitudes at full double precision so the file restarts a solve exactly. The
 * `bitstring` column makes the file readable as a sample dump too.
 */
export function formatStateCsv(basis: Basis, psi: Float64Array, complex: boolean, qubit0: Qubit0 = 'right'): string {
  const n = basis.dim;
  const prob = new Float64Array(n);
  for (let i = 0; i < n; i++) prob[i] = complex ? psi[2 * i]! ** 2 + psi[2 * i + 1]! ** 2 : psi[i]! ** 2;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => prob[b]! - prob[a]! || a - b);
  const lines = ['bitstring,re,im,probability'];
  for (const i of order) {
    const re = complex ? psi[2 * i]! : psi[i]!;
    const im = complex ? psi[2 * i + 1]! : 0;
    lines.push(`${formatBitstring(basis.states, i * basis.nWords, basis.qubits, qubit0)},${re},${im},${prob[i]}`);
  }
  return lines.join('\n') + '\n';
}

/** Read a state CSV written by `formatStateCsv` (header with `bitstring`, `re`, optional `im`). */
export async function readStateCsv(file: string, opts: { qubits?: number; qubit0?: Qubit0 } = {}): Promise<SavedState> {
  await checkReadable(file, 'state');
  const parser = new BitstringParser({ qubits: opts.qubits, qubit0: opts.qubit0 });
  const csv = createReadStream(file).pipe(parse({ bom: true, info: true, skip_empty_lines: true, trim: true, max_record_size: MAX_LINE_CHARS }));
  let cols: { bit: number; re: number; im: number } | undefined;
  let cap = 1024;
  let states = new Uint32Array(0);
  let re = new Float64Array(cap);
  let im = new Float64Array(cap);
  let count = 0;
  try {
    for await (const rec of csv as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
      const line = rec.info.lines;
      if (!cols) {
        const names = rec.record.map((c) => c.trim().toLowerCase());
        cols = { bit: names.indexOf('bitstring'), re: names.indexOf('re'), im: names.indexOf('im') };
        if (cols.bit < 0 || cols.re < 0) {
          throw new BitspanError('bad-state', "state header needs 'bitstring' and 're' columns", 'give a file written by --save-state', { file, line });
        }
        continue;
      }
      const words = parser.parse(rec.record[cols.bit] ?? '', file, line);
      if (count === 0 || states.length < cap * parser.nWords) {
        const grown = new Uint32Array(cap * parser.nWords);
        grown.set(states);
        states = grown;
      }
      const a = Number(rec.record[cols.re]);
      const b = cols.im >= 0 ? Number(rec.record[cols.im]) : 0;
      if (!Number.isFinite(a) || !Number.isFinite(b)) {
        throw new BitspanError('bad-state', 'amplitude is not a finite number', 'amplitudes are decimal numbers in the re and im columns', { file, line });
      }
      states.set(words, count * parser.nWords);
      re[count] = a;
      im[count] = b;
      count++;
      if (count === cap) {
        cap *= 2;
        const r2 = new Float64Array(cap);
        r2.set(re);
        re = r2;
        const i2 = new Float64Array(cap);
        i2.set(im);
        im = i2;
      }
    }
  } catch (e) {
    if (e instanceof BitspanError) throw e;
    const err = e as { code?: string; message?: string; lines?: number };
    if (err && typeof err.code === 'string' && err.code.startsWith('CSV_')) {
      throw new BitspanError('bad-state', `malformed CSV: ${(err.message ?? err.code).replace(/\s+/g, ' ')}`, 'give a file written by --save-state', { file, line: err.lines });
    }
    throw e;
  }
  if (count === 0) throw new BitspanError('file-empty', 'state file holds no amplitudes', 'give a file written by --save-state', { file });
  return { qubits: parser.qubits, nWords: parser.nWords, count, states: states.slice(0, count * parser.nWords), re: re.slice(0, count), im: im.slice(0, count) };
}
