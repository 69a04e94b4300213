import type { BatchJob } from './manifest.js';
import { runJob, type JobOutcome, type RunJobOptions } from './runJob.js';

/** Options of `runAll`: those of `runJob` plus how many jobs run at once. */
export interface RunAllOptions extends RunJobOptions {
  concurrency: number;
  /** Called as each job finishes, with the count finished so far. */
  onOutcome?: (outcome: JobOutcome, finished: number, total: number) => void;
}

/**
 * Run jobs with at most `concurrency` at a time, in index order, and return their outcomes in
 * index order. A failed job does not stop the others.
 * @throws the first error that is not a job failure (e.g. an unwritable output folder), after the
 * jobs already started have finished
 */
export async function runAll(jobs: readonly BatchJob[], opts: RunAllOptions): Promise<JobOutcome[]> {
  const outcomes: JobOutcome[] = new Array(jobs.length);
  let next = 0;
  let finished = 0;
  let fatal: unknown;
  const worker = async (): Promise<void> => {
    while (fatal === undefined && next < jobs.length) {
      const i = next++;
      try {
        outcomes[i] = await runJob(jobs[i]!, opts);
      } catch (e) {
        fatal ??= e;
        return;
      }
      opts.onOutcome?.(outcomes[i]!, ++finished, jobs.length);
    }
  };
  const width = Math.max(1, Math.min(opts.concurrency, jobs.length));
  await Promise.all(Array.from({ length: width }, worker));
  if (fatal !== undefined) throw fatal;
  return outcomes;
}
