import { Command, Option } from 'commander';
import { promises as fsp } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { jobPlan, writeJobPlan } from '../../batch/jobPlan.js';
import { readManifest, type BatchJob, type Manifest } from '../../batch/manifest.js';
import { runAll } from '../../batch/runAll.js';
import { jobFiles, runJob, type JobOutcome } from '../../batch/runJob.js';
import { ARRAY_VARIABLES, jobNameFor, sbatchScript, taskFromEnv } from '../../batch/schedulers.js';
import { BitspanError } from '../../errors.js';
import { SIGNAL_STATUS } from '../signals.js';
import { removePendingTemps } from '../../io/atomicWrite.js';
import { commandCatalog } from '../commandCatalog.js';
import type { CliIo } from '../io.js';
import { bitspanCommand, jobProcesses, type JobProcesses } from '../jobProcess.js';
import { nonNegativeInt, positiveInt } from '../parse.js';

interface BatchFlags {
  task?: number;
  all?: boolean;
  jobs: number;
  force?: boolean;
  output?: string;
  printSbatch?: boolean;
  threads?: number;
  list?: boolean;
  json?: boolean;
}

/** CPUs per array task when neither --threads nor a job's `threads` key says otherwise. */
const DEFAULT_CPUS = 2;

/** `bitspan batch`: run one job of a manifest (an array task), all of them, or print the array script. */
export function batchCommand(io: CliIo): Command {
  const cmd = new Command('batch')
    .description('run the jobs of a manifest: one per array task (--task I or the scheduler variable), or all (--all)')
    .argument('<manifest>', 'JSON job manifest')
    .option('--task <i>', 'run job I (0-based) of the manifest', nonNegativeInt('--task'))
    .option('--all', 'run every job here, --jobs at a time, each in its own process')
    .addOption(new Option('--jobs <n>', 'jobs running at once with --all').argParser(positiveInt('--jobs')).default(availableParallelism(), 'the number of CPUs'))
    .option('--force', 'run jobs even when their result is up to date')
    .option('--output <dir>', 'write results to DIR instead of the manifest\'s "output"')
    .option('--print-sbatch', 'print a Slurm array-job script for the manifest (creates DIR/logs)')
    .option('--threads <n>', 'CPUs per task in the --print-sbatch script (default: the largest "threads" of the jobs, else 2)', positiveInt('--threads'))
    .option('--list', 'print the expanded jobs and their command lines; run nothing')
    .option('--json', 'print one JSON object on stdout');
  cmd.action(async (manifestPath: string, f: BatchFlags) => {
    const modes = [f.task !== undefined && '--task', f.all && '--all', f.printSbatch && '--print-sbatch', f.list && '--list'].filter(Boolean);
    if (modes.length > 1) throw new BitspanError('bad-argument', `${modes.join(' and ')} cannot be combined`, 'choose one');
    const manifest = await readManifest(manifestPath, commandCatalog(cmd.parent ?? cmd));
    const output = f.output !== undefined ? resolve(f.output) : manifest.output;

    if (f.list) return listJobs(io, manifest, output, f.json);
    if (f.printSbatch) return printSbatch(io, manifest, output, f.threads);
    const procs = jobProcesses(bitspanCommand(), {
      cwd: manifest.dir,
      env: io.env,
      onLine: (job, line) => io.stderr(`[${job.name}] ${line}\n`),
    });
    const outcomes = await whileHandlingSignals(procs, () => (f.all ? runEvery(io, manifest, output, procs, f) : runTask(io, manifest, output, procs, f)));
    if (f.json) io.stdout(JSON.stringify({ manifest: manifest.file, output, jobs: outcomes }, null, 2) + '\n');
    else io.stdout(summary(outcomes, manifest, output));
    const failed = outcomes.filter((o) => o.status === 'failed');
    if (failed.length) {
      throw new BitspanError(
        'incomplete',
        failed.length === 1 ? `job '${failed[0]!.name}' failed: ${failureText(failed[0]!)}` : `${failed.length} of ${outcomes.length} jobs failed (${names(failed)})`,
        `error records are in ${output}; fix the cause and run again: only failed and missing jobs rerun`,
      );
    }
  });
  return cmd;
}

async function runTask(io: CliIo, manifest: Manifest, output: string, procs: JobProcesses, f: BatchFlags): Promise<JobOutcome[]> {
  let index = f.task;
  if (index === undefined) {
    const fromEnv = taskFromEnv(io.env);
    if (!fromEnv) {
      throw new BitspanError(
        'bad-argument',
        'no job chosen: give --task I or --all, or run as an array task',
        `array variables read: ${ARRAY_VARIABLES.map((v) => v.name).join(', ')}; --print-sbatch writes a Slurm script`,
      );
    }
    index = fromEnv.index;
    const offset = fromEnv.variable.base ? ` (${fromEnv.variable.scheduler} numbers tasks from ${fromEnv.variable.base})` : '';
    io.stderr(`bitspan batch: job ${index} from ${fromEnv.variable.name}=${fromEnv.value}${offset}\n`);
  }
  const job = manifest.jobs[index];
  if (!job) {
    throw new BitspanError('bad-argument', `job ${index} does not exist: the manifest has ${manifest.jobs.length} jobs (0..${manifest.jobs.length - 1})`, 'submit the array as 0..N−1 (1..N for SGE and LSF)', { file: manifest.file });
  }
  const outcome = await runJob(job, { output, execute: procs.execute, force: f.force });
  io.stderr(`bitspan batch: ${progressText(outcome, output)}\n`);
  return [outcome];
}

