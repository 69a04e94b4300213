import { promises as fsp } from 'node:fs';
import { parse } from 'csv-parse/sync';
import { BitspanError } from '../errors.js';
import { complexMatrix, type ComplexMatrix } from '../solvers/complexMatrix.js';
import { checkReadable } from './lines.js';

/** Where the Krylov matrices come from: one JSON file, or one CSV file per matrix. */
export type KrylovSource =
  | { matrices: string }
  | { h: string; s: string; hErr?: string; sErr?: string };

/** Where one matrix was read, so later checks can name the file and the line of a row. */
export interface MatrixOrigin {
  file: string;
  /** How messages name the matrix: `h`, `s`, `hErr`, `sErr`. */
  name: string;
  /** 1-based file line of each row (CSV), or null (JSON, where rows are named by index). */
  rowLines: number[] | null;
}

/**
 * H̃ and S as read, with optional per-element standard errors: `hErr.re[j*n+k]` is the error of
 * the real part of H̃_jk and `hErr.im[j*n+k]` that of its imaginary part.
 */
export interface KrylovMatrices {
  h: ComplexMatrix;
  s: ComplexMatrix;
  hErr: ComplexMatrix | null;
  sErr: ComplexMatrix | null;
  origins: { h: MatrixOrigin; s: MatrixOrigin; hErr: MatrixOrigin | null; sErr: MatrixOrigin | null };
}

/** Largest Krylov dimension accepted; the dense solvers are O(r³) per threshold. */
export const MAX_KRYLOV_DIMENSION = 1000;
const MAX_BYTES = 256 * 1024 * 1024;
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Read H̃ and S (and their element errors) from one JSON file `{"h", "s", "hErr", "sErr"}` or from
 * CSV files with `re,im` column pairs; checks shapes and numbers, not Hermiticity (see
 * `checkKrylovMatrices`). Throws `bad-matrices`, `file-unreadable`, `file-empty` or `too-large`.
 */
export async function readKrylovMatrices(source: KrylovSource): Promise<KrylovMatrices> {
  if ('matrices' in source) return readJson(source.matrices);
  const h = await readCsv(source.h, 'h', 'values');
  const s = await readCsv(source.s, 's', 'values');
  if (h.matrix.n !== s.matrix.n) {
    throw new BitspanError('bad-matrices', `H̃ is ${h.matrix.n}×${h.matrix.n} (${source.h}) but S is ${s.matrix.n}×${s.matrix.n}`, 'H̃ and S must have the same Krylov dimension', { file: source.s });
  }
  const hErr = source.hErr ? await readCsv(source.hErr, 'hErr', 'errors', h.matrix.n) : null;
  const sErr = source.sErr ? await readCsv(source.sErr, 'sErr', 'errors', s.matrix.n) : null;
  return {
    h: h.matrix,
    s: s.matrix,
    hErr: hErr?.matrix ?? null,
    sErr: sErr?.matrix ?? null,
    origins: { h: h.origin, s: s.origin, hErr: hErr?.origin ?? null, sErr: sErr?.origin ?? null },
  };
}

async function readText(file: string, what: string): Promise<string> {
  const size = await checkReadable(file, what);
  if (size === 0) throw new BitspanError('file-empty', `${what} file is empty`, 'see `bitspan krylov --help` for the format', { file });
  if (size > MAX_BYTES) throw new BitspanError('too-large', `${what} file is larger than 256 MiB`, 'Krylov matrices are small; check the file', { file });
  const text = await fsp.readFile(file, 'utf8');
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

// ---- JSON ----------------------------------------------------------------------------------

async function readJson(file: string): Promise<KrylovMatrices> {
  const text = await readText(file, 'Krylov matrices');
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    const msg = (e as Error).message;
    const pos = /position (\d+)/.exec(msg);
    const line = pos ? text.slice(0, Number(pos[1])).split('\n').length : undefined;
    throw new BitspanError('bad-matrices', `invalid JSON: ${msg.replace(/\s+/g, ' ').slice(0, 120)}`, 'check brackets, commas and quotes', { file, line });
  }
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) {
    throw new BitspanError('bad-matrices', 'top level is not an object', 'write {"h": [[[re, im], ...], ...], "s": [...]}', { file });
  }
  const o = doc as Record<string, unknown>;
  const origin = (name: string): MatrixOrigin => ({ file, name, rowLines: null });
  const h = jsonMatrix(o.h, 'h', file, 'values');
  const s = jsonMatrix(o.s, 's', file, 'values');
  if (h.n !== s.n) throw new BitspanError('bad-matrices', `"h" is ${h.n}×${h.n} but "s" is ${s.n}×${s.n}`, 'H̃ and S must have the same Krylov dimension', { file });
  const hErr = o.hErr === undefined || o.hErr === null ? null : jsonMatrix(o.hErr, 'hErr', file, 'errors', h.n);
  const sErr = o.sErr === undefined || o.sErr === null ? null : jsonMatrix(o.sErr, 'sErr', file, 'errors', s.n);
  return { h, s, hErr, sErr, origins: { h: origin('h'), s: origin('s'), hErr: hErr ? origin('hErr') : null, sErr: sErr ? origin('sErr') : null } };
}

