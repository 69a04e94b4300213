import type { CsvCell } from '../io/formatCsv.js';
import type { Collected, CollectRow } from './collect.js';

/** A collected table laid out as columns and cells (for CSV). */
export interface Table {
  columns: string[];
  rows: CsvCell[][];
}

/** Result columns placed first, when any row has them; the rest follow in the order first seen. */
const LEADING = ['qubits', 'dimension', 'energy', 'residual', 'energies', 'residuals', 'converged', 'variance', 'correction', 'pt2'];
const ROW_KEYS = new Set(['name', 'index', 'status', 'command', 'parameters', 'error']);

/**
 * Lay out collected rows as one flat table: `name`, `index`, `status`, `command`, one `param.KEY`
 * column per job parameter, `energy` and `residual` (the lowest eigenpair), then every scalar or
 * list-of-numbers key of the results, nested objects one level deep as `key.sub` (so `timings.total`,
 * `sector.description`), and `error`. Lists are written as JSON (`[-1.5,-0.5]`).
 */
export function collectTable(c: Collected): Table {
  const params: string[] = [];
  const result: string[] = [];
  const flat = c.rows.map((row) => {
    const cells = new Map<string, CsvCell>();
    for (const [k, v] of Object.entries(row.parameters ?? {})) {
      const col = `param.${k}`;
      if (!params.includes(col)) params.push(col);
      cells.set(col, cellOf(v));
    }
    for (const [col, v] of flattenResult(row)) {
      if (!result.includes(col)) result.push(col);
      cells.set(col, v);
    }
    return cells;
  });
  const lead = LEADING.filter((k) => result.includes(k));
  const columns = ['name', 'index', 'status', 'command', ...params, ...lead, ...result.filter((k) => !lead.includes(k)), 'error'];
  const rows = c.rows.map((row, i) => {
    const cells = flat[i]!;
    return columns.map((col) => {
      if (col === 'name' || col === 'index' || col === 'status' || col === 'command') return row[col];
      if (col === 'error') return row.error ? `${row.error.code}: ${row.error.message}` : null;
      return cells.get(col) ?? null;
    });
  });
  return { columns, rows };
}

function flattenResult(row: CollectRow): Array<[string, CsvCell]> {
  const out: Array<[string, CsvCell]> = [];
  const energies = row.energies;
  const residuals = row.residuals;
  if (Array.isArray(energies) && typeof energies[0] === 'number') out.push(['energy', energies[0]]);
  if (Array.isArray(residuals) && typeof residuals[0] === 'number') out.push(['residual', residuals[0]]);
  for (const [k, v] of Object.entries(row)) {
    if (ROW_KEYS.has(k)) continue;
    const cell = cellOf(v);
    if (cell !== undefined) out.push([k, cell]);
    else if (isObject(v)) {
      for (const [sub, w] of Object.entries(v)) {
        const subCell = cellOf(w);
        if (subCell !== undefined) out.push([`${k}.${sub}`, subCell]);
      }
    }
  }
  return out;
}

/** A scalar or a list of scalars as a cell; undefined for anything deeper. */
function cellOf(v: unknown): CsvCell | undefined {
  if (v === null || typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') return v;
  if (Array.isArray(v) && v.every((x) => x === null || typeof x !== 'object')) return JSON.stringify(v);
  return undefined;
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}