async function runEvery(io: CliIo, manifest: Manifest, output: string, procs: JobProcesses, f: BatchFlags): Promise<JobOutcome[]> {
  await writeJobPlan(jobPlan(manifest, output));
  return runAll(manifest.jobs, {
    output,
    execute: procs.execute,
    force: f.force,
    concurrency: f.jobs,
    onOutcome: (o, done, total) => io.stderr(`bitspan batch: [${done}/${total}] ${progressText(o, output)}\n`),
  });
}

/**
 * Run `body`; if SIGINT, SIGTERM or SIGHUP arrives meanwhile, stop the job processes, remove
 * temporary files and exit 130, 143 or 129. Results already written stay; the interrupted jobs rerun next time.
 */
async function whileHandlingSignals<T>(procs: JobProcesses, body: () => Promise<T>): Promise<T> {
  const onSignal = (signal: NodeJS.Signals): void => {
    // Job processes write nothing themselves (their reports come back over stdout and this process
    // writes the files), so they can be stopped outright even if one is stuck.
    procs.stop('SIGKILL');
    removePendingTemps();
    process.exit(SIGNAL_STATUS[signal as keyof typeof SIGNAL_STATUS] ?? 143);
  };
  const signals = Object.keys(SIGNAL_STATUS) as NodeJS.Signals[];
  for (const s of signals) process.on(s, onSignal);
  try {
    return await body();
  } finally {
    for (const s of signals) process.off(s, onSignal);
  }
}

function listJobs(io: CliIo, manifest: Manifest, output: string, json?: boolean): void {
  if (json) {
    const jobs = manifest.jobs.map((j) => ({ index: j.index, name: j.name, command: j.command, params: j.params, argv: j.argv, result: jobFiles(output, j.name).result }));
    io.stdout(JSON.stringify({ manifest: manifest.file, output, jobs }, null, 2) + '\n');
    return;
  }
  const lines = manifest.jobs.map((j) => `${String(j.index).padStart(4)}  ${j.name}  bitspan ${j.argv.join(' ')}`);
  io.stdout(`${manifest.jobs.length} jobs of ${manifest.file}, results in ${output}\n${lines.join('\n')}\n`);
}

async function printSbatch(io: CliIo, manifest: Manifest, output: string, threads?: number): Promise<void> {
  // Slurm does not create the folders of --output/--error; a missing one fails every task.
  try {
    await fsp.mkdir(join(output, 'logs'), { recursive: true });
  } catch (e) {
    throw new BitspanError('output-unwritable', `cannot create ${join(output, 'logs')} (${(e as NodeJS.ErrnoException).code ?? String(e)})`, 'check "output" in the manifest', { file: output });
  }
  await writeJobPlan(jobPlan(manifest, output));
  io.stdout(
    sbatchScript({
      manifest: manifest.file,
      output,
      jobs: manifest.jobs.length,
      cpusPerTask: threads ?? jobThreads(manifest.jobs) ?? DEFAULT_CPUS,
      bitspan: bitspanCommand(),
      jobName: jobNameFor(manifest.file),
    }),
  );
}

/** The largest `threads` any job asks for, if any does. */
function jobThreads(jobs: readonly BatchJob[]): number | undefined {
  const ts = jobs.map((j) => Number(j.params.threads)).filter((t) => Number.isInteger(t) && t > 0);
  return ts.length ? Math.max(...ts) : undefined;
}

function progressText(o: JobOutcome, output: string): string {
  const secs = `${o.seconds.toFixed(1)} s`;
  if (o.status === 'skipped') return `${o.name}: up to date, skipped`;
  if (o.status === 'done') return `${o.name}: done in ${secs}`;
  return `${o.name}: FAILED after ${secs}: ${failureText(o)} (record: ${relative(process.cwd(), jobFiles(output, o.name).error) || '.'})`;
}

function failureText(o: JobOutcome): string {
  const e = o.error;
  if (!e) return 'unknown error';
  const where = e.file ? `${e.file}${e.line !== undefined ? `:${e.line}` : ''}: ` : '';
  return `${where}${e.message}`;
}

function names(outcomes: readonly JobOutcome[]): string {
  const shown = outcomes.slice(0, 10).map((o) => o.name).join(', ');
  return outcomes.length > 10 ? `${shown}, …` : shown;
}

function summary(outcomes: readonly JobOutcome[], manifest: Manifest, output: string): string {
  const count = (s: JobOutcome['status']): number => outcomes.filter((o) => o.status === s).length;
  const lines = [`${outcomes.length} job${outcomes.length === 1 ? '' : 's'}: ${count('done')} done, ${count('skipped')} up to date, ${count('failed')} failed`];
  lines.push(`results in ${output}; gather them with: bitspan collect ${output} --manifest ${manifest.file}`);
  return lines.join('\n') + '\n';
}
