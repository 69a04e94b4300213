// End-to-end on a real scheduler: a one-node Slurm cluster on this machine runs a manifest as an
// array job submitted with sbatch; its collected table must match the same jobs run with --all.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { closeTo, runCli, tempDir } from '../helpers.js';
import { ringManifest, writeRingFixture } from './fixture.js';

const CLUSTER = fileURLToPath(new URL('./slurm/local-cluster.sh', import.meta.url));
const BIN = fileURLToPath(new URL('../../dist/src/cli/bin.js', import.meta.url));
/** CI services set CI (usually to "true"); "0" or "false" means not on CI. */
const onCi = !!process.env.CI && !/^(0|false)$/i.test(process.env.CI);

interface Ran {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Run a program to completion, killing it after `timeoutMs`. */
function run(cmd: string, args: string[], timeoutMs: number, env: Record<string, string | undefined> = process.env): Promise<Ran> {
  return new Promise((resolveRun) => {
    const child = spawn(cmd, args, { env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (b) => (stdout += String(b)));
    child.stderr.on('data', (b) => (stderr += String(b)));
    const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs);
    child.on('close', (code) => {
      clearTimeout(timer);
      resolveRun({ code, stdout, stderr });
    });
  });
}

describe('batch on a Slurm cluster', () => {
  const state = tempDir('bitspan-slurm-');
  const work = tempDir('bitspan-slurm-work-');
  let slurmConf: string | undefined;
  let unavailable: string | undefined;
  const timings: Record<string, number> = {};

  beforeAll(async () => {
    const t0 = performance.now();
    const up = await run('bash', [CLUSTER, 'up', state], 75_000);
    timings.up = (performance.now() - t0) / 1000;
    if (up.code === 3) {
      unavailable = up.stderr.trim().split('\n').pop() ?? 'local-cluster.sh exited 3';
      return;
    }
    if (up.code !== 0) throw new Error(`local-cluster.sh up failed (exit ${up.code}): ${up.stderr.trim()}`);
    slurmConf = /^SLURM_CONF=(.+)$/.exec(up.stdout.trim().split('\n').pop() ?? '')?.[1];
    if (!slurmConf) throw new Error(`local-cluster.sh up printed no SLURM_CONF line: ${up.stdout}`);
  }, 80_000);

  afterAll(async () => {
    // Always, even after a failure: the script stops only the daemons it started.
    const down = await run('bash', [CLUSTER, 'down', state], 45_000);
    rmSync(work, { recursive: true, force: true });
    // The state folder holds the daemons' logs: kept when something went wrong.
    if (down.code === 0) rmSync(state, { recursive: true, force: true });
    else process.stderr.write(`slurm.test: local-cluster.sh down exited ${down.code} (logs in ${state}): ${down.stderr.trim()}\n`);
  }, 50_000);

  it('batch --print-sbatch run as a Slurm array job gives the same collected energies as batch --all', async (ctx) => {
    if (unavailable) {
      // On CI the scheduler test must run; elsewhere a machine without apt or daemons skips it.
      if (onCi) throw new Error(`Slurm test cannot run on CI: ${unavailable}`);
      process.stderr.write(`slurm.test: skipped, no local Slurm cluster: ${unavailable}\n`);
      ctx.skip(unavailable);
    }
    expect(existsSync(BIN), 'the compiled CLI is missing; run npm run build').toBe(true);
    writeRingFixture(work);
    const manifest = join(work, 'm.json');
    writeFileSync(manifest, JSON.stringify(ringManifest(), null, 2));
    const onSlurm = join(work, 'slurm-out');
    const local = join(work, 'local-out');
    const env = { ...process.env, SLURM_CONF: slurmConf };

    // The script comes from the compiled CLI, exactly as a user would make it.
    const script = await run(process.execPath, [BIN, 'batch', manifest, '--print-sbatch', '--output', onSlurm, '--threads', '1'], 30_000);
    expect(script.code, script.stderr).toBe(0);
    const scriptFile = join(work, 'array.sh');
    writeFileSync(scriptFile, script.stdout);

    const t0 = performance.now();
    const submitted = await run('sbatch', ['--parsable', scriptFile], 30_000, env);
    expect(submitted.code, submitted.stderr).toBe(0);
    const jobId = submitted.stdout.trim().split(';')[0]!;
    expect(jobId).toMatch(/^\d+$/);
    // Without slurmdbd there is no sacct: the array is done when squeue no longer lists it.
    let done = false;
    for (let i = 0; i < 240 && !done; i++) {
      const q = await run('squeue', ['-h', '-j', jobId], 10_000, env);
      done = (q.code === 0 && q.stdout.trim() === '') || /Invalid job id/i.test(q.stderr);
      if (!done) await new Promise((r) => setTimeout(r, 250));
    }
    timings.array = (performance.now() - t0) / 1000;
    expect(done, `array job ${jobId} still queued after 60 s`).toBe(true);

    const logs = join(onSlurm, 'logs');
    const errLogs = readdirSync(logs).filter((f) => f.endsWith('.err') && f.includes(jobId));
    const logText = errLogs.map((f) => `${f}: ${readFileSync(join(logs, f), 'utf8')}`).join('\n');
    const collectBoth = (dir: string, csv: string) => runCli(['collect', dir, '--manifest', manifest, '--json', '--no-timings', '--csv', csv]);
    const fromSlurm = await collectBoth(onSlurm, join(work, 'slurm.csv'));
    expect(fromSlurm.status, `collect after the array job: ${fromSlurm.stderr}\n${logText}`).toBe(0);
    // Every task took its job from SLURM_ARRAY_TASK_ID and said so in its log.
    expect(errLogs).toHaveLength(6);
    for (let i = 0; i < 6; i++) expect(logText).toContain(`job ${i} from SLURM_ARRAY_TASK_ID=${i}`);

    const t1 = performance.now();
    const all = await runCli(['batch', manifest, '--all', '--output', local]);
    timings.all = (performance.now() - t1) / 1000;
    expect(all.status, all.stderr).toBe(0);
    const here = await collectBoth(local, join(work, 'local.csv'));
    expect(here.status).toBe(0);

    type Row = { name: string; status: string; dimension: number; energies: number[]; residuals: number[] };
    const a = JSON.parse(fromSlurm.stdout).rows as Row[];
    const b = JSON.parse(here.stdout).rows as Row[];
    expect(a.map((r) => r.name)).toEqual(b.map((r) => r.name));
    expect(a).toHaveLength(6);
    a.forEach((r, i) => {
      const s = b[i]!;
      expect([r.status, s.status]).toEqual(['ok', 'ok']);
      expect(r.dimension).toBe(s.dimension);
      expect(r.energies).toHaveLength(s.energies.length);
      // Same inputs and seed must give the same energies to 1e-10 wherever they run (issue 7, determinism).
      r.energies.forEach((e, k) => closeTo(e, s.energies[k]!, 1e-10, `${r.name} energy ${k}`));
    });
    // Without timings, the two tables are the same table.
    expect(JSON.parse(fromSlurm.stdout)).toEqual(JSON.parse(here.stdout));
    expect(readFileSync(join(work, 'slurm.csv'), 'utf8')).toBe(readFileSync(join(work, 'local.csv'), 'utf8'));
    process.stderr.write(`slurm.test: cluster up ${timings.up!.toFixed(1)} s, array job ${timings.array!.toFixed(1)} s, --all ${timings.all!.toFixed(1)} s\n`);
  }, 90_000);
});