function jsonMatrix(v: unknown, name: string, file: string, kind: 'values' | 'errors', size?: number): ComplexMatrix {
  const fail = (what: string, hint: string): never => {
    throw new BitspanError('bad-matrices', what, hint, { file });
  };
  const entryHint = kind === 'values' ? 'each entry is [re, im] or a real number' : 'each error is a number (both parts) or [reErr, imErr]';
  if (v === undefined) fail(`"${name}" is missing`, `write "${name}": [[[re, im], ...], ...] (one list per row)`);
  if (!Array.isArray(v)) fail(`"${name}" is not a list of rows`, `write "${name}": [[[re, im], ...], ...]`);
  const rows = v as unknown[];
  const n = rows.length;
  if (n === 0) throw new BitspanError('file-empty', `"${name}" has no rows`, 'give at least a 1×1 matrix', { file });
  if (n > MAX_KRYLOV_DIMENSION) throw new BitspanError('too-large', `"${name}" has ${n} rows; at most ${MAX_KRYLOV_DIMENSION} are supported`, 'use fewer Krylov vectors', { file });
  if (size !== undefined && n !== size) fail(`"${name}" has ${n} rows but the matrices are ${size}×${size}`, 'errors have the shape of the matrix they belong to');
  const m = complexMatrix(n);
  rows.forEach((row, j) => {
    if (!Array.isArray(row)) fail(`${name}[${j}] is not a list`, `each row of "${name}" is a list of ${n} entries`);
    if ((row as unknown[]).length !== n) fail(`${name}[${j}] has ${(row as unknown[]).length} entries, expected ${n} (the number of rows)`, 'the matrix must be square');
    (row as unknown[]).forEach((x, k) => {
      let re: unknown = x;
      let im: unknown = kind === 'values' ? 0 : x;
      if (Array.isArray(x)) {
        if (x.length !== 2) fail(`${name}[${j}][${k}] has ${x.length} numbers, expected 2`, entryHint);
        [re, im] = x as unknown[];
      }
      if (typeof re !== 'number' || typeof im !== 'number') fail(`${name}[${j}][${k}] is ${JSON.stringify(x).slice(0, 40)}, not a number or a pair of numbers`, entryHint);
      if (!Number.isFinite(re) || !Number.isFinite(im)) fail(`${name}[${j}][${k}] overflows`, 'use finite numbers');
      if (kind === 'errors' && ((re as number) < 0 || (im as number) < 0)) fail(`${name}[${j}][${k}] is negative`, 'errors are standard deviations, ≥ 0');
      m.re[j * n + k] = re as number;
      m.im[j * n + k] = im as number;
    });
  });
  return m;
}

// ---- CSV -----------------------------------------------------------------------------------

async function readCsv(file: string, name: string, kind: 'values' | 'errors', size?: number): Promise<{ matrix: ComplexMatrix; origin: MatrixOrigin }> {
  const text = await readText(file, name === 'h' ? 'H̃' : name === 's' ? 'S' : `${name} error`);
  let records: Array<{ record: string[]; info: { lines: number } }>;
  try {
    records = parse(text, { info: true, comment: '#', skip_empty_lines: true, trim: true, relax_column_count: true }) as unknown as typeof records;
  } catch (e) {
    const err = e as { message?: string; lines?: number };
    throw new BitspanError('bad-matrices', `malformed CSV: ${(err.message ?? String(e)).replace(/\s+/g, ' ').slice(0, 120)}`, 'fix quotes and separators', { file, line: err.lines });
  }
  // An optional header: a first row with any cell that is not a number.
  if (records.length > 0 && records[0]!.record.some((c) => !DECIMAL.test(c))) records = records.slice(1);
  if (records.length === 0) throw new BitspanError('file-empty', 'no data rows', kind === 'values' ? 'write one row per Krylov index: re,im,re,im,...' : 'write one row of errors per Krylov index', { file });
  const n = records.length;
  if (n > MAX_KRYLOV_DIMENSION) throw new BitspanError('too-large', `${n} rows; at most ${MAX_KRYLOV_DIMENSION} are supported`, 'use fewer Krylov vectors', { file });
  if (size !== undefined && n !== size) {
    throw new BitspanError('bad-matrices', `${n} rows but the matrices are ${size}×${size}`, 'errors have the shape of the matrix they belong to', { file, line: records[Math.min(n, size) - 1]!.info.lines });
  }
  const m = complexMatrix(n);
  const rowLines: number[] = [];
  // Values: 2n columns (re,im pairs). Errors: n columns (one error for both parts) or 2n.
  const widths = kind === 'values' ? [2 * n] : [n, 2 * n];
  records.forEach(({ record, info }, j) => {
    const line = info.lines;
    rowLines.push(line);
    if (!widths.includes(record.length) || (j > 0 && record.length !== records[0]!.record.length)) {
      const expected = kind === 'values' ? `${2 * n} (re,im for each of ${n} columns)` : `${n} or ${2 * n}`;
      throw new BitspanError('bad-matrices', `row ${j} has ${record.length} fields, expected ${expected}`, 'the matrix must be square: as many rows as complex columns', { file, line });
    }
    const paired = record.length === 2 * n;
    for (let k = 0; k < n; k++) {
      const reText = paired ? record[2 * k]! : record[k]!;
      const imText = paired ? record[2 * k + 1]! : record[k]!;
      for (const t of [reText, imText]) {
        if (!DECIMAL.test(t)) throw new BitspanError('bad-matrices', `row ${j}, column ${k}: '${t.slice(0, 30)}' is not a decimal number`, 'write plain decimals such as -0.25 or 1e-3', { file, line });
      }
      const re = Number(reText);
      const im = Number(imText);
      if (!Number.isFinite(re) || !Number.isFinite(im)) throw new BitspanError('bad-matrices', `row ${j}, column ${k} overflows`, 'use finite numbers', { file, line });
      if (kind === 'errors' && (re < 0 || im < 0)) throw new BitspanError('bad-matrices', `row ${j}, column ${k}: error is negative`, 'errors are standard deviations, ≥ 0', { file, line });
      m.re[j * n + k] = re;
      m.im[j * n + k] = im;
    }
  });
  return { matrix: m, origin: { file, name, rowLines } };
}
