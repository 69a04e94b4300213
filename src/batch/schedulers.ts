import { BitspanError } from '../errors.js';

/** A scheduler's array-task variable and the number its first task gets. */
export interface ArrayVariable {
  name: string;
  scheduler: string;
  /** Array ids of this scheduler start at `base` (SGE and LSF cannot start at 0), so job = id − base. */
  base: 0 | 1;
}

/**
 * Array-task variables in the order they are looked at. Slurm and PBS arrays are submitted as
 * 0..N−1; SGE (`qsub -t 1-N`) and LSF (`bsub -J "name[1-N]"`) number tasks from 1, so id 1 is job 0.
 */
export const ARRAY_VARIABLES: readonly ArrayVariable[] = [
  { name: 'SLURM_ARRAY_TASK_ID', scheduler: 'Slurm', base: 0 },
  { name: 'PBS_ARRAY_INDEX', scheduler: 'PBS Pro', base: 0 },
  { name: 'PBS_ARRAYID', scheduler: 'Torque', base: 0 },
  { name: 'SGE_TASK_ID', scheduler: 'SGE', base: 1 },
  { name: 'LSB_JOBINDEX', scheduler: 'LSF', base: 1 },
];

/** The job index an array task should run, and which variable said so. */
export interface TaskFromEnv {
  index: number;
  variable: ArrayVariable;
  /** The variable's value as set. */
  value: string;
}

/**
 * The job index from the first array-task variable set in `env`, or undefined outside an array
 * task. SGE sets `SGE_TASK_ID=undefined` and LSF `LSB_JOBINDEX=0` in plain (non-array) jobs;
 * both count as unset.
 * @throws BitspanError `bad-argument` when the variable is set but is not a task number
 */
export function taskFromEnv(env: Record<string, string | undefined>): TaskFromEnv | undefined {
  for (const variable of ARRAY_VARIABLES) {
    const value = env[variable.name]?.trim();
    if (value === undefined || value === '' || value === 'undefined') continue;
    if (variable.name === 'LSB_JOBINDEX' && value === '0') continue;
    if (!/^\d+$/.test(value) || Number(value) < variable.base) {
      throw new BitspanError('bad-argument', `${variable.name} is '${value}', not a ${variable.scheduler} array task number`, `submit the batch as an array job (${variable.base}..N${variable.base ? '' : '−1'}) or give --task I`);
    }
    return { index: Number(value) - variable.base, variable, value };
  }
  return undefined;
}

/** What `sbatchScript` needs to know. */
export interface SbatchSettings {
  /** Absolute manifest path. */
  manifest: string;
  /** Absolute output folder; logs go to its `logs/` folder. */
  output: string;
  jobs: number;
  cpusPerTask: number;
  /** The command that runs bitspan on the nodes, as separate words, e.g. [node, bin.js]. */
  bitspan: string[];
  jobName: string;
  /** Extra arguments for every task (e.g. `--force`). */
  extraArgs?: string[];
}

/**
 * A Slurm array-job script for a manifest: one task per job (array 0..N−1), each running
 * `bitspan batch MANIFEST`, which takes its job from SLURM_ARRAY_TASK_ID.
 */
export function sbatchScript(s: SbatchSettings): string {
  const logs = `${s.output.replace(/\/+$/, '')}/logs`;
  const run = [...s.bitspan, 'batch', s.manifest, '--output', s.output, ...(s.extraArgs ?? [])].map(shellQuote).join(' ');
  return [
    '#!/bin/bash',
    `# bitspan array job: ${s.jobs} job${s.jobs === 1 ? '' : 's'} of ${s.manifest}, one task each.`,
    '# Submit with `sbatch FILE`; add --time, --mem or --partition lines as your cluster needs.',
    `#SBATCH --job-name=${s.jobName}`,
    `#SBATCH --array=0-${s.jobs - 1}`,
    '#SBATCH --ntasks=1',
    `#SBATCH --cpus-per-task=${s.cpusPerTask}`,
    `#SBATCH --output=${slurmPath(logs)}/%x-%A_%a.out`,
    `#SBATCH --error=${slurmPath(logs)}/%x-%A_%a.err`,
    'set -eu',
    `exec ${run}`,
    '',
  ].join('\n');
}

/** A word the shell passes through unchanged. */
export function shellQuote(word: string): string {
  return /^[A-Za-z0-9_@%+=:,./-]+$/.test(word) ? word : `'${word.replace(/'/g, `'\\''`)}'`;
}

/** Slurm reads #SBATCH paths itself: `%` starts a pattern and spaces end the value. */
function slurmPath(p: string): string {
  if (/\s/.test(p)) {
    throw new BitspanError('bad-argument', `output folder '${p}' contains white space, which #SBATCH --output cannot hold`, 'choose an output folder without spaces');
  }
  return p.replace(/%/g, '%%');
}

/** A Slurm job name from a manifest file name: letters, digits, `.`, `_`, `-`. */
export function jobNameFor(manifestFile: string): string {
  const base = manifestFile.replace(/^.*[\\/]/, '').replace(/\.json$/i, '');
  return `bitspan-${base.replace(/[^A-Za-z0-9._-]/g, '_').slice(0, 40) || 'batch'}`;
}
