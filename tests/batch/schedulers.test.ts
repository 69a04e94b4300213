import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { jobNameFor, sbatchScript, shellQuote, taskFromEnv } from '../../src/batch/schedulers.js';

describe('taskFromEnv', () => {
  it('taskFromEnv reads Slurm and PBS ids as they are and SGE and LSF ids (numbered from 1) minus one', () => {
    // Array numbering: Slurm --array and PBS -J/-t take 0-based ranges; SGE -t and LSF "[1-N]" start at 1 (their manuals; common practice).
    expect(taskFromEnv({ SLURM_ARRAY_TASK_ID: '7' })).toMatchObject({ index: 7, variable: { name: 'SLURM_ARRAY_TASK_ID' } });
    expect(taskFromEnv({ PBS_ARRAY_INDEX: '0' })?.index).toBe(0);
    expect(taskFromEnv({ PBS_ARRAYID: '3' })?.index).toBe(3);
    expect(taskFromEnv({ SGE_TASK_ID: '1' })).toMatchObject({ index: 0, value: '1', variable: { base: 1 } });
    expect(taskFromEnv({ LSB_JOBINDEX: '12' })?.index).toBe(11);
  });

  it('taskFromEnv treats the values SGE and LSF set outside arrays as unset, and prefers Slurm', () => {
    expect(taskFromEnv({})).toBeUndefined();
    expect(taskFromEnv({ SGE_TASK_ID: 'undefined', LSB_JOBINDEX: '0' })).toBeUndefined();
    expect(taskFromEnv({ SGE_TASK_ID: '5', SLURM_ARRAY_TASK_ID: '2' })?.variable.name).toBe('SLURM_ARRAY_TASK_ID');
  });

  it('taskFromEnv refuses a value that is not a task number', () => {
    expect(() => taskFromEnv({ SLURM_ARRAY_TASK_ID: 'abc' })).toThrow(expect.objectContaining({ code: 'bad-argument' }));
    expect(() => taskFromEnv({ SGE_TASK_ID: '0' })).toThrow(expect.objectContaining({ code: 'bad-argument' }));
  });
});

describe('sbatchScript', () => {
  const script = sbatchScript({ manifest: "/data/it's here/m.json", output: '/data/out', jobs: 12, cpusPerTask: 4, bitspan: ['/usr/bin/node', '/opt/bitspan/bin.js'], jobName: 'bitspan-m' });

  it('sbatchScript asks for one array task per job, the CPUs per task, and logs under the output folder', () => {
    expect(script.startsWith('#!/bin/bash\n')).toBe(true);
    expect(script).toContain('#SBATCH --array=0-11\n');
    expect(script).toContain('#SBATCH --cpus-per-task=4\n');
    expect(script).toContain('#SBATCH --output=/data/out/logs/%x-%A_%a.out\n');
    expect(script).toContain('#SBATCH --error=/data/out/logs/%x-%A_%a.err\n');
    // The task number comes from SLURM_ARRAY_TASK_ID at run time, so the command names no task.
    expect(script).not.toContain('--task');
  });

  it('sbatchScript quotes the command so bash passes every word through unchanged', () => {
    const line = script.split('\n').find((l) => l.startsWith('exec '))!;
    const words = execFileSync('bash', ['-c', `set -- ${line.slice(5)}; printf '%s\\n' "$@"`], { encoding: 'utf8' }).trimEnd().split('\n');
    expect(words).toEqual(['/usr/bin/node', '/opt/bitspan/bin.js', 'batch', "/data/it's here/m.json", '--output', '/data/out']);
    expect(execFileSync('bash', ['-n'], { input: script })).toBeDefined();
  });

  it('sbatchScript refuses an output folder with white space, which #SBATCH lines cannot hold', () => {
    expect(() => sbatchScript({ manifest: '/m.json', output: '/my data', jobs: 1, cpusPerTask: 1, bitspan: ['b'], jobName: 'x' })).toThrow(expect.objectContaining({ code: 'bad-argument' }));
  });
});

describe('shellQuote', () => {
  it('shellQuote round-trips hostile words through bash', () => {
    const words = ['plain', "it's", '$(rm -rf /)', '`x`', 'a b', '"q"', '*', ''];
    const out = execFileSync('bash', ['-c', `printf '%s\\n' ${words.map(shellQuote).join(' ')}`], { encoding: 'utf8' });
    expect(out).toBe(words.map((w) => `${w}\n`).join(''));
  });
});

describe('jobNameFor', () => {
  it('jobNameFor keeps a Slurm-safe job name from the manifest file name', () => {
    expect(jobNameFor('/a/b/scan 2024.json')).toBe('bitspan-scan_2024');
  });
});
