import { promises as fsp } from 'node:fs';
import { dirname, isAbsolute, resolve } from 'node:path';
import { BitspanError } from '../errors.js';
import { parseJsonWithLines, type JsonPath, type JsonWithLines } from '../io/jsonWithLines.js';
import type { CommandCatalog, OptionSpec } from './commandSpec.js';

/** A scalar a manifest may give an option. */
export type ManifestScalar = string | number | boolean;
/** What a manifest key may hold: a scalar or a list of scalars. */
export type ManifestValue = ManifestScalar | ManifestScalar[];

/** One job of a manifest, ready to run. */
export interface BatchJob {
  /** Position 0..N−1: listed jobs first, then grids in order. */
  index: number;
  name: string;
  command: string;
  /** The job's keys as written (defaults and grid values applied, paths as written). */
  params: Record<string, ManifestValue>;
  /** Command line after the program name, paths resolved, without `--json`. */
  argv: string[];
  /** Absolute paths of the job's input files, in option order. */
  inputs: string[];
  /** Where the job is defined, for messages: `jobs[2]` or `grids[0] combination 3`. */
  origin: string;
}

/** A validated, expanded manifest. */
export interface Manifest {
  /** Absolute path of the manifest file. */
  file: string;
  /** Folder relative paths resolve against. */
  dir: string;
  /** Absolute output folder. */
  output: string;
  jobs: BatchJob[];
}

/** Largest manifest read; a manifest is a list of jobs, not data. */
const MAX_MANIFEST_BYTES = 64 * 1024 * 1024;
/** Largest number of jobs a manifest may expand to (a guard against runaway grids). */
export const MAX_JOBS = 100_000;
const TOP_KEYS = ['output', 'defaults', 'jobs', 'grids', 'description'];
/** Longest job name: it becomes a file name, with suffixes. */
const MAX_NAME = 120;

/**
 * Whether `name` can be a job name: it becomes `<output>/<name>.json`, so it must be one plain file
 * name (letters, digits, `.`, `_`, `-`; starting with a letter, digit or `_`; not ending in
 * `.error`, which names error records).
 */
export function isSafeJobName(name: string): boolean {
  return name.length <= MAX_NAME && /^[A-Za-z0-9_][A-Za-z0-9._-]*$/.test(name) && !/\.error$/i.test(name) && !name.endsWith('.');
}

/**
 * Read and expand a manifest file.
 * @throws BitspanError `file-unreadable`, or `bad-manifest` naming the job, the key and the line
 */
export async function readManifest(file: string, catalog: CommandCatalog): Promise<Manifest> {
  const abs = resolve(file);
  let text: string;
  try {
    const st = await fsp.stat(abs);
    if (!st.isFile()) throw new BitspanError('file-unreadable', 'manifest is not a regular file', 'give the path of a JSON manifest', { file });
    if (st.size > MAX_MANIFEST_BYTES) throw new BitspanError('too-large', 'manifest is larger than 64 MiB', 'use grids instead of listing every job', { file });
    text = await fsp.readFile(abs, 'utf8');
  } catch (e) {
    if (e instanceof BitspanError) throw e;
    throw new BitspanError('file-unreadable', `cannot read manifest (${(e as NodeJS.ErrnoException).code ?? String(e)})`, 'check the path', { file });
  }
  return parseManifest(text, abs, catalog);
}

/**
 * Validate and expand manifest text. Jobs are indexed in the order listed, then each grid's
 * combinations in grid order, the first `vary` key changing slowest.
 * @param file absolute path of the manifest (relative paths resolve against its folder)
 * @throws BitspanError `bad-manifest` naming the job, the key and the line
 */
