import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { BitspanError } from '../errors.js';
import type { BatchJob } from '../batch/manifest.js';
import { ERROR_FORMAT_ENV, type ExecResult, type JobExecutor } from '../batch/runJob.js';

/** How much of a job's stderr is kept for its error record. */
const STDERR_TAIL = 64 * 1024;

/**
 * The words that start this bitspan's CLI in a new process: node and the compiled `bin.js` (from
 * TypeScript sources, as under vitest, the checkout's `dist/`).
 * @throws BitspanError `internal` when the compiled CLI is not there
 */
export function bitspanCommand(): string[] {
  const here = fileURLToPath(import.meta.url);
  const bin = here.endsWith('.ts') ? join(dirname(here), '..', '..', 'dist', 'src', 'cli', 'bin.js') : join(dirname(here), 'bin.js');
  if (!existsSync(bin)) throw new BitspanError('internal', `the compiled CLI ${bin} is missing`, 'run npm run build');
  return [process.execPath, bin];
}

/** Runs jobs as child processes and can stop them all. */
export interface JobProcesses {
  execute: JobExecutor;
  /** Send `signal` to every job still running. */
  stop(signal: NodeJS.Signals): void;
}

/**
 * An executor that runs each job as its own bitspan process (`<command> ... --json`), so a job
 * that crashes or is killed takes nothing else down. Its stderr lines are passed to `onLine`,
 * except the machine-readable error line.
 */
export function jobProcesses(command: string[], opts: { cwd: string; env: Record<string, string | undefined>; onLine?: (job: BatchJob, line: string) => void }): JobProcesses {
  const live = new Set<ChildProcess>();
  const execute = (job: BatchJob): Promise<ExecResult> =>
    new Promise((resolveRun) => {
      const child = spawn(command[0]!, [...command.slice(1), ...job.argv, '--json'], {
        cwd: opts.cwd,
        env: { ...opts.env, [ERROR_FORMAT_ENV]: 'json' },
        stdio: ['ignore', 'pipe', 'pipe'],
      });
      live.add(child);
      const out: Buffer[] = [];
      let err = '';
      let partial = '';
      child.stdout!.on('data', (b: Buffer) => out.push(b));
      child.stderr!.setEncoding('utf8');
      child.stderr!.on('data', (s: string) => {
        err = (err + s).slice(-STDERR_TAIL);
        const lines = (partial + s).split('\n');
        partial = lines.pop()!;
        for (const l of lines) if (l && !l.startsWith('{"bitspanError"')) opts.onLine?.(job, l);
      });
      let settled = false;
      const settle = (r: ExecResult): void => {
        if (settled) return;
        settled = true;
        live.delete(child);
        resolveRun(r);
      };
      child.on('error', (e) => settle({ exitStatus: 127, signal: null, stdout: '', stderr: `cannot start ${command[0]}: ${e.message}` }));
      child.on('close', (code, signal) => {
        if (partial && !partial.startsWith('{"bitspanError"')) opts.onLine?.(job, partial);
        settle({ exitStatus: code, signal, stdout: Buffer.concat(out).toString('utf8'), stderr: err });
      });
    });
  return {
    execute,
    stop(signal) {
      for (const c of live) c.kill(signal);
    },
  };
}
