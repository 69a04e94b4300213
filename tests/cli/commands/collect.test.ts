import { beforeAll, describe, expect, it } from 'vitest';
import { cpSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { runCli, tempDir } from '../../helpers.js';
import { ringManifest, writeRingFixture } from '../../batch/fixture.js';

describe('bitspan collect', () => {
  let dir: string;
  let manifest: string;
  let out: string;
  beforeAll(async () => {
    dir = tempDir();
    writeRingFixture(dir);
    manifest = join(dir, 'm.json');
    out = join(dir, 'out');
    writeFileSync(manifest, JSON.stringify(ringManifest(), null, 2));
    expect((await runCli(['batch', manifest, '--all'])).status).toBe(0);
  });

  it('collect DIR --manifest FILE --json prints rows (name and result keys), missing and failed; exit 0 when complete', async () => {
    const r = await runCli(['collect', out, '--manifest', manifest, '--json']);
    expect(r.status).toBe(0);
    const c = JSON.parse(r.stdout);
    expect(Object.keys(c)).toEqual(['rows', 'missing', 'failed']);
    expect(c.rows.map((row: { name: string }) => row.name)).toEqual(['full', 'even', 'dim-10', 'dim-20', 'dim-40', 'dim-60']);
    const full = JSON.parse(readFileSync(join(out, 'full.json'), 'utf8'));
    for (const [k, v] of Object.entries(full)) expect(c.rows[0][k], k).toEqual(v);
    expect(c.rows[2].parameters.maxDim).toBe(10);
  });

  it('collect lists a missing and a damaged job, exits 3, and writes a CSV table', async () => {
    const copy = join(dir, 'copy');
    cpSync(out, copy, { recursive: true });
    rmSync(join(copy, 'dim-20.json'));
    writeFileSync(join(copy, 'dim-40.json'), '{"command": "solve", "energies": [');
    const csv = join(dir, 'table.csv');
    const r = await runCli(['collect', copy, '--manifest', manifest, '--csv', csv]);
    expect(r.status).toBe(3);
    expect(r.stdout).toContain('missing: dim-20');
    expect(r.stdout).toMatch(/failed: dim-40: corrupt-result/);
    expect(r.stderr).toMatch(/1 missing \(dim-20\), 1 failed \(dim-40\) of 6 jobs/);
    // Every energy printed travels with its residual and subspace.
    expect(r.stdout).toMatch(/full\s+ok\s+70\s+-14\.6043\d+\s+\d\.\d\de-\d+\s+70 configurations \(weight 4\)/);
    const rows = parse(readFileSync(csv, 'utf8'), { columns: true }) as Array<Record<string, string>>;
    expect(rows.map((x) => x.status)).toEqual(['ok', 'ok', 'ok', 'missing', 'failed', 'ok']);
    expect(Number(rows[0]!.energy)).toBe(JSON.parse(readFileSync(join(copy, 'full.json'), 'utf8')).energies[0]);
    expect(rows[2]!['param.maxDim']).toBe('10');
  });

  it('collect without --manifest uses the job list batch saved in the folder', async () => {
    const r = await runCli(['collect', out, '--json']);
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).rows).toHaveLength(6);
  });
});
