import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runDemo, type DemoReport } from '../../src/pipeline/demo.js';
import { BitspanError } from '../../src/errors.js';
import { runCli, tempDir } from '../helpers.js';

describe('runDemo', () => {
  it('bitspan demo on the shipped fixtures: nested dump sets never raise the energy (interlacing), stay above exact (variational), and every energy is printed beside its residual and subspace', async () => {
    const out = tempDir();
    const cli = await runCli(['demo', '--out', out]);
    expect(cli.status, cli.stderr).toBe(0);
    expect(cli.stdout).toMatch(/exact: E0 = -17\.357\d+ +residual .* subspace 12870 configurations/);
    expect(cli.stdout).toMatch(/dumps +t_max +kept shots +subspace +energy +residual +error/);
    expect(cli.stdout.split('\n').filter((l) => /^\s+\d+\s+\d+\.\d\d\s/.test(l))).toHaveLength(10);
    const r = JSON.parse(readFileSync(join(out, 'demo.json'), 'utf8')) as DemoReport;
    expect(r.rows).toHaveLength(10);
    expect(r.qubits).toBe(16);
    for (let i = 0; i < r.rows.length; i++) {
      const row = r.rows[i]!;
      expect(row.converged).toBe(true);
      expect(row.error).toBeGreaterThan(-1e-7);
      if (i > 0) {
        expect(row.dimension).toBeGreaterThanOrEqual(r.rows[i - 1]!.dimension);
        expect(row.energy).toBeLessThanOrEqual(r.rows[i - 1]!.energy + 1e-7);
      }
    }
    // The scenario is built so that the estimate visibly approaches exact.
    expect(r.rows[9]!.error).toBeLessThan(r.rows[0]!.error / 10);
    const csv = readFileSync(join(out, 'demo.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('dumps,time,shots,kept_shots,dimension,energy,residual,error,relative_error,converged');
    expect(csv).toHaveLength(11);
  });

  it('runDemo says where the fixtures should be when they are missing', async () => {
    await expect(runDemo({ fixtures: join(tempDir(), 'nothing'), out: tempDir() })).rejects.toSatisfy((e: unknown) => e instanceof BitspanError && e.code === 'file-unreadable' && /make-demo/.test(e.hint));
    const r = await runCli(['demo', '--fixtures', join(tempDir(), 'nothing'), '--out', tempDir()]);
    expect(r.status).toBe(2);
  });
});
