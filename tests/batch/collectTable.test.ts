import { describe, expect, it } from 'vitest';
import { collectTable } from '../../src/batch/collectTable.js';
import type { Collected } from '../../src/batch/collect.js';

const collected: Collected = {
  rows: [
    {
      name: 'a',
      index: 0,
      status: 'ok',
      command: 'solve',
      parameters: { maxDim: 10, weight: [4], samples: ['=cmd|x.csv'] },
      dimension: 10,
      energies: [-3.5, -1],
      residuals: [1e-12, 2e-9],
      sector: { description: 'weight 4', weights: [{ qubits: [0, 7], weight: 4 }] },
      timings: { total: 0.25 },
      groundState: { top: [{ bitstring: '0101', probability: 0.5 }] },
    },
    { name: 'b', index: 1, status: 'missing', command: 'solve', parameters: { maxDim: 20 } },
    { name: 'c', index: 2, status: 'failed', command: 'solve', parameters: { maxDim: 30 }, error: { code: 'killed', message: 'SIGKILL' } },
  ],
  missing: ['b'],
  failed: ['c'],
};

describe('collectTable', () => {
  it('collectTable puts name, status and parameters first, the lowest energy with its residual next, then flattened result keys', () => {
    const t = collectTable(collected);
    expect(t.columns.slice(0, 7)).toEqual(['name', 'index', 'status', 'command', 'param.maxDim', 'param.weight', 'param.samples']);
    expect(t.columns.slice(7, 12)).toEqual(['dimension', 'energy', 'residual', 'energies', 'residuals']);
    expect(t.columns).toContain('sector.description');
    expect(t.columns).toContain('timings.total');
    // Lists of objects (the ground-state table, sector weights) are left to the JSON output.
    expect(t.columns.some((c) => c.startsWith('groundState') || c === 'sector.weights')).toBe(false);
    expect(t.columns.at(-1)).toBe('error');
    const row = (name: string) => Object.fromEntries(t.columns.map((c, i) => [c, t.rows[collected.rows.findIndex((r) => r.name === name)]![i]]));
    expect(row('a')).toMatchObject({ energy: -3.5, residual: 1e-12, energies: '[-3.5,-1]', 'param.samples': '["=cmd|x.csv"]', 'timings.total': 0.25, error: null });
    expect(row('b')).toMatchObject({ status: 'missing', 'param.maxDim': 20, energy: null });
    expect(row('c')).toMatchObject({ status: 'failed', error: 'killed: SIGKILL' });
  });
});
