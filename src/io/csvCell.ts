/** Characters that make a spreadsheet read a cell as a formula (or a command, on some). */
const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * One CSV cell, safe to open in a spreadsheet: text starting with = + - @, a tab or a carriage
 * return gets a leading apostrophe so it is shown rather than evaluated (common practice against
 * formula injection), and a cell holding a comma, quote or line break is quoted with quotes doubled
 * (RFC 4180). Numbers pass through unchanged, negative ones included, so they stay numbers.
 */
export function csvCell(value: string | number | boolean | null | undefined): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : csvCell(String(value));
  if (typeof value === 'boolean') return String(value);
  const text = FORMULA_START.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** One CSV row (without its line end) from cells escaped by `csvCell`. */
export function csvRow(values: ReadonlyArray<string | number | boolean | null | undefined>): string {
  return values.map(csvCell).join(',');
}