export function parseManifest(text: string, file: string, catalog: CommandCatalog): Manifest {
  if (text.trim() === '') throw new BitspanError('file-empty', 'manifest is empty', 'write {"output": "results", "jobs": [...]}', { file });
  const doc = parseJsonWithLines(text, file, 'bad-manifest');
  const dir = dirname(file);
  const fail = (message: string, hint: string, path: JsonPath): never => {
    throw new BitspanError('bad-manifest', message, hint, { file, line: doc.lineOf(path) });
  };
  const top = doc.value;
  if (!isObject(top)) return fail('the manifest is not a JSON object', 'write {"output": "results", "jobs": [...]}', []);
  for (const k of Object.keys(top)) {
    if (!TOP_KEYS.includes(k)) fail(`unknown top-level key "${k}"`, `expected ${TOP_KEYS.map((t) => `"${t}"`).join(', ')}${suggest(k, TOP_KEYS)}`, [k]);
  }
  if (typeof top.output !== 'string' || top.output.trim() === '') {
    fail('"output" is missing or not a folder name', 'write "output": "results" (relative to the manifest)', top.output === undefined ? [] : ['output']);
  }
  const output = resolve(dir, top.output as string);

  const defaults = top.defaults ?? {};
  if (!isObject(defaults)) fail('"defaults" is not an object', 'write "defaults": {"hamiltonian": "h.txt"}', ['defaults']);
  if ('name' in (defaults as object)) fail('"defaults" may not hold "name"', 'every job names itself', ['defaults', 'name']);
  const jobsIn = top.jobs ?? [];
  const gridsIn = top.grids ?? [];
  if (!Array.isArray(jobsIn)) fail('"jobs" is not a list', 'write "jobs": [{"name": ..., "command": "solve", ...}]', ['jobs']);
  if (!Array.isArray(gridsIn)) fail('"grids" is not a list', 'write "grids": [{"name": "scan-{maxDim}", "vary": {...}}]', ['grids']);

  const ctx: Context = { doc, file, dir, catalog, defaults: defaults as Record<string, unknown>, namePaths: new Map() };
  const jobs: BatchJob[] = [];
  (jobsIn as unknown[]).forEach((j, i) => {
    if (!isObject(j)) fail(`jobs[${i}] is not an object`, 'each job is {"name": ..., "command": ..., options...}', ['jobs', i]);
    const keys: Record<string, Source> = {};
    for (const [k, v] of Object.entries(j as Record<string, unknown>)) keys[k] = { value: v, path: ['jobs', i, k] };
    jobs.push(buildJob(ctx, keys, jobs.length, `jobs[${i}]`, ['jobs', i]));
  });
  (gridsIn as unknown[]).forEach((g, gi) => {
    for (const job of expandGrid(ctx, g, gi, jobs.length)) jobs.push(job);
  });
  if (jobs.length === 0) fail('the manifest has no jobs', 'add "jobs" or "grids"', []);
  checkNamesUnique(jobs, ctx.namePaths, fail);
  return { file, dir, output, jobs };
}

interface Context {
  doc: JsonWithLines;
  file: string;
  dir: string;
  catalog: CommandCatalog;
  defaults: Record<string, unknown>;
  /** Where each job's name was written, by job index, for duplicate-name errors. */
  namePaths: Map<number, JsonPath>;
}

