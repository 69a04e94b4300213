import { describe, expect, it } from 'vitest';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli, tempDir, writeFiles } from '../helpers.js';

const HEIS6 = 'qubits 6\n' + [0, 1, 2, 3, 4, 5].flatMap((i) => ['X', 'Y', 'Z'].map((o) => `0.25 ${o}${i} ${o}${(i + 1) % 6}`)).join('\n') + '\n';
const DUMPS = {
  'h.txt': HEIS6,
  't0.csv': 'bitstring,count\n010101,20\n101010,18\n011001,3\n',
  't1.csv': 'bitstring,count\n010101,9\n100110,4\n001011,2\n110001,1\n',
  't2.csv': 'bitstring,count\n011010,3\n101100,2\n010110,1\n111000,1\n000111,1\n',
};

describe('bitspan sweep (CLI)', () => {
  it('sweep --json prints one object with axis, points carrying the solve --estimate keys plus the value, and extrapolation', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, DUMPS);
    const r = await runCli(['sweep', '--hamiltonian', f['h.txt']!, '--samples', f['t0.csv']!, f['t1.csv']!, f['t2.csv']!, '--weight', '3', '--axis', 'groups', '--json', '--exact']);
    expect(r.status).toBe(0);
    const o = JSON.parse(r.stdout);
    expect(o.axis).toBe('groups');
    expect(o.points).toHaveLength(3);
    for (const p of o.points) {
      for (const key of ['value', 'qubits', 'dimension', 'nonzeros', 'energies', 'residuals', 'iterations', 'samples', 'sector', 'timings', 'groundState', 'variance', 'pt2', 'bounds']) expect(p).toHaveProperty(key);
      expect(p.bounds.weinstein).toHaveLength(2);
      expect(typeof p.bounds.upper).toBe('number');
    }
    expect(o.points.map((p: { value: number }) => p.value)).toEqual([1, 2, 3]);
    for (const key of ['energy', 'uncertainty', 'against']) expect(o.extrapolation).toHaveProperty(key);
    expect(['variance', 'pt2']).toContain(o.extrapolation.against);
    // Six-site ring, Sz = 0: E0 = −2.8027756377 (Σ S·S; exact diagonalisation, from memory; the
    // --exact reference here computes it independently of the samples).
    expect(o.reference.energy).toBeCloseTo(-2.8027756377, 8);
  });

  it('sweep --out-dir writes JSON, CSV and the plots atomically; --csv and --out write single files', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, DUMPS);
    const out = join(dir, 'results', 'run1');
    const csv = join(dir, 'extra.csv');
    const r = await runCli(['sweep', '--hamiltonian', f['h.txt']!, '--samples', f['t0.csv']!, f['t1.csv']!, f['t2.csv']!, '--weight', '3', '--axis', 'top', '--values', '2,4,8', '--reference', '-2.8027756377', '--out-dir', out, '--csv', csv]);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/extrapolation against pt2 \(reported\)/);
    expect(r.stdout).toMatch(/residual/);
    const names = readdirSync(out).sort();
    expect(names).toEqual(['energy.png', 'energy.svg', 'error.png', 'error.svg', 'sweep.csv', 'sweep.json', 'z-profile.png', 'z-profile.svg']);
    const rows = readFileSync(join(out, 'sweep.csv'), 'utf8').trim().split('\n');
    expect(rows).toHaveLength(4);
    expect(rows[0]).toMatch(/^axis,value,dimension,nonzeros,/);
    expect(readFileSync(csv, 'utf8')).toBe(readFileSync(join(out, 'sweep.csv'), 'utf8'));
    const svg = readFileSync(join(out, 'energy.svg'), 'utf8');
    expect(svg).toContain('subspace dimension (configurations)');
    expect(svg).toContain('reference');
    expect(readFileSync(join(out, 'energy.png')).subarray(1, 4).toString()).toBe('PNG');
    expect(readdirSync(out).filter((n) => n.includes('.tmp-'))).toEqual([]);
  });

  it('sweep shots axis with random subsamples is seeded and reproducible', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, DUMPS);
    const args = ['sweep', '--hamiltonian', f['h.txt']!, '--samples', f['t0.csv']!, f['t1.csv']!, '--weight', '3', '--axis', 'shots', '--subsample', 'random', '--values', '0.3,1', '--seed', '5', '--json'];
    const a = JSON.parse((await runCli(args)).stdout);
    const b = JSON.parse((await runCli(args)).stdout);
    expect(a.subsample).toBe('random');
    expect(a.points.map((p: { samples: { shots: number } }) => p.samples.shots)).toEqual(b.points.map((p: { samples: { shots: number } }) => p.samples.shots));
    expect(a.points[1].samples.shots).toBe(57);
  });

  it('sweep exits 2 with one line for bad flags and leaves no output behind', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, DUMPS);
    const base = ['sweep', '--hamiltonian', f['h.txt']!, '--samples', f['t0.csv']!, f['t1.csv']!, '--weight', '3'];
    const out = join(dir, 'never');
    const cases: Array<[string[], RegExp]> = [
      [['--axis', 'groups', '--values', '1,5'], /at most the 2 dump/],
      [['--axis', 'groups', '--values', 'a,b'], /comma-separated/],
      [['--axis', 'top', '--subsample', 'random'], /--axis shots only/],
      [['--axis', 'shots', '--subsample', 'random', '--values', '0.5,2'], /fraction/],
      [['--axis', 'expand', '--expand', '2'], /--values/],
      [['--axis', 'sideways'], /not one of/],
      [['--axis', 'groups', '--exact', '--reference', '-1'], /use one of them/],
    ];
    for (const [extra, msg] of cases) {
      const r = await runCli([...base, ...extra, '--out-dir', out]);
      expect(r.status, extra.join(' ')).toBe(2);
      expect(r.stderr).toMatch(msg);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
    expect(existsSync(out)).toBe(false);
  });
});
