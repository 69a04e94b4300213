import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { closeTo, runCli, tempDir } from '../../helpers.js';
import { RING_SITES, ringManifest, writeRingFixture } from '../../batch/fixture.js';

/** Dense 8-site ring Hamiltonian, sum over bonds of XX + YY + ZZ, on all 256 configurations. */
function denseRing(): Matrix {
  const n = 1 << RING_SITES;
  const h = Matrix.zeros(n, n);
  for (let b = 0; b < n; b++) {
    for (let i = 0; i < RING_SITES; i++) {
      const j = (i + 1) % RING_SITES;
      const same = ((b >> i) & 1) === ((b >> j) & 1);
      // ZZ is ±1 on the diagonal; XX + YY moves an antiparallel pair with amplitude 2 and cancels on a parallel one.
      h.set(b, b, h.get(b, b) + (same ? 1 : -1));
      if (!same) h.set(b ^ (1 << i) ^ (1 << j), b, 2);
    }
  }
  return h;
}

const withoutTimings = (r: Record<string, unknown>) => ({ ...r, timings: undefined });

describe('bitspan batch', () => {
  let dir: string;
  let manifest: string;
  beforeAll(() => {
    dir = tempDir();
    writeRingFixture(dir);
    manifest = join(dir, 'm.json');
    writeFileSync(manifest, JSON.stringify(ringManifest(), null, 2));
  });

  it('batch --all writes for every job exactly what the command prints with --json, then skips them all on a rerun', async () => {
    const run = await runCli(['batch', manifest, '--all', '--jobs', '2', '--json']);
    expect(run.stderr).not.toMatch(/error/);
    expect(run.status).toBe(0);
    const summary = JSON.parse(run.stdout) as { jobs: Array<{ name: string; status: string }> };
    expect(summary.jobs.map((j) => j.status)).toEqual(Array(6).fill('done'));

    const list = JSON.parse((await runCli(['batch', manifest, '--list', '--json'])).stdout) as { jobs: Array<{ name: string; argv: string[]; result: string }> };
    for (const job of list.jobs) {
      const direct = await runCli([...job.argv, '--json']);
      expect(direct.status).toBe(0);
      const fromBatch = JSON.parse(readFileSync(job.result, 'utf8'));
      expect(withoutTimings(fromBatch), job.name).toEqual(withoutTimings(JSON.parse(direct.stdout)));
    }

    const again = await runCli(['batch', manifest, '--all', '--json']);
    expect(again.status).toBe(0);
    expect((JSON.parse(again.stdout) as typeof summary).jobs.map((j) => j.status)).toEqual(Array(6).fill('skipped'));
  });

  it('batch --all results obey the physics: the full sector gives the exact ground energy, and smaller nested subspaces lie above it', async () => {
    await runCli(['batch', manifest, '--all']);
    const read = (name: string) => JSON.parse(readFileSync(join(dir, 'out', `${name}.json`), 'utf8')) as { energies: number[]; residuals: number[]; dimension: number };
    const full = read('full');
    // C(8,4) = 70 configurations of weight 4 (binomial coefficient); the seeded 4000 shots hit all of them.
    expect(full.dimension).toBe(70);
    // Reference: ml-matrix's dense symmetric eigensolver on all 256 configurations.
    const exact = Math.min(...new EigenvalueDecomposition(denseRing(), { assumeSymmetric: true }).realEigenvalues);
    // From memory: 8-site Heisenberg ring E0 = -3.651093 J in S·S units, times 4 for Pauli operators.
    closeTo(exact, -14.604374, 1e-5, 'dense ring ground energy');
    closeTo(full.energies[0]!, exact, 1e-9, 'batch full-sector energy');
    expect(full.residuals[0]!).toBeLessThan(1e-6);
    // Most-frequent-first truncations are nested, so by Cauchy interlacing the energy cannot rise as D grows.
    const scan = [10, 20, 40, 60].map((d) => read(`dim-${d}`));
    scan.forEach((r, i) => expect(r.dimension).toBe([10, 20, 40, 60][i]));
    for (let i = 1; i < scan.length; i++) expect(scan[i]!.energies[0]!).toBeLessThanOrEqual(scan[i - 1]!.energies[0]! + 1e-10);
    expect(full.energies[0]!).toBeLessThanOrEqual(scan[3]!.energies[0]! + 1e-10);
    expect(read('even').energies[0]!).toBeGreaterThanOrEqual(full.energies[0]! - 1e-10);
  });

  it('batch takes its job from the scheduler variable, minus one for SGE, and says which variable it used', async () => {
    const out = tempDir();
    const slurm = await runCli(['batch', manifest, '--output', out], { SLURM_ARRAY_TASK_ID: '2' });
    expect(slurm.status).toBe(0);
    expect(slurm.stderr).toContain('job 2 from SLURM_ARRAY_TASK_ID=2');
    const sge = await runCli(['batch', manifest, '--output', out], { SGE_TASK_ID: '1' });
    expect(sge.stderr).toContain('job 0 from SGE_TASK_ID=1 (SGE numbers tasks from 1)');
    expect(readdirSync(out).filter((f) => f.endsWith('.json')).sort()).toEqual(['dim-10.json', 'full.json']);
  });

  it('batch refuses a task out of range, no task at all, and two modes at once, with exit 2', async () => {
    const range = await runCli(['batch', manifest, '--task', '6']);
    expect(range.status).toBe(2);
    expect(range.stderr).toMatch(/job 6 does not exist: the manifest has 6 jobs \(0\.\.5\)/);
    const none = await runCli(['batch', manifest]);
    expect(none.status).toBe(2);
    expect(none.stderr).toContain('SLURM_ARRAY_TASK_ID');
    expect((await runCli(['batch', manifest, '--all', '--task', '1'])).status).toBe(2);
  });

  it('batch names the file and line of a manifest mistake in one line, exit 2', async () => {
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, '{\n  "output": "o",\n  "jobs": [\n    {"name": "../escape", "command": "solve"}\n  ]\n}\n');
    const r = await runCli(['batch', bad, '--all']);
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain(`${bad}:4:`);
    expect(existsSync(join(dir, 'o'))).toBe(false);
  });

  it('batch --print-sbatch prints a 0..N−1 array with CPUs from --threads (default 2) and creates the log folder', async () => {
    const out = tempDir();
    const r = await runCli(['batch', manifest, '--print-sbatch', '--output', out]);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('#SBATCH --array=0-5\n');
    expect(r.stdout).toContain('#SBATCH --cpus-per-task=2\n');
    expect(r.stdout).toContain(`#SBATCH --output=${out}/logs/`);
    expect(existsSync(join(out, 'logs'))).toBe(true);
    // The job list is saved so `collect DIR` knows what to expect without the manifest.
    expect(JSON.parse(readFileSync(join(out, '.bitspan', 'plan.json'), 'utf8')).jobs).toHaveLength(6);
    expect((await runCli(['batch', manifest, '--print-sbatch', '--output', out, '--threads', '3'])).stdout).toContain('--cpus-per-task=3\n');
  });
});
