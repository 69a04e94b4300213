import { beforeAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { runCli, tempDir } from '../helpers.js';
import { ringManifest, writeRingFixture } from './fixture.js';

const BIN = fileURLToPath(new URL('../../dist/src/cli/bin.js', import.meta.url));
const PRELOAD = fileURLToPath(new URL('./pause-preload.mjs', import.meta.url));

/** Start the compiled CLI in its own process group, optionally freezing jobs whose argv contains `pauseMatch`. */
function startCli(args: string[], pause?: { dir: string; match: string }) {
  const env: Record<string, string | undefined> = { ...process.env };
  if (pause) {
    env.NODE_OPTIONS = `${env.NODE_OPTIONS ?? ''} --import ${pathToFileURL(PRELOAD).href}`.trim();
    env.BITSPAN_TEST_PAUSE_DIR = pause.dir;
    env.BITSPAN_TEST_PAUSE_MATCH = pause.match;
  }
  const child = spawn(process.execPath, [BIN, ...args], { env, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
  let stderr = '';
  child.stderr!.on('data', (b) => (stderr += String(b)));
  child.stdout!.resume();
  const exited = new Promise<{ code: number | null; signal: string | null; stderr: string }>((res) => child.on('close', (code, signal) => res({ code, signal, stderr })));
  return { child, exited };
}

/** Wait (bounded) until a job has frozen mid-run; returns the pid of its process. */
async function pausedPid(dir: string): Promise<number> {
  for (let i = 0; i < 1500; i++) {
    const f = readdirSync(dir).find((n) => n.startsWith('paused-'));
    if (f) return Number(f.slice('paused-'.length));
    await new Promise((r) => setTimeout(r, 20));
  }
  throw new Error('no job froze within 30 s');
}

const leftovers = (out: string) => readdirSync(out).filter((n) => n.includes('.tmp-'));

describe('batch faults', () => {
  let dir: string;
  let manifest: string;
  beforeAll(() => {
    expect(existsSync(BIN), 'run npm run build first').toBe(true);
    dir = tempDir();
    writeRingFixture(dir);
    manifest = join(dir, 'm.json');
    writeFileSync(manifest, JSON.stringify(ringManifest(), null, 2));
  });

  it('batch --task killed with SIGKILL mid-run (whole process group) leaves no result, and a rerun completes the job', async () => {
    const out = join(dir, 'killed-task');
    const pause = join(dir, 'pause-a');
    mkdirSync(pause);
    const { child, exited } = startCli(['batch', manifest, '--task', '0', '--output', out], { dir: pause, match: '--eigs' });
    await pausedPid(pause);
    // Half of the report has reached the batch process: this is the worst moment to die.
    process.kill(-child.pid!, 'SIGKILL');
    expect((await exited).signal).toBe('SIGKILL');
    expect(existsSync(join(out, 'full.json'))).toBe(false);
    expect(existsSync(join(out, 'full.error.json'))).toBe(false);
    expect(leftovers(out)).toEqual([]);
    const before = JSON.parse((await runCli(['collect', out, '--manifest', manifest, '--json'])).stdout);
    expect(before.missing).toContain('full');

    const rerun = await runCli(['batch', manifest, '--task', '0', '--output', out]);
    expect(rerun.status).toBe(0);
    const report = JSON.parse(readFileSync(join(out, 'full.json'), 'utf8'));
    expect(report.dimension).toBe(70);
  });

  it('batch --all survives one job killed with SIGKILL: the others finish, the killed one gets an error record, and a rerun redoes only it', async () => {
    const out = join(dir, 'killed-one');
    const pause = join(dir, 'pause-b');
    mkdirSync(pause);
    const { exited } = startCli(['batch', manifest, '--all', '--jobs', '3', '--output', out], { dir: pause, match: '20' });
    process.kill(await pausedPid(pause), 'SIGKILL');
    const run = await exited;
    expect(run.code).toBe(3);
    expect(run.stderr).toMatch(/dim-20: FAILED .*killed by SIGKILL/);
    const record = JSON.parse(readFileSync(join(out, 'dim-20.error.json'), 'utf8'));
    expect(record).toMatchObject({ name: 'dim-20', code: 'killed', signal: 'SIGKILL', exitStatus: null });
    expect(existsSync(join(out, 'dim-20.json'))).toBe(false);
    expect(leftovers(out)).toEqual([]);
    const failed = JSON.parse((await runCli(['collect', out, '--json'])).stdout);
    expect(failed.failed).toEqual(['dim-20']);
    expect(failed.rows.filter((r: { status: string }) => r.status === 'ok')).toHaveLength(5);

    const rerun = await runCli(['batch', manifest, '--all', '--output', out, '--json']);
    expect(rerun.status).toBe(0);
    const statuses = Object.fromEntries((JSON.parse(rerun.stdout).jobs as Array<{ name: string; status: string }>).map((j) => [j.name, j.status]));
    expect(statuses).toEqual({ full: 'skipped', even: 'skipped', 'dim-10': 'skipped', 'dim-20': 'done', 'dim-40': 'skipped', 'dim-60': 'skipped' });
    expect(existsSync(join(out, 'dim-20.error.json'))).toBe(false);
    expect((await runCli(['collect', out])).status).toBe(0);
  });

  it('batch --all stopped with SIGTERM stops its jobs, leaves earlier results untouched, removes temporary files and exits 143', async () => {
    const out = join(dir, 'interrupted');
    expect((await runCli(['batch', manifest, '--all', '--output', out])).status).toBe(0);
    const before = new Map(readdirSync(out).filter((n) => n.endsWith('.json')).map((n) => [n, readFileSync(join(out, n), 'utf8')]));
    const pause = join(dir, 'pause-c');
    mkdirSync(pause);
    const { child, exited } = startCli(['batch', manifest, '--all', '--force', '--jobs', '1', '--output', out], { dir: pause, match: '--eigs' });
    const jobPid = await pausedPid(pause);
    child.kill('SIGTERM');
    expect((await exited).code).toBe(143);
    // The job process went with it rather than running on as an orphan.
    let gone = false;
    for (let i = 0; i < 250 && !gone; i++) {
      try {
        process.kill(jobPid, 0);
        await new Promise((r) => setTimeout(r, 20));
      } catch {
        gone = true;
      }
    }
    expect(gone).toBe(true);
    for (const [n, text] of before) expect(readFileSync(join(out, n), 'utf8'), n).toBe(text);
    expect(leftovers(out)).toEqual([]);
    expect(existsSync(join(out, 'full.error.json'))).toBe(false);
  });

  it('batch array tasks started all at once on one folder each write only their own files', async () => {
    const out = join(dir, 'concurrent');
    const tasks = [0, 1, 2, 3, 4, 5].map((i) => startCli(['batch', manifest, '--task', String(i), '--output', out]).exited);
    for (const t of await Promise.all(tasks)) expect(t.code, t.stderr).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['.bitspan', 'dim-10.json', 'dim-20.json', 'dim-40.json', 'dim-60.json', 'even.json', 'full.json']);
    expect(readdirSync(join(out, '.bitspan', 'meta')).sort()).toEqual(['dim-10.json', 'dim-20.json', 'dim-40.json', 'dim-60.json', 'even.json', 'full.json']);
    // Each file holds its own job's answer.
    for (const d of [10, 20, 40, 60]) expect(JSON.parse(readFileSync(join(out, `dim-${d}.json`), 'utf8')).dimension).toBe(d);
    const c = JSON.parse((await runCli(['collect', out, '--manifest', manifest, '--json'])).stdout);
    expect([c.missing, c.failed]).toEqual([[], []]);
  });
});
