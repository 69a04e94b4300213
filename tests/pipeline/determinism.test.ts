import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { solve, type SolveOptions, type SolveOutcome } from '../../src/pipeline/solve.js';
import { seededUniform } from '../../src/util/random.js';
import { closeTo, tempDir } from '../helpers.js';

let dir = '';
let hamiltonian = '';
let samples = '';
const WEIGHT = 18;

/** Fisher–Yates with a seeded generator. */
function shuffled<T>(items: T[], seed: number): T[] {
  const rng = seededUniform(seed);
  const a = items.slice();
  for (let i = a.length - 1; i > 0; i--) {
    const j = Math.floor(rng.next() * (i + 1));
    [a[i], a[j]] = [a[j]!, a[i]!];
  }
  return a;
}

async function run(files: string[], extra: Partial<SolveOptions> = {}): Promise<SolveOutcome> {
  // --max-dim below the distinct count exercises the tie-break among equal counts too.
  return solve({ hamiltonian, samples: files, sector: { weights: [{ lo: 0, hi: -1, weight: WEIGHT }] }, maxDim: 22000, eigs: 1, seed: 7, ...extra });
}

/** Same energies to 1e-10, and the same configurations in the same order. */
function expectSame(a: SolveOutcome, b: SolveOutcome, what: string): void {
  expect(b.report.dimension, what).toBe(a.report.dimension);
  expect(Buffer.from(b.basis.states.buffer, b.basis.states.byteOffset, b.basis.dim * b.basis.nWords * 4).equals(Buffer.from(a.basis.states.buffer, a.basis.states.byteOffset, a.basis.dim * a.basis.nWords * 4)), `${what}: basis order`).toBe(true);
  a.report.energies.forEach((e, i) => closeTo(b.report.energies[i]!, e, 1e-10, `${what}: E${i}`));
  expect(b.report.groundState.top.map((t) => t.bitstring), `${what}: top configurations`).toEqual(a.report.groundState.top.map((t) => t.bitstring));
  expect([b.report.samples.shots, b.report.samples.distinct, b.report.samples.kept, b.report.samples.keptShots]).toEqual([a.report.samples.shots, a.report.samples.distinct, a.report.samples.kept, a.report.samples.keptShots]);
}

describe('solve determinism', () => {
  let reference: SolveOutcome;

  beforeAll(async () => {
    dir = tempDir('bitspan-determinism-');
    // 36-qubit Heisenberg torus, 26000 sampled configurations: above the sizes where the build
    // goes to worker threads (20000 rows) and products to the Atomics team (2000 rows).
    const { writeBenchCase } = (await import(join(process.cwd(), 'dist/bench/cases.js'))) as typeof import('../../bench/cases.js');
    ({ hamiltonian, samples } = writeBenchCase(dir, { side: 6, distinct: 26000, seed: 3 }));
    reference = await run([samples], { threads: 1 });
    expect(reference.report.dimension).toBe(22000);
    expect(reference.report.converged).toBe(true);
  });

  it('solve gives the same energies and configuration order on 1 and 2 threads, stored and matrix-free', async () => {
    expectSame(reference, await run([samples], { threads: 2 }), 'threads 2');
    expectSame(reference, await run([samples], { threads: 2, matrixFree: true }), 'threads 2, matrix-free');
  });

  it('solve gives the same result when the rows of a dump are shuffled or split over two files in another order', async () => {
    const [header, ...rows] = readFileSync(samples, 'utf8').trimEnd().split('\n');
    const mixed = join(dir, 'shuffled.csv');
    writeFileSync(mixed, [header, ...shuffled(rows, 11)].join('\r\n') + '\r\n');
    expectSame(reference, await run([mixed], { threads: 2 }), 'shuffled rows');

    // Split every count c > 1 into two rows (1 and c − 1) living in different files, each shuffled.
    const a: string[] = [];
    const b: string[] = [];
    rows.forEach((r, i) => {
      const [bits, count] = r.split(',') as [string, string];
      const c = Number(count);
      if (c > 1) {
        a.push(`${bits},1`);
        b.push(`${bits},${c - 1}`);
      } else (i % 2 ? a : b).push(r);
    });
    const fa = join(dir, 'part-a.csv');
    const fb = join(dir, 'part-b.csv');
    writeFileSync(fa, [header, ...shuffled(a, 12)].join('\n') + '\n');
    writeFileSync(fb, [header, ...shuffled(b, 13)].join('\n') + '\n');
    const split = await run([fb, fa], { threads: 2 });
    expectSame(reference, split, 'split into two files');
    expect(split.report.samples.groups).toHaveLength(2);
  });
});
