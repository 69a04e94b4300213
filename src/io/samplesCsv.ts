import { createReadStream } from 'node:fs';
import { BitspanError } from '../errors.js';
import type { BitstringParser } from './bitstringParser.js';
import { MAX_LINE_CHARS, parseCount } from './lines.js';
import type { SampleSink } from './sampleSink.js';

/**
 * Stream a CSV dump whose header names a `bitstring` column and optionally a `count` column
 * (other columns are ignored); a row without a count column is one shot.
 */
export async function readSamplesCsv(file: string, parser: BitstringParser, sink: SampleSink): Promise<number> {
  // csv-parse loads here: most dumps take the fast reader and never need it.
  const { parse } = await import('csv-parse');
  const csv = createReadStream(file).pipe(
    parse({ bom: true, info: true, skip_empty_lines: true, trim: true, max_record_size: MAX_LINE_CHARS, relax_quotes: false }),
  );
  let bitCol = -1;
  let countCol = -1;
  let width = 0;
  let rows = 0;
  try {
    for await (const rec of csv as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
      const cells = rec.record;
      const line = rec.info.lines;
      if (bitCol < 0) {
        ({ bitCol, countCol } = headerColumns(cells, file, line));
        width = cells.length;
        continue;
      }
      if (cells.length !== width) {
        throw new BitspanError('bad-samples', `row has ${cells.length} fields but the header has ${width}`, 'every row needs one field per header column', { file, line });
      }
      const words = parser.parse(cells[bitCol]!, file, line);
      const count = countCol >= 0 ? parseCount(cells[countCol]!, file, line) : 1;
      sink.add(words, count, line);
      rows++;
    }
  } catch (e) {
    if (e instanceof BitspanError) throw e;
    throw csvError(e, file);
  }
  if (bitCol < 0) throw new BitspanError('file-empty', 'sample file is empty', "give a CSV with a 'bitstring' header and at least one row", { file });
  return rows;
}

/** Columns of a sample CSV header: `bitstring` (required) and `count` (optional), each at most once. */
export function headerColumns(cells: string[], file: string, line: number): { bitCol: number; countCol: number } {
  const names = cells.map((c) => c.trim().toLowerCase());
  const bitCol = findColumn(names, 'bitstring', file, line);
  const countCol = findColumn(names, 'count', file, line);
  if (bitCol < 0) {
    throw new BitspanError(
      'bad-samples',
      `header has no 'bitstring' column (found: ${names.slice(0, 8).join(', ') || 'nothing'})`,
      "the first row must be a header naming a 'bitstring' column and optionally a 'count' column",
      { file, line },
    );
  }
  return { bitCol, countCol };
}

function findColumn(names: string[], want: string, file: string, line: number): number {
  const first = names.indexOf(want);
  if (first >= 0 && names.indexOf(want, first + 1) >= 0) {
    throw new BitspanError('bad-samples', `header names the '${want}' column twice`, 'rename or remove the duplicate column', { file, line });
  }
  return first;
}

function csvError(e: unknown, file: string): BitspanError {
  const err = e as { code?: string; message?: string; lines?: number };
  if (err && typeof err.code === 'string' && err.code.startsWith('CSV_')) {
    const what = (err.message ?? err.code).replace(/^Invalid [^:]*: /, '').replace(/\s+/g, ' ');
    return new BitspanError('bad-samples', `malformed CSV: ${what}`, 'fix the row (quotes, separators, field count)', { file, line: err.lines });
  }
  const code = (e as NodeJS.ErrnoException).code;
  if (code) return new BitspanError('file-unreadable', `cannot read file (${code})`, 'check the path and permissions', { file });
  throw e;
}