/** A key's value and where in the document it was written. */
interface Source {
  value: unknown;
  path: JsonPath;
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function isScalar(v: unknown): v is ManifestScalar {
  return typeof v === 'string' || typeof v === 'boolean' || (typeof v === 'number' && Number.isFinite(v));
}

function expandGrid(ctx: Context, g: unknown, gi: number, firstIndex: number): BatchJob[] {
  const fail = (message: string, hint: string, path: JsonPath): never => {
    throw new BitspanError('bad-manifest', message, hint, { file: ctx.file, line: ctx.doc.lineOf(path) });
  };
  if (!isObject(g)) return fail(`grids[${gi}] is not an object`, 'each grid is {"name": "scan-{maxDim}", "command": ..., "vary": {...}}', ['grids', gi]);
  const label = typeof g.name === 'string' ? `grid '${g.name}' (grids[${gi}])` : `grids[${gi}]`;
  const vary = g.vary;
  if (!isObject(vary) || Object.keys(vary).length === 0) {
    fail(`${label}: "vary" is missing or empty`, 'write "vary": {"maxDim": [1000, 2000]}', g.vary === undefined ? ['grids', gi] : ['grids', gi, 'vary']);
  }
  const varyKeys = Object.keys(vary as object);
  let total = 1;
  for (const k of varyKeys) {
    const list = (vary as Record<string, unknown>)[k];
    if (!Array.isArray(list) || list.length === 0) fail(`${label}: vary.${k} is not a non-empty list`, `write "${k}": [value, value, ...]`, ['grids', gi, 'vary', k]);
    if (k in g) fail(`${label}: "${k}" is both fixed and varied`, `remove "${k}" from the grid or from "vary"`, ['grids', gi, k]);
    if (k === 'name' || k === 'command') fail(`${label}: "${k}" cannot be varied`, 'write one grid per command', ['grids', gi, 'vary', k]);
    total *= (list as unknown[]).length;
  }
  if (firstIndex + total > MAX_JOBS) fail(`${label} expands to ${total} jobs, more than the limit of ${MAX_JOBS} in one manifest`, 'split the scan over several manifests', ['grids', gi, 'vary']);
  if (typeof g.name !== 'string' || g.name === '') fail(`${label} has no "name"`, 'write a name template such as "scan-{maxDim}"', ['grids', gi]);
  const template = g.name as string;

  const jobs: BatchJob[] = [];
  const lists = varyKeys.map((k) => (vary as Record<string, unknown[]>)[k]!);
  // Odometer over the combinations; the last vary key changes fastest.
  const at = varyKeys.map(() => 0);
  for (let c = 0; c < total; c++) {
    const keys: Record<string, Source> = {};
    for (const [k, v] of Object.entries(g)) if (k !== 'vary') keys[k] = { value: v, path: ['grids', gi, k] };
    varyKeys.forEach((k, j) => (keys[k] = { value: lists[j]![at[j]!], path: ['grids', gi, 'vary', k, at[j]!] }));
    const name = fillTemplate(template, keys, varyKeys, at, ctx.defaults, (msg, hint) => fail(`${label}: ${msg}`, hint, ['grids', gi, 'name']));
    keys.name = { value: name, path: ['grids', gi, 'name'] };
    jobs.push(buildJob(ctx, keys, firstIndex + c, `${label} combination ${c}`, ['grids', gi]));
    for (let j = at.length - 1; j >= 0; j--) {
      if (++at[j]! < lists[j]!.length) break;
      at[j] = 0;
    }
  }
  return jobs;
}

/** Fill `{key}` with the job's value of key and `{#key}` with the position of that value in `vary`. */
function fillTemplate(
  template: string,
  keys: Record<string, Source>,
  varyKeys: string[],
  at: number[],
  defaults: Record<string, unknown>,
  fail: (msg: string, hint: string) => never,
): string {
  return template.replace(/\{(#?)([^{}]*)\}/g, (_m, hash: string, key: string) => {
    if (hash) {
      const j = varyKeys.indexOf(key);
      if (j < 0) fail(`name placeholder {#${key}} names no "vary" key`, `use one of ${varyKeys.map((k) => `{#${k}}`).join(', ')}`);
      return String(at[j]);
    }
    const v = Object.hasOwn(keys, key) ? keys[key]!.value : Object.hasOwn(defaults, key) ? defaults[key] : undefined;
    if (v === undefined) fail(`name placeholder {${key}} names no key of the job`, `use one of ${varyKeys.map((k) => `{${k}}`).join(', ')}`);
    return Array.isArray(v) ? v.map(String).join('_') : String(v);
  });
}

function buildJob(ctx: Context, own: Record<string, Source>, index: number, origin: string, where: JsonPath): BatchJob {
  const { catalog } = ctx;
  const file = ctx.file;
  const fail = (message: string, hint: string, path: JsonPath): never => {
    throw new BitspanError('bad-manifest', message, hint, { file, line: ctx.doc.lineOf(path) });
  };
  const rawName = own.name?.value;
  if (typeof rawName !== 'string' || rawName === '') return fail(`${origin} has no "name"`, 'give every job a name; it names the result file', own.name?.path ?? where);
  const name = rawName;
  const label = `job '${name}' (${origin})`;
  ctx.namePaths.set(index, own.name!.path);
  if (!isSafeJobName(name)) {
    fail(
      `${label}: name is not a plain file name`,
      /[/\\]|\.\./.test(name) ? 'a name may not contain slashes or lead out of the output folder' : 'use letters, digits, ".", "_" and "-", starting with a letter, digit or "_" (and not ending in ".error")',
      own.name!.path,
    );
  }

  const merged: Record<string, Source> = {};
  for (const [k, v] of Object.entries(ctx.defaults)) merged[k] = { value: v, path: ['defaults', k] };
  for (const [k, s] of Object.entries(own)) merged[k] = s;
  const cmdSrc = merged.command;
  if (typeof cmdSrc?.value !== 'string') {
    fail(`${label} has no "command"`, `write "command": one of ${[...catalog.keys()].join(', ')}`, cmdSrc?.path ?? own.name!.path);
  }
  const command = cmdSrc!.value as string;
  const spec = catalog.get(command);
  if (!spec) fail(`${label}: unknown command "${command}"`, `a manifest job runs one of ${[...catalog.keys()].join(', ')}${suggest(command, [...catalog.keys()])}`, cmdSrc!.path);

  const params: Record<string, ManifestValue> = {};
  for (const [k, s] of Object.entries(merged)) {
    if (k === 'name' || k === 'command') continue;
    const opt = spec!.options.get(k);
    if (!opt) {
      // A default meant for another command's jobs is skipped; a key nobody knows is a typo.
      if (s.path[0] === 'defaults' && [...catalog.values()].some((c) => c.options.has(k))) continue;
      const known = [...spec!.options.values()].filter((o) => !o.writesOutput).map((o) => o.key);
      fail(`${label}: "${k}" is not an option of ${command}`, `keys are ${command}'s long options in camelCase${suggest(k, known)}`, s.path);
    }
    if (opt!.writesOutput) fail(`${label}: "${k}" (${opt!.flag}) writes its own file, which batch does not allow`, `batch writes each result to <output>/${name}.json; remove "${k}"`, s.path);
    params[k] = checkValue(s, opt!, label, fail);
  }

  const argv: string[] = [command];
  const inputs: string[] = [];
  for (const opt of spec!.options.values()) {
    const v = params[opt.key];
    if (v === undefined) {
      if (opt.required) fail(`${label} has no "${opt.key}"`, `${command} needs ${opt.flag}; set "${opt.key}" in the job or in "defaults"`, where);
      continue;
    }
    const list = Array.isArray(v) ? v : [v];
    const strings = list.map((x) => {
      const s = String(x);
      if (!opt.path) return s;
      const p = isAbsolute(s) ? s : resolve(ctx.dir, s);
      inputs.push(p);
      return p;
    });
    if (opt.kind === 'boolean') {
      // A negate-only option (`--no-x` alone) is on by default: true adds nothing.
      if (v === true) {
        if (opt.flag) argv.push(opt.flag);
      } else if (opt.negateFlag) argv.push(opt.negateFlag);
    } else if (opt.kind === 'list' && strings.every((s) => !s.startsWith('-'))) {
      argv.push(opt.flag, ...strings);
    } else {
      // `--flag=value` keeps a value such as -1 from being read as an option.
      for (const s of strings) argv.push(...(s.startsWith('-') ? [`${opt.flag}=${s}`] : [opt.flag, s]));
    }
  }
  return { index, name, command, params, argv, inputs, origin };
}

/** Check one value against its option, with the command's own parser; returns it as stored. */
function checkValue(s: Source, opt: OptionSpec, label: string, fail: (m: string, h: string, p: JsonPath) => never): ManifestValue {
  const v = s.value;
  const field = `${label}: "${opt.key}"`;
  if (opt.kind === 'boolean') {
    if (typeof v !== 'boolean') fail(`${field} is ${JSON.stringify(v)}, not true or false`, `write "${opt.key}": true`, s.path);
    return v as boolean;
  }
  if (Array.isArray(v)) {
    if (v.length === 0) fail(`${field} is an empty list`, 'give at least one value or leave the key out', s.path);
    v.forEach((x, i) => {
      if (!isScalar(x) || typeof x === 'boolean') fail(`${field}[${i}] is ${JSON.stringify(x)}, not a string or number`, 'a list holds strings or numbers', [...s.path, i]);
    });
  } else if (!isScalar(v) || typeof v === 'boolean') {
    fail(`${field} is ${JSON.stringify(v)}, not ${opt.kind === 'list' ? 'a value or a list of values' : 'a string or number'}`, `e.g. "${opt.key}": ${opt.kind === 'list' ? '["a", "b"]' : '"value"'}`, s.path);
  }
  const list = (Array.isArray(v) ? v : [v]) as Array<string | number>;
  if (opt.path && list.some((x) => String(x).trim() === '')) fail(`${field} holds an empty file name`, 'give a path relative to the manifest', s.path);
  // Run the command's parser as the CLI would, so a bad value fails now rather than in job 600.
  let prev: unknown = opt.defaultValue;
  list.forEach((x, i) => {
    if (!opt.parse) return;
    try {
      prev = opt.parse(String(x), prev);
    } catch (e) {
      const why = e instanceof BitspanError ? e.message : e instanceof Error ? e.message : String(e);
      fail(`${field}: ${why}`, e instanceof BitspanError && e.hint ? e.hint : `check the value of "${opt.key}"`, Array.isArray(v) ? [...s.path, i] : s.path);
    }
  });
  if (Array.isArray(v) && opt.kind === 'value' && v.length > 1) {
    // A list is allowed only where the command collects repeated flags (such as --weight).
    const collects = Array.isArray(prev) && prev.length >= v.length;
    if (!collects) fail(`${field} is a list, but ${opt.flag} takes one value`, `write "${opt.key}": ${JSON.stringify(v[0])}`, s.path);
  }
  return v as ManifestValue;
}

function checkNamesUnique(jobs: BatchJob[], namePaths: Map<number, JsonPath>, fail: (m: string, h: string, p: JsonPath) => never): void {
  const seen = new Map<string, BatchJob>();
  for (const job of jobs) {
    const folded = job.name.toLowerCase();
    const other = seen.get(folded);
    if (other) {
      const same = other.name === job.name;
      fail(
        same ? `job name '${job.name}' is used twice (${other.origin} and ${job.origin})` : `job names '${other.name}' (${other.origin}) and '${job.name}' (${job.origin}) differ only in case`,
        same ? 'every job needs its own name: it names the result file (for grids, put every vary key in the name, e.g. "scan-{maxDim}")' : 'they would share a file on case-insensitive file systems; rename one',
        namePaths.get(job.index) ?? [],
      );
    }
    seen.set(folded, job);
  }
}

/** `; did you mean "x"?` for a near miss (edit distance ≤ 2), else ''. */
function suggest(word: string, candidates: string[]): string {
  let best = '';
  let bestD = 3;
  for (const c of candidates) {
    const d = editDistance(word.toLowerCase(), c.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = c;
    }
  }
  return best ? `; did you mean "${best}"?` : '';
}

function editDistance(a: string, b: string): number {
  if (Math.abs(a.length - b.length) > 2) return 3;
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) cur[j] = Math.min(prev[j]! + 1, cur[j - 1]! + 1, prev[j - 1]! + (a[i - 1] === b[j - 1] ? 0 : 1));
    prev = cur;
  }
  return prev[b.length]!;
}
