/**
 * Bench: time of the variance + PT2 estimate against the solve (build + Lanczos) on the same basis,
 * in the same run. `node dist/bench/estimate.js [--side 8] [--distinct 100000] [--seed 1] [--repeat 1]`
 * prints one JSON line with the seconds of each stage and the ratio estimate ÷ solve (target ≤ 3).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeBenchCase } from './cases.js';
import { readHamiltonian } from '../src/io/readHamiltonian.js';
import { readSamples } from '../src/io/readSamples.js';
import { groupByFlipMask } from '../src/operators/pauliSum.js';
import { projectAndSolve, storedOperator } from '../src/pipeline/solve.js';
import { compileSector } from '../src/sectors/sector.js';
import { selectSubspace } from '../src/sectors/selectSubspace.js';
import { varianceAndPt2 } from '../src/analysis/varianceAndPt2.js';

async function main(argv: string[]): Promise<void> {
  const num: Record<string, number> = { side: 8, distinct: 100000, seed: 1, repeat: 1 };
  for (let i = 0; i < argv.length; i += 2) {
    const name = argv[i]!.replace(/^--/, '');
    if (!(name in num)) throw new Error(`unknown option ${argv[i]}`);
    num[name] = Number(argv[i + 1]);
  }
  const dir = mkdtempSync(join(tmpdir(), 'bitspan-bench-estimate-'));
  try {
    const c = writeBenchCase(dir, { side: num.side!, distinct: num.distinct!, seed: num.seed! });
    const h = await readHamiltonian(c.hamiltonian);
    const samples = await readSamples([c.samples]);
    const sector = { weights: [{ lo: 0, hi: -1, weight: c.weight }] };
    const { basis } = selectSubspace(samples, { sector });
    for (let rep = 0; rep < num.repeat!; rep++) {
      const c0 = process.cpuUsage();
      const t0 = performance.now();
      const p = await projectAndSolve(h, basis, sector, { threads: 1 });
      const t1 = performance.now();
      const c1 = process.cpuUsage();
      const est = varianceAndPt2(basis, groupByFlipMask(h, basis.nWords), storedOperator(p.matrix!), p.eigen.vectors[0]!, {
        sector: compileSector(sector, basis.qubits, basis.nWords),
      });
      const t2 = performance.now();
      const c2 = process.cpuUsage();
      const cpu = (a: NodeJS.CpuUsage, b: NodeJS.CpuUsage): number => (b.user - a.user + b.system - a.system) / 1e6;
      const solve = (t1 - t0) / 1000;
      const estimate = (t2 - t1) / 1000;
      process.stdout.write(
        JSON.stringify({
          qubits: c.qubits,
          dimension: basis.dim,
          energy: p.eigen.values[0],
          residual: p.eigen.residuals[0],
          variance: est.variance,
          pt2: est.pt2,
          external: est.external,
          seconds: { build: p.timings.build, lanczos: p.timings.solve, solve, estimate },
          cpuSeconds: { solve: cpu(c0, c1), estimate: cpu(c1, c2) },
          ratio: estimate / solve,
        }) + '\n',
      );
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

main(process.argv.slice(2)).catch((e: unknown) => {
  process.stderr.write(`bench estimate: ${(e as Error).message}\n`);
  process.exit(2);
});
