import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parse } from 'csv-parse/sync';
import { csvCell, csvRow } from '../../src/io/formatCsv.js';

describe('csvCell', () => {
  it('csvCell prefixes formula-like text with an apostrophe (common practice against CSV injection)', () => {
    for (const danger of ['=1+1', '+1', '-cmd', '@SUM(A1)', '\tx', '\rx', '=HYPERLINK("http://x","y")']) {
      expect(csvCell(danger).replace(/^"/, '').startsWith("'")).toBe(true);
    }
    expect(csvCell('0101')).toBe('0101');
    expect(csvCell('a label')).toBe('a label');
  });

  it('csvCell keeps numbers as numbers, negative ones included', () => {
    expect(csvCell(-1.5)).toBe('-1.5');
    expect(csvCell(0)).toBe('0');
    expect(csvCell(1e-12)).toBe('1e-12');
    expect(csvCell(true)).toBe('true');
    expect(csvCell(null)).toBe('');
  });

  it('csvCell quotes commas, quotes and line breaks so csv-parse (an independent reader) reads the text back', () => {
    fc.assert(
      fc.property(fc.array(fc.string({ unit: 'binary', maxLength: 30 }), { minLength: 1, maxLength: 6 }), (cells) => {
        const line = csvRow(cells) + '\n';
        const back = parse(line, { relax_column_count: false }) as string[][];
        expect(back).toHaveLength(1);
        const row = back[0]!;
        expect(row).toHaveLength(cells.length);
        row.forEach((got, i) => {
          const want = cells[i]!;
          // The reader sees the text itself, or the text behind the protective apostrophe.
          expect(got === want || got === `'${want}`).toBe(true);
          expect(/^[=+\-@\t\r]/.test(got)).toBe(false);
        });
      }),
      { seed: 5, numRuns: 300 },
    );
  });
});
