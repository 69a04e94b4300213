import { createHash } from 'node:crypto';
import { promises as fsp } from 'node:fs';
import { join } from 'node:path';
import { BitspanError } from '../errors.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { jobHash, sha256File, type DigestCache, type InputDigest } from './jobHash.js';
import type { BatchJob } from './manifest.js';

/**
 * Environment variable that makes the CLI print its one error line as `{"bitspanError": {...}}`,
 * so a supervising batch process can record the error's code and place.
 */
export const ERROR_FORMAT_ENV = 'BITSPAN_ERROR_FORMAT';

/** How a job's command process ended. */
export interface ExecResult {
  /** Exit status, or null when a signal ended it. */
  exitStatus: number | null;
  signal: string | null;
  stdout: string;
  /** The end of its stderr (enough for the error line). */
  stderr: string;
}

/** Runs a job's command line (`job.argv` plus `--json`) and reports how it ended. */
export type JobExecutor = (job: BatchJob) => Promise<ExecResult>;

/** The error record `<output>/<name>.error.json` a failed job leaves instead of a result. */
export interface JobErrorRecord {
  name: string;
  index: number;
  command: string;
  argv: string[];
  code: string;
  message: string;
  hint?: string;
  file?: string;
  line?: number;
  exitStatus: number | null;
  signal: string | null;
  finished: string;
}

/** The sidecar `<output>/.bitspan/meta/<name>.json` that lets a rerun skip an unchanged job. */
export interface JobMeta {
  name: string;
  index: number;
  command: string;
  argv: string[];
  /** `jobHash` of the command line and inputs the result came from. */
  hash: string;
  inputs: InputDigest[];
  /** SHA-256 of the result file as written, to notice a damaged or edited result. */
  resultSha256: string;
  seconds: number;
  finished: string;
}

/** What happened to one job. */
export interface JobOutcome {
  index: number;
  name: string;
  status: 'done' | 'skipped' | 'failed';
  seconds: number;
  error?: JobErrorRecord;
}

/** The files a job may write; distinct names give distinct files. */
export interface JobFiles {
  result: string;
  error: string;
  meta: string;
}

/** Folder of sidecar files inside the output folder. */
export const META_DIR = '.bitspan';

/** Where job `name` keeps its result, error record and sidecar. */
export function jobFiles(output: string, name: string): JobFiles {
  return { result: join(output, `${name}.json`), error: join(output, `${name}.error.json`), meta: join(output, META_DIR, 'meta', `${name}.json`) };
}

/** Options of `runJob`. */
export interface RunJobOptions {
  output: string;
  execute: JobExecutor;
  /** Run even if the result is up to date. */
  force?: boolean;
  /** Shared file digests, so inputs common to many jobs are read once. */
  digests?: DigestCache;
}

/**
 * Run one job unless its result is up to date: the result file is exactly the command's `--json`
 * output, written atomically, with a sidecar holding the input hash; a failure writes an error
 * record instead and leaves any earlier result in place.
 * @throws BitspanError `output-unwritable` when the output folder cannot be written
 */
export async function runJob(job: BatchJob, opts: RunJobOptions): Promise<JobOutcome> {
  const t0 = performance.now();
  const seconds = (): number => (performance.now() - t0) / 1000;
  const files = jobFiles(opts.output, job.name);
  await makeFolders(opts.output);
  const { hash, inputs } = await jobHash(job, opts.digests);
  if (!opts.force && (await isUpToDate(files, hash))) {
    // A crash after the result but before this removal would leave a stale record behind.
    await fsp.rm(files.error, { force: true });
    return { index: job.index, name: job.name, status: 'skipped', seconds: seconds() };
  }

  const run = await opts.execute(job);
  const failure = judge(run);
  if (failure) {
    const record: JobErrorRecord = { name: job.name, index: job.index, command: job.command, argv: job.argv, ...failure, exitStatus: run.exitStatus, signal: run.signal, finished: new Date().toISOString() };
    await writeFileAtomic(files.error, JSON.stringify(record, null, 2) + '\n');
    return { index: job.index, name: job.name, status: 'failed', seconds: seconds(), error: record };
  }
  await writeFileAtomic(files.result, run.stdout);
  const meta: JobMeta = {
    name: job.name,
    index: job.index,
    command: job.command,
    argv: job.argv,
    hash,
    inputs,
    resultSha256: sha256Text(run.stdout),
    seconds: seconds(),
    finished: new Date().toISOString(),
  };
  await writeFileAtomic(files.meta, JSON.stringify(meta, null, 2) + '\n');
  await fsp.rm(files.error, { force: true });
  return { index: job.index, name: job.name, status: 'done', seconds: seconds() };
}

async function makeFolders(output: string): Promise<void> {
  try {
    await fsp.mkdir(join(output, META_DIR, 'meta'), { recursive: true });
  } catch (e) {
    throw new BitspanError('output-unwritable', `cannot create the output folder (${(e as NodeJS.ErrnoException).code ?? String(e)})`, 'check "output" in the manifest and the folder permissions', { file: output });
  }
}

/** True when the result exists, is what the job wrote, and came from the same command and inputs. */
export async function isUpToDate(files: JobFiles, hash: string): Promise<boolean> {
  let meta: Partial<JobMeta>;
  try {
    meta = JSON.parse(await fsp.readFile(files.meta, 'utf8')) as Partial<JobMeta>;
  } catch {
    return false;
  }
  if (meta.hash !== hash) return false;
  try {
    return (await sha256File(files.result)) === meta.resultSha256;
  } catch {
    return false;
  }
}

/** The error of a finished command, or undefined when it printed a JSON object and exited 0. */
function judge(run: ExecResult): Pick<JobErrorRecord, 'code' | 'message' | 'hint' | 'file' | 'line'> | undefined {
  if (run.signal) return { code: 'killed', message: `the job's process was killed by ${run.signal}`, hint: 'out of memory or time? rerun the batch to redo it' };
  if (run.exitStatus !== 0) {
    const reported = reportedError(run.stderr);
    if (reported) return reported;
    const last = run.stderr.trim().split('\n').pop()?.trim() ?? '';
    return { code: run.exitStatus === 2 ? 'bad-argument' : 'internal', message: last || `the job exited with status ${run.exitStatus}` };
  }
  try {
    const doc: unknown = JSON.parse(run.stdout);
    if (typeof doc === 'object' && doc !== null && !Array.isArray(doc)) return undefined;
  } catch {
    /* reported below */
  }
  return { code: 'internal', message: 'the job exited 0 but did not print one JSON object' };
}

/** The `{"bitspanError": {...}}` line a CLI run with ERROR_FORMAT_ENV=json prints, if any. */
export function reportedError(stderr: string): Pick<JobErrorRecord, 'code' | 'message' | 'hint' | 'file' | 'line'> | undefined {
  const lines = stderr.split('\n');
  for (let i = lines.length - 1; i >= 0; i--) {
    const l = lines[i]!.trim();
    if (!l.startsWith('{"bitspanError"')) continue;
    try {
      const e = (JSON.parse(l) as { bitspanError: Record<string, unknown> }).bitspanError;
      if (typeof e.code !== 'string' || typeof e.message !== 'string') continue;
      return {
        code: e.code,
        message: e.message,
        hint: typeof e.hint === 'string' && e.hint ? e.hint : undefined,
        file: typeof e.file === 'string' ? e.file : undefined,
        line: typeof e.line === 'number' ? e.line : undefined,
      };
    } catch {
      /* not ours */
    }
  }
  return undefined;
}

function sha256Text(text: string): string {
  return createHash('sha256').update(text).digest('hex');
}
