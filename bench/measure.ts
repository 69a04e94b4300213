// Child-process measurements for bench/run.ts; prints one JSON object.
//   measure.js stream                       STREAM-style triad bandwidth of this runtime on one core
//   measure.js matvec H SAMPLES WEIGHT      build time for 1 and 2 threads and product bandwidth
import { readHamiltonian } from '../src/io/readHamiltonian.js';
import { readSamples } from '../src/io/readSamples.js';
import { selectSubspace } from '../src/sectors/selectSubspace.js';
import { groupByFlipMask } from '../src/operators/pauliSum.js';
import { compileSector } from '../src/sectors/sector.js';
import { buildProjectedHamiltonianParallel } from '../src/build/parallelBuild.js';
import { sectorFlipTest } from '../src/build/projectedHamiltonian.js';
import { rowScanPlan } from '../src/build/rowScan.js';
import { applyStoredRows, storedBytes } from '../src/build/storedHamiltonian.js';
import { MatvecTeam } from '../src/parallel/matvecTeam.js';
import { storedRowOrder } from '../src/pipeline/solve.js';
import { closeSolveWorkers } from '../src/parallel/solveWorkers.js';

/** a = b + s·c on 3 × 256 MiB arrays, best of 5 after a warm-up that faults the pages in. */
function streamTriad(): Record<string, number> {
  const n = 1 << 25;
  const a = new Float64Array(n);
  const b = new Float64Array(n).fill(1);
  const c = new Float64Array(n).fill(2);
  let best = Infinity;
  for (let rep = 0; rep < 6; rep++) {
    const t = performance.now();
    for (let i = 0; i < n; i++) a[i] = b[i]! + 3 * c[i]!;
    if (rep > 0) best = Math.min(best, (performance.now() - t) / 1000);
  }
  return { triadGBs: (3 * 8 * n) / best / 1e9 };
}

/** Effective product bandwidth = (matrix + rowPtr + x + y bytes) / time, best of 5. */
async function matvec(hamiltonian: string, samples: string, weight: number): Promise<Record<string, number>> {
  const h = await readHamiltonian(hamiltonian);
  const s = await readSamples([samples]);
  const sector = { weights: [{ lo: 0, hi: -1, weight }] };
  const { basis } = selectSubspace(s, { sector, shared: true });
  const groups = groupByFlipMask(h, basis.nWords);
  const plan = rowScanPlan(groups, sectorFlipTest(groups, compileSector(sector, basis.qubits, basis.nWords)));
  // Both thread counts store the matrix as a two-thread solve does, so they do the same work.
  const teamOrder = storedRowOrder(basis.dim, plan.complex, true);
  const build = async (threads: number): Promise<number> => {
    const t = performance.now();
    await buildProjectedHamiltonianParallel(basis, plan, threads, teamOrder);
    return (performance.now() - t) / 1000;
  };
  await build(2); // warm the pool and the JIT
  const build1 = Math.min(await build(1), await build(1));
  const build2 = Math.min(await build(2), await build(2));
  // The matrix as the solver holds it for one-thread products, then for a team's (storedRowOrder).
  let m = await buildProjectedHamiltonianParallel(basis, plan, 2, storedRowOrder(basis.dim, plan.complex, false));
  const n = m.dim;
  const x = new Float64Array(n).fill(1);
  const y = new Float64Array(n);
  // The stored arrays once, x and y once each: the least a product must move.
  const bytes = storedBytes(m) + 2 * n * 8;
  const time = (apply: () => void): number => {
    apply();
    let best = Infinity;
    for (let rep = 0; rep < 5; rep++) {
      const t = performance.now();
      apply();
      best = Math.min(best, (performance.now() - t) / 1000);
    }
    return best;
  };
  const one = time(() => applyStoredRows(m, x, y));
  m = await buildProjectedHamiltonianParallel(basis, plan, 2, storedRowOrder(basis.dim, plan.complex, true));
  const team = new MatvecTeam({ kind: 'stored', complex: false, dim: n, matrix: m }, 2);
  // On the team's own shared vectors, as Lanczos applies it (an outside array is copied in and out).
  const tx = team.vector();
  tx.set(x);
  const ty = team.vector();
  const two = time(() => team.apply(tx, ty));
  team.close();
  closeSolveWorkers();
  return { build1, build2, buildSpeedup: build1 / build2, matvec1: one, matvec2: two, bandwidth1GBs: bytes / one / 1e9, bandwidth2GBs: bytes / two / 1e9, bytesPerProduct: bytes };
}

const [kind, ...rest] = process.argv.slice(2);
const out = kind === 'stream' ? streamTriad() : await matvec(rest[0]!, rest[1]!, Number(rest[2]));
process.stdout.write(JSON.stringify(out) + '\n');
