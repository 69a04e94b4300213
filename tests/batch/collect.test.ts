import { describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { collect } from '../../src/batch/collect.js';
import type { PlannedJob } from '../../src/batch/jobPlan.js';
import type { BatchJob } from '../../src/batch/manifest.js';
import { jobFiles, runJob } from '../../src/batch/runJob.js';
import { tempDir } from '../helpers.js';

const report = (e: number) => JSON.stringify({ command: 'solve', dimension: 4, energies: [e], residuals: [1e-12], timings: { total: 0.1 } }, null, 2) + '\n';
const planned = (names: string[]): PlannedJob[] => names.map((name, index) => ({ index, name, command: 'solve', params: { maxDim: index + 1 } }));

/** Run fake jobs into `out`: each name prints `report(-index)`, or fails if listed in `failing`. */
async function fill(out: string, names: string[], failing: string[] = []): Promise<void> {
  for (const [index, name] of names.entries()) {
    const job: BatchJob = { index, name, command: 'solve', params: {}, argv: ['solve', name], inputs: [], origin: 'test' };
    await runJob(job, {
      output: out,
      execute: async () =>
        failing.includes(name)
          ? { exitStatus: 2, signal: null, stdout: '', stderr: JSON.stringify({ bitspanError: { code: 'bad-samples', message: 'negative count' } }) }
          : { exitStatus: 0, signal: null, stdout: report(-index), stderr: '' },
    });
  }
}

describe('collect', () => {
  it('collect returns one row per job in job order, with the result keys, and lists missing and failed jobs', async () => {
    const out = join(tempDir(), 'out');
    await fill(out, ['a', 'b', 'c'], ['b']);
    const c = await collect(out, planned(['a', 'b', 'c', 'd']));
    expect(c.rows.map((r) => [r.name, r.status])).toEqual([
      ['a', 'ok'],
      ['b', 'failed'],
      ['c', 'ok'],
      ['d', 'missing'],
    ]);
    expect(c.missing).toEqual(['d']);
    expect(c.failed).toEqual(['b']);
    expect(c.rows[2]).toMatchObject({ name: 'c', parameters: { maxDim: 3 }, energies: [-2], residuals: [1e-12], dimension: 4 });
    expect(c.rows[1]!.error).toMatchObject({ code: 'bad-samples', message: 'negative count', exitStatus: 2 });
  });

  it('collect reports damaged result files as failed: unparseable, not an object, missing keys, or changed since written', async () => {
    const out = join(tempDir(), 'out');
    const names = ['cut', 'list', 'keys', 'edited', 'typed', 'fine'];
    await fill(out, names);
    const file = (n: string) => jobFiles(out, n).result;
    writeFileSync(file('cut'), report(-1).slice(0, 30));
    writeFileSync(file('list'), '[1, 2]\n');
    writeFileSync(file('keys'), JSON.stringify({ command: 'solve', dimension: 4 }));
    // Valid JSON with every key, but not what the job wrote: the sidecar checksum catches it.
    writeFileSync(file('edited'), report(-99));
    writeFileSync(file('typed'), JSON.stringify({ energies: ['x'], residuals: [1], dimension: 4 }));
    const c = await collect(out, planned(names));
    expect(c.failed).toEqual(['cut', 'list', 'keys', 'edited', 'typed']);
    for (const r of c.rows.slice(0, 5)) expect(r.error?.code, r.name).toBe('corrupt-result');
    expect(c.rows[2]!.error!.message).toContain('"energies", "residuals"');
    expect(c.rows[5]!.status).toBe('ok');
  });

  it('collect without a job list gathers whatever results and error records the folder holds', async () => {
    const out = join(tempDir(), 'out');
    await fill(out, ['x', 'y'], ['y']);
    const c = await collect(out);
    expect(c.rows.map((r) => [r.name, r.status, r.command])).toEqual([
      ['x', 'ok', 'solve'],
      ['y', 'failed', 'solve'],
    ]);
    expect(c.missing).toEqual([]);
  });

  it('collect refuses a folder that does not exist with file-unreadable', async () => {
    await expect(collect('/nonexistent/out')).rejects.toMatchObject({ code: 'file-unreadable' });
  });
});
