import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parse } from 'csv-parse/sync';
import { csvCell, formatCsv } from '../../src/io/formatCsv.js';

describe('formatCsv', () => {
  it('formatCsv output reads back through csv-parse (the reference reader) cell for cell', () => {
    const cell = fc.oneof(fc.string(), fc.double({ noNaN: true, noDefaultInfinity: true }), fc.boolean());
    fc.assert(
      fc.property(fc.array(fc.array(cell, { minLength: 3, maxLength: 3 }), { maxLength: 6 }), (rows) => {
        const text = formatCsv(['a', 'b', 'c'], rows);
        const back = parse(text, { relax_column_count: false }) as string[][];
        expect(back[0]).toEqual(['a', 'b', 'c']);
        rows.forEach((row, i) =>
          row.forEach((v, j) => {
            const got = back[i + 1]![j]!;
            if (typeof v === 'number') expect(Number(got)).toBe(v === 0 ? 0 : v);
            else if (typeof v === 'boolean') expect(got).toBe(String(v));
            // A text cell comes back whole, with an apostrophe in front if it could start a formula.
            else expect(got === v || got === `'${v}`).toBe(true);
          }),
        );
      }),
      { seed: 5, numRuns: 300 },
    );
  });

  it('csvCell puts an apostrophe before text a spreadsheet would run as a formula (common practice, OWASP CSV injection)', () => {
    expect(csvCell('=HYPERLINK("http://x")')).toBe(`"'=HYPERLINK(""http://x"")"`);
    expect(csvCell('+1')).toBe("'+1");
    expect(csvCell('-2+3')).toBe("'-2+3");
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvCell('\t=1')).toBe("'\t=1");
    expect(csvCell('\uFF1D1')).toBe("'\uFF1D1");
    expect(csvCell('scan-100')).toBe('scan-100');
  });

  it('csvCell writes numbers unaltered, so negative energies stay numbers', () => {
    expect(csvCell(-41.89531070373724)).toBe('-41.89531070373724');
    expect(csvCell(2.4e-13)).toBe('2.4e-13');
    expect(csvCell(null)).toBe('');
  });
});
