import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli, tempDir, writeFiles } from '../helpers.js';

const HEIS4 = 'qubits 4\n' + [0, 1, 2, 3].flatMap((i) => ['X', 'Y', 'Z'].map((o) => `0.25 ${o}${i} ${o}${(i + 1) % 4}`)).join('\n') + '\n';

describe('bitspan solve (CLI)', () => {
  it('solve --json prints exactly one JSON object with the contract keys', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS4, 't0.csv': 'bitstring,count\n0101,5\n1010,5\n0011,2\n', 't1.csv': 'bitstring,count\n0110,1\n1001,1\n1100,3\n0001,4\n' });
    const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['t0.csv']!, f['t1.csv']!, '--weight', '2', '--json', '--eigs', '2']);
    expect(r.status).toBe(0);
    const o = JSON.parse(r.stdout);
    for (const key of ['qubits', 'dimension', 'nonzeros', 'energies', 'residuals', 'iterations', 'samples', 'sector', 'timings', 'groundState']) expect(o).toHaveProperty(key);
    for (const key of ['shots', 'distinct', 'kept', 'keptShots', 'groups']) expect(o.samples).toHaveProperty(key);
    expect(o.dimension).toBe(6);
    // Full Sz=0 sector of the 4-site ring: E0 = −2 (exact, Σ S·S; common practice: singlet of the square).
    expect(o.energies[0]).toBeCloseTo(-2, 9);
    expect(o.energies[1]).toBeGreaterThanOrEqual(o.energies[0]);
    expect(o.samples.groups).toHaveLength(2);
    expect(o.groundState.top.length).toBeGreaterThan(0);
  });

  it('solve --out writes the same object atomically and leaves no temporary file', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS4, 's.txt': '0101\n1010\n0011\n' });
    const out = join(dir, 'res.json');
    const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.txt']!, '--out', out]);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/E0 = -?\d+\.\d+ +residual/);
    expect(JSON.parse(readFileSync(out, 'utf8')).dimension).toBe(3);
    expect(readdirSync(dir).filter((n) => n.includes('.tmp-'))).toEqual([]);
  });

  it('solve exits 2 with one line for each class of bad input', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, {
      'h.txt': HEIS4,
      'h8.txt': '1 Z7\n',
      'ok.csv': 'bitstring,count\n0101,1\n',
      'row.csv': 'bitstring,count\n0101,1\n0101\n',
      'len.csv': 'bitstring,count\n0101,1\n01011,1\n',
      'chr.csv': 'bitstring,count\n0121,1\n',
      'empty.csv': '',
    });
    const cases: string[][] = [
      ['--samples', f['row.csv']!],
      ['--samples', f['len.csv']!],
      ['--samples', f['chr.csv']!],
      ['--samples', f['empty.csv']!],
      ['--samples', join(dir, 'nope.csv')],
      ['--samples', f['ok.csv']!, '--weight', '3'],
      ['--samples', f['ok.csv']!, '--weight', 'x'],
      ['--samples', f['ok.csv']!, '--eigs', '0'],
    ];
    for (const extra of cases) {
      const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, ...extra]);
      expect(r.status, extra.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n'), extra.join(' ')).toHaveLength(1);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    }
    const mismatch = await runCli(['solve', '--hamiltonian', f['h8.txt']!, '--samples', f['ok.csv']!]);
    expect(mismatch.status).toBe(2);
    expect(mismatch.stderr).toContain('qubit 7');
    const row = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['row.csv']!]);
    expect(row.stderr).toContain(`${f['row.csv']}:3`);
  });

  it('solve explains an empty subspace and hints at the other qubit order', async () => {
    const dir = tempDir();
    // Register 0-1 should hold two ones: true for 0011 read left-to-right, false right-to-left.
    const f = writeFiles(dir, { 'h.txt': HEIS4, 's.csv': 'bitstring,count\n1100,3\n1110,1\n' });
    const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.csv']!, '--weight', '0-1=2', '--weight', '2-3=0']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('weight dropped 2');
    expect(r.stderr).toContain('other qubit order');
    const left = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.csv']!, '--weight', '0-1=2', '--weight', '2-3=0', '--qubit0', 'left', '--json']);
    expect(left.status).toBe(0);
    expect(JSON.parse(left.stdout).dimension).toBe(1);
  });

  it('the installed bin prints no stack trace and exits 2 on bad input', () => {
    const bin = join(process.cwd(), 'dist/src/cli/bin.js');
    expect(existsSync(bin)).toBe(true);
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS4, 'bad.csv': 'bitstring\n01x1\n' });
    const r = spawnSync(process.execPath, [bin, 'solve', '--hamiltonian', f['h.txt']!, '--samples', f['bad.csv']!], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('bad.csv:2');
    const ok = execFileSync(process.execPath, [bin, '--help'], { encoding: 'utf8' });
    expect(ok).toContain('solve');
  });
});
