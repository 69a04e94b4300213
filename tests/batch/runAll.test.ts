import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import type { BatchJob } from '../../src/batch/manifest.js';
import { runAll } from '../../src/batch/runAll.js';
import type { ExecResult } from '../../src/batch/runJob.js';
import { tempDir } from '../helpers.js';

const jobs: BatchJob[] = Array.from({ length: 9 }, (_, i) => ({ index: i, name: `j${i}`, command: 'solve', params: {}, argv: ['solve', String(i)], inputs: [], origin: `jobs[${i}]` }));

describe('runAll', () => {
  it('runAll keeps at most `concurrency` jobs in flight, returns outcomes in index order, and a failure stops nothing', async () => {
    let inFlight = 0;
    let most = 0;
    const execute = async (j: BatchJob): Promise<ExecResult> => {
      most = Math.max(most, ++inFlight);
      // Finish out of order: later jobs return sooner.
      await new Promise((r) => setTimeout(r, (9 - j.index) * 3));
      inFlight--;
      return j.index === 4 ? { exitStatus: 1, signal: null, stdout: '', stderr: 'boom' } : { exitStatus: 0, signal: null, stdout: '{"x":1}', stderr: '' };
    };
    const seen: number[] = [];
    const outcomes = await runAll(jobs, { output: join(tempDir(), 'out'), execute, concurrency: 3, onOutcome: (_o, done) => seen.push(done) });
    expect(most).toBe(3);
    expect(outcomes.map((o) => o.index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8]);
    expect(outcomes.map((o) => o.status)).toEqual(['done', 'done', 'done', 'done', 'failed', 'done', 'done', 'done', 'done']);
    expect(seen).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
  });
});
