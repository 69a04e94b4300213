import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { scanCsv } from '../../src/io/scanCsv.js';
import type { ScanPoint } from '../../src/analysis/thresholdScan.js';

describe('scanCsv', () => {
  it('scanCsv writes one row per threshold that csv-parse reads back exactly', () => {
    const scan: ScanPoint[] = [
      { threshold: 1e-10, relativeThreshold: 2e-11, keptDimension: 3, condition: 1234.5, energies: [-1.25, -0.5], residuals: [1e-3, 2e-3], energyError: 0.01 },
      { threshold: 5, relativeThreshold: 1, keptDimension: 0, condition: Number.NaN, energies: [], residuals: [], energyError: null },
    ];
    const rows = parse(scanCsv(scan, 2), { columns: true }) as Array<Record<string, string>>;
    expect(rows.length).toBe(2);
    expect(Object.keys(rows[0]!)).toEqual(['threshold', 'relative_threshold', 'kept_dimension', 'condition', 'energy_error', 'energy_0', 'energy_1', 'residual_0', 'residual_1']);
    expect(Number(rows[0]!.threshold)).toBe(1e-10);
    expect(Number(rows[0]!.energy_1)).toBe(-0.5);
    expect(Number(rows[0]!.condition)).toBe(1234.5);
    expect(rows[1]!.energy_0).toBe('');
    expect(rows[1]!.condition).toBe('');
  });
});
