import { promises as fsp } from 'node:fs';
import { join } from 'node:path';
import { BitspanError } from '../errors.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import type { Manifest, ManifestValue } from './manifest.js';
import { META_DIR } from './runJob.js';

/** One job as `collect` needs to know it. */
export interface PlannedJob {
  index: number;
  name: string;
  command: string;
  params: Record<string, ManifestValue>;
}

/** The expanded job list of a manifest, saved in the output folder so `collect DIR` knows what to expect. */
export interface JobPlan {
  manifest: string;
  output: string;
  jobs: PlannedJob[];
}

/** Where the plan lives inside an output folder. */
export function planFile(output: string): string {
  return join(output, META_DIR, 'plan.json');
}

/** The plan of a manifest, writing into `output`. */
export function jobPlan(manifest: Manifest, output: string): JobPlan {
  return { manifest: manifest.file, output, jobs: manifest.jobs.map((j) => ({ index: j.index, name: j.name, command: j.command, params: j.params })) };
}

/** Save the plan atomically (one writer: `batch --all` or `--print-sbatch`, never array tasks). */
export async function writeJobPlan(plan: JobPlan): Promise<void> {
  try {
    await fsp.mkdir(join(plan.output, META_DIR), { recursive: true });
  } catch (e) {
    throw new BitspanError('output-unwritable', `cannot create the output folder (${(e as NodeJS.ErrnoException).code ?? String(e)})`, 'check "output" in the manifest and the folder permissions', { file: plan.output });
  }
  await writeFileAtomic(planFile(plan.output), JSON.stringify(plan, null, 2) + '\n');
}

/** The plan saved in `output`, or undefined when there is none or it cannot be read. */
export async function readJobPlan(output: string): Promise<JobPlan | undefined> {
  try {
    const plan = JSON.parse(await fsp.readFile(planFile(output), 'utf8')) as JobPlan;
    return Array.isArray(plan.jobs) && plan.jobs.every((j) => typeof j.name === 'string' && typeof j.command === 'string') ? plan : undefined;
  } catch {
    return undefined;
  }
}
