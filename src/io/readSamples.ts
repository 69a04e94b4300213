import { extname } from 'node:path';
import { BitspanError } from '../errors.js';
import { ConfigTable } from '../bits/configTable.js';
import { BitstringParser, type Qubit0 } from './bitstringParser.js';
import { checkReadable } from './lines.js';
import { readSamplesCsv } from './samplesCsv.js';
import { NeedsFullCsv, readSamplesCsvFast } from './samplesCsvFast.js';
import { readSamplesJson } from './samplesJson.js';
import { readSamplesText } from './samplesText.js';

/** Sample file formats. `auto` chooses by extension: .csv, .json, anything else plain text. */
export type SampleFormat = 'auto' | 'csv' | 'json' | 'text';

/** One dump (typically one evolution time), deduplicated. */
export interface SampleGroup {
  file: string;
  /** Data rows read. */
  rows: number;
  /** Total shots (sum of counts). */
  shots: number;
  /** Distinct configurations of this group with their summed counts. */
  table: ConfigTable;
  /** Rows in file order (with `keepOrder`): the table index and count of each row. */
  order?: RowOrder;
}

/** The sequence of rows of one dump as indices into its table, for first-N-shots subsampling. */
export interface RowOrder {
  length: number;
  index: Int32Array;
  count: Float64Array;
}

/** Every dump of one run, sharing one register size. */
export interface SampleSet {
  qubits: number;
  nWords: number;
  groups: SampleGroup[];
}

export interface ReadSamplesOptions {
  /** Register size; required for hexadecimal bitstrings, otherwise learnt from the first row. */
  qubits?: number;
  qubit0?: Qubit0;
  format?: SampleFormat;
  /** Also record the order of rows (4 + 8 bytes a row), for taking the first N shots later. */
  keepOrder?: boolean;
}

/** Read and deduplicate one or more sample dumps, one group per file, streaming each file. */
export async function readSamples(files: string[], opts: ReadSamplesOptions = {}): Promise<SampleSet> {
  if (files.length === 0) throw new BitspanError('bad-argument', 'no sample files given', 'pass one or more dumps with --samples');
  const parser = new BitstringParser({ qubits: opts.qubits, qubit0: opts.qubit0 });
  const groups: SampleGroup[] = [];
  for (const file of files) {
    const bytes = await checkReadable(file, 'sample');
    let table: ConfigTable | undefined;
    let shots = 0;
    const order: RowOrder | undefined = opts.keepOrder ? { length: 0, index: new Int32Array(1024), count: new Float64Array(1024) } : undefined;
    // Size the table from the file once the row length is known, so it rarely rehashes.
    const tableFor = (): ConfigTable => new ConfigTable(parser.nWords, Math.min(1 << 24, Math.max(1 << 12, Math.ceil(bytes / (parser.qubits + 4)))));
    let batchAt: Int32Array | undefined;
    const sink = {
      add(words: Uint32Array, count: number, line: number): void {
        table ??= tableFor();
        let at: number;
        try {
          at = table.add(words, 0, count);
        } catch (e) {
          // The dedupe table doubles as it grows; refuse cleanly when the next doubling cannot be had.
          if (e instanceof RangeError) throw tooManyConfigs(table.size, parser.qubits, file);
          throw e;
        }
        shots += count;
        // Counts are non-negative, so a finite total keeps every per-configuration sum finite too.
        if (!Number.isFinite(shots)) {
          throw new BitspanError('bad-samples', 'counts add up beyond the double range (about 1.8e308)', 'check the count column', { file, line });
        }
        if (order) appendRow(order, at, count);
      },
      addMany(words: Uint32Array, counts: Float64Array, lines: Int32Array, n: number): void {
        table ??= tableFor();
        if (!batchAt || batchAt.length < n) batchAt = new Int32Array(n);
        const at = batchAt;
        // Rows up to the first whose count overflows the total are added, then that row is refused,
        // exactly as `add` row by row would.
        let total = shots;
        let last = n;
        for (let r = 0; r < n; r++) {
          total += counts[r]!;
          if (!Number.isFinite(total)) {
            last = r + 1;
            break;
          }
        }
        try {
          table.addMany(words, counts, last, at);
        } catch (e) {
          if (e instanceof RangeError) throw tooManyConfigs(table.size, parser.qubits, file);
          throw e;
        }
        if (last < n || !Number.isFinite(total)) {
          throw new BitspanError('bad-samples', 'counts add up beyond the double range (about 1.8e308)', 'check the count column', { file, line: lines[last - 1]! });
        }
        shots = total;
        if (order) for (let r = 0; r < n; r++) appendRow(order, at[r]!, counts[r]!);
      },
    };
    const format = resolveFormat(file, opts.format ?? 'auto');
    let rows: number;
    if (format === 'csv') {
      try {
        rows = await readSamplesCsvFast(file, parser, sink);
      } catch (e) {
        if (!(e instanceof NeedsFullCsv)) throw e;
        // Quoted fields: start this file again with the general CSV reader.
        table = undefined;
        shots = 0;
        if (order) order.length = 0;
        rows = await readSamplesCsv(file, parser, sink);
      }
    } else rows = format === 'json' ? await readSamplesJson(file, parser, sink) : await readSamplesText(file, parser, sink);
    if (rows === 0 || !table) {
      throw new BitspanError('file-empty', 'sample file holds no samples', 'give at least one bitstring row', { file });
    }
    // Later stages only read the entries; the slots (the larger part at low fill) can go.
    table.releaseIndex();
    groups.push(order ? { file, rows, shots, table, order } : { file, rows, shots, table });
  }
  return { qubits: parser.qubits, nWords: parser.nWords, groups };
}

function tooManyConfigs(size: number, qubits: number, file: string): BitspanError {
  return new BitspanError(
    'too-large',
    `cannot hold more than ${size} distinct ${qubits}-qubit configurations in memory`,
    'split the run into smaller sets of dumps, or drop rare configurations before reading',
    { file },
  );
}

function appendRow(o: RowOrder, index: number, count: number): void {
  if (o.length === o.index.length) {
    const i2 = new Int32Array(o.length * 2);
    i2.set(o.index);
    o.index = i2;
    const c2 = new Float64Array(o.length * 2);
    c2.set(o.count);
    o.count = c2;
  }
  o.index[o.length] = index;
  o.count[o.length] = count;
  o.length++;
}

function resolveFormat(file: string, format: SampleFormat): Exclude<SampleFormat, 'auto'> {
  if (format !== 'auto') return format;
  const ext = extname(file).toLowerCase();
  if (ext === '.csv') return 'csv';
  if (ext === '.json') return 'json';
  return 'text';
}
