import { createHash } from 'node:crypto';
import { promises as fsp } from 'node:fs';
import { BitspanError } from '../errors.js';
import type { PlannedJob } from './jobPlan.js';
import type { ManifestValue } from './manifest.js';
import { jobFiles, type JobErrorRecord, type JobMeta } from './runJob.js';

/** Why a job has no usable result. */
export interface CollectError {
  code: string;
  message: string;
  exitStatus?: number | null;
  signal?: string | null;
}

/**
 * One line of the collected table: the job, its status, its parameters and, when it finished, every
 * key of its result (what the command printed with `--json`).
 */
export interface CollectRow {
  name: string;
  index: number;
  status: 'ok' | 'failed' | 'missing';
  command: string | null;
  parameters: Record<string, ManifestValue> | null;
  error?: CollectError;
  [resultKey: string]: unknown;
}

/** The table `collect --json` prints. */
export interface Collected {
  rows: CollectRow[];
  /** Names of jobs with neither a result nor an error record. */
  missing: string[];
  /** Names of jobs that failed, or whose result file is damaged. */
  failed: string[];
}

/** Keys a result of a known command must hold; other commands need a non-empty object. */
const REQUIRED_KEYS: Record<string, string[]> = {
  solve: ['energies', 'residuals', 'dimension'],
};

/**
 * Gather the results of `jobs` from `dir`. Without `jobs`, the jobs are whatever result and error
 * files the folder holds (then nothing can be known to be missing).
 * @throws BitspanError `file-unreadable` when `dir` is not a readable folder
 */
export async function collect(dir: string, jobs?: readonly PlannedJob[]): Promise<Collected> {
  let names: string[];
  try {
    names = await fsp.readdir(dir);
  } catch (e) {
    throw new BitspanError('file-unreadable', `cannot read the output folder (${(e as NodeJS.ErrnoException).code ?? String(e)})`, 'give the "output" folder of the manifest', { file: dir });
  }
  const expected: PlannedJob[] =
    jobs?.slice() ??
    [...new Set(names.filter((n) => n.endsWith('.json') && !n.startsWith('.')).map((n) => n.replace(/(\.error)?\.json$/, '')))]
      .sort()
      .map((name, index) => ({ index, name, command: '', params: {} }));

  const rows: CollectRow[] = [];
  for (const job of expected) rows.push(await collectOne(dir, job, jobs !== undefined));
  return {
    rows,
    missing: rows.filter((r) => r.status === 'missing').map((r) => r.name),
    failed: rows.filter((r) => r.status === 'failed').map((r) => r.name),
  };
}

async function collectOne(dir: string, job: PlannedJob, known: boolean): Promise<CollectRow> {
  const files = jobFiles(dir, job.name);
  const row: CollectRow = { name: job.name, index: job.index, status: 'missing', command: known ? job.command : null, parameters: known ? job.params : null };

  const record = await readJson(files.error);
  if (record.state !== 'absent') {
    const r = (record.state === 'ok' && isObject(record.value) ? record.value : {}) as Partial<JobErrorRecord>;
    row.status = 'failed';
    row.error = {
      code: typeof r.code === 'string' ? r.code : 'unknown',
      message: typeof r.message === 'string' ? r.message : `unreadable error record ${files.error}`,
      exitStatus: r.exitStatus ?? null,
      signal: r.signal ?? null,
    };
    if (!known && typeof r.command === 'string') row.command = r.command;
    return row;
  }

  const result = await readJson(files.result);
  if (result.state === 'absent') return row;
  const fail = (message: string): CollectRow => {
    row.status = 'failed';
    row.error = { code: 'corrupt-result', message: `${files.result}: ${message}` };
    return row;
  };
  if (result.state === 'bad') return fail(`not valid JSON (${result.why}); rerun the job with --force`);
  const doc = result.value;
  if (!isObject(doc) || Object.keys(doc).length === 0) return fail('not a JSON object; rerun the job with --force');
  const command = known ? job.command : typeof doc.command === 'string' ? doc.command : null;
  const missingKeys = (REQUIRED_KEYS[command ?? ''] ?? []).filter((k) => !(k in doc));
  if (missingKeys.length) return fail(`lacks ${missingKeys.map((k) => `"${k}"`).join(', ')}; rerun the job with --force`);
  const bad = checkEnergies(doc);
  if (bad) return fail(`${bad}; rerun the job with --force`);
  // The sidecar's checksum catches a file cut short or edited into other valid JSON.
  const meta = await readJson(files.meta);
  if (meta.state === 'ok' && isObject(meta.value)) {
    const want = (meta.value as Partial<JobMeta>).resultSha256;
    if (typeof want === 'string' && want !== createHash('sha256').update(result.text).digest('hex')) {
      return fail('differs from what the job wrote (damaged or edited); rerun the job with --force');
    }
  }
  row.status = 'ok';
  row.command = command;
  for (const [k, v] of Object.entries(doc)) {
    if (Object.hasOwn(row, k) || k === '__proto__') continue;
    row[k] = v;
  }
  return row;
}

/** A reason when `energies`/`residuals` are present but not matching lists of numbers. */
function checkEnergies(doc: Record<string, unknown>): string | undefined {
  const numbers = (v: unknown): v is number[] => Array.isArray(v) && v.every((x) => typeof x === 'number');
  if ('energies' in doc && !numbers(doc.energies)) return '"energies" is not a list of numbers';
  if ('residuals' in doc && !numbers(doc.residuals)) return '"residuals" is not a list of numbers';
  if (numbers(doc.energies) && numbers(doc.residuals) && doc.energies.length !== doc.residuals.length) return '"energies" and "residuals" differ in length';
  if ('dimension' in doc && typeof doc.dimension !== 'number') return '"dimension" is not a number';
  return undefined;
}

type ReadResult = { state: 'absent' } | { state: 'bad'; why: string } | { state: 'ok'; value: unknown; text: string };

async function readJson(file: string): Promise<ReadResult> {
  let text: string;
  try {
    text = await fsp.readFile(file, 'utf8');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return { state: 'absent' };
    return { state: 'bad', why: (e as NodeJS.ErrnoException).code ?? String(e) };
  }
  try {
    return { state: 'ok', value: JSON.parse(text), text };
  } catch (e) {
    return { state: 'bad', why: (e as Error).message.replace(/\s+/g, ' ').slice(0, 100) };
  }
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}
