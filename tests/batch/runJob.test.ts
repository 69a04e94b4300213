import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { isSafeJobName, type BatchJob } from '../../src/batch/manifest.js';
import { jobFiles, runJob, type ExecResult, type JobExecutor } from '../../src/batch/runJob.js';
import { tempDir, writeFiles } from '../helpers.js';

function job(dir: string, name = 'j', extra: string[] = []): BatchJob {
  const input = join(dir, 'in.txt');
  return { index: 0, name, command: 'solve', params: {}, argv: ['solve', '--hamiltonian', input, ...extra], inputs: [input], origin: 'jobs[0]' };
}

/** An executor that records its calls and answers with `result`. */
function fake(result: Partial<ExecResult>): JobExecutor & { calls: number } {
  const f = (async () => {
    f.calls++;
    return { exitStatus: 0, signal: null, stdout: '', stderr: '', ...result };
  }) as JobExecutor & { calls: number };
  f.calls = 0;
  return f;
}

const REPORT = '{\n  "command": "solve",\n  "energies": [-1.5],\n  "residuals": [1e-12],\n  "dimension": 4\n}\n';

describe('runJob', () => {
  it('runJob writes exactly what the command printed, and a sidecar, and no error record', async () => {
    const dir = tempDir();
    writeFiles(dir, { 'in.txt': 'h' });
    const out = join(dir, 'out');
    const o = await runJob(job(dir), { output: out, execute: fake({ stdout: REPORT }) });
    expect(o.status).toBe('done');
    const files = jobFiles(out, 'j');
    expect(readFileSync(files.result, 'utf8')).toBe(REPORT);
    expect(JSON.parse(readFileSync(files.meta, 'utf8')).inputs[0].path).toBe(join(dir, 'in.txt'));
    expect(existsSync(files.error)).toBe(false);
  });

  it('runJob skips an unchanged job and reruns when an input, the command line or the result changes, or with force', async () => {
    const dir = tempDir();
    writeFiles(dir, { 'in.txt': 'h' });
    const out = join(dir, 'out');
    const exec = fake({ stdout: REPORT });
    const run = (j = job(dir), force = false) => runJob(j, { output: out, execute: exec, force });
    await run();
    expect((await run()).status).toBe('skipped');
    expect(exec.calls).toBe(1);
    writeFileSync(join(dir, 'in.txt'), 'h2');
    expect((await run()).status).toBe('done');
    expect((await run(job(dir, 'j', ['--eigs', '2']))).status).toBe('done');
    expect((await run(job(dir, 'j', ['--eigs', '2']))).status).toBe('skipped');
    expect((await run(job(dir, 'j', ['--eigs', '2']), true)).status).toBe('done');
    // A result damaged after the fact is redone, not trusted.
    writeFileSync(jobFiles(out, 'j').result, REPORT.slice(0, 20));
    expect((await run(job(dir, 'j', ['--eigs', '2']))).status).toBe('done');
    expect(readFileSync(jobFiles(out, 'j').result, 'utf8')).toBe(REPORT);
    expect(exec.calls).toBe(5);
  });

  it('runJob records a failure with the code and place the command reported, keeping an earlier result', async () => {
    const dir = tempDir();
    writeFiles(dir, { 'in.txt': 'h' });
    const out = join(dir, 'out');
    await runJob(job(dir), { output: out, execute: fake({ stdout: REPORT }) });
    const line = JSON.stringify({ bitspanError: { code: 'bad-samples', message: 'count is negative', hint: 'fix it', file: '/d/t.csv', line: 7 } });
    const o = await runJob(job(dir), { output: out, force: true, execute: fake({ exitStatus: 2, stderr: `warning: x\n${line}\n` }) });
    expect(o.status).toBe('failed');
    const record = JSON.parse(readFileSync(jobFiles(out, 'j').error, 'utf8'));
    expect(record).toMatchObject({ name: 'j', code: 'bad-samples', message: 'count is negative', file: '/d/t.csv', line: 7, exitStatus: 2, signal: null });
    expect(readFileSync(jobFiles(out, 'j').result, 'utf8')).toBe(REPORT);
    // The next success clears the record.
    await runJob(job(dir), { output: out, force: true, execute: fake({ stdout: REPORT }) });
    expect(existsSync(jobFiles(out, 'j').error)).toBe(false);
  });

  it('runJob records a killed process and a command that printed no JSON object as failures, writing no result', async () => {
    const dir = tempDir();
    writeFiles(dir, { 'in.txt': 'h' });
    const out = join(dir, 'out');
    const killed = await runJob(job(dir, 'k'), { output: out, execute: fake({ exitStatus: null, signal: 'SIGKILL', stdout: '{"half":' }) });
    expect(killed.error).toMatchObject({ code: 'killed', signal: 'SIGKILL' });
    const noJson = await runJob(job(dir, 'n'), { output: out, execute: fake({ stdout: 'E0 = -1.5' }) });
    expect(noJson.error?.code).toBe('internal');
    const plain = await runJob(job(dir, 'p'), { output: out, execute: fake({ exitStatus: 2, stderr: "error: unknown option '--bogus'\n" }) });
    expect(plain.error).toMatchObject({ code: 'bad-argument', message: "error: unknown option '--bogus'" });
    for (const n of ['k', 'n', 'p']) expect(existsSync(jobFiles(out, n).result)).toBe(false);
  });

  it('jobFiles gives distinct jobs disjoint files, so two tasks never write the same file', () => {
    const name = fc.stringMatching(/^[A-Za-z0-9_][A-Za-z0-9._-]{0,12}$/).filter(isSafeJobName);
    fc.assert(
      fc.property(name, name, (a, b) => {
        fc.pre(a.toLowerCase() !== b.toLowerCase());
        const fa = Object.values(jobFiles('/o', a)).map((p) => p.toLowerCase());
        const fb = Object.values(jobFiles('/o', b)).map((p) => p.toLowerCase());
        expect(fa.filter((p) => fb.includes(p))).toEqual([]);
      }),
      { seed: 3, numRuns: 2000 },
    );
  });
});
