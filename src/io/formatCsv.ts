/** A CSV cell: text is escaped, numbers and booleans are written as they are. */
export type CsvCell = string | number | boolean | null | undefined;

/**
 * Characters that make a spreadsheet read a text cell as a formula (common practice, after the
 * OWASP advice on CSV injection), including the full-width forms some spreadsheets fold.
 */
const FORMULA_START = /^[=+\-@\t\r\uFF1D\uFF0B\uFF0D\uFF20]/;

/**
 * Format a table as CSV (RFC 4180 quoting, `\n` line ends). A text cell that a spreadsheet would
 * run as a formula gets a leading apostrophe; numbers are written in shortest round-trip form and
 * never altered, so a negative energy stays a number.
 */
export function formatCsv(header: readonly string[], rows: ReadonlyArray<readonly CsvCell[]>): string {
  return [csvRow(header), ...rows.map(csvRow)].join('\n') + '\n';
}

/** One escaped cell. */
export function csvCell(v: CsvCell): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : String(v).toLowerCase();
  if (typeof v === 'boolean') return String(v);
  const text = FORMULA_START.test(v) ? `'${v}` : v;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** One CSV row (without its line end) from cells escaped by `csvCell`. */
export function csvRow(values: readonly CsvCell[]): string {
  return values.map(csvCell).join(',');
}
