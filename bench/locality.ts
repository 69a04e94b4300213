/**
 * Dev tool: `node dist/bench/locality.js HAMILTONIAN SAMPLES WEIGHT [--reps 3] [--threads 2]` times, in one process,
 * assembling the stored matrix from the same upper-triangle pieces in basis order and renumbered for
 * locality (`storedFromPieces(..., 'locality')`, with the older `reorderForLocality` of a basis-order
 * matrix beside it), then one product on each (one thread and a two-thread team), then whole
 * `projectAndSolve` runs on `threads` threads with renumbering off and on (seeds 1..reps: the random start differs in
 * each order, so compare sums over seeds); prints JSON.
 */
import { readHamiltonian } from '../src/io/readHamiltonian.js';
import { readSamples } from '../src/io/readSamples.js';
import { selectSubspace } from '../src/sectors/selectSubspace.js';
import { groupByFlipMask } from '../src/operators/pauliSum.js';
import { compileSector } from '../src/sectors/sector.js';
import { buildTakenChunks, type SharedChunks } from '../src/build/parallelBuild.js';
import { sectorFlipTest } from '../src/build/projectedHamiltonian.js';
import { rowScanPlan, upperPerRowEstimate } from '../src/build/rowScan.js';
import { applyStoredRows, localityOrder, reorderForLocality, storedFromPieces, type StoredHamiltonian } from '../src/build/storedHamiltonian.js';
import { MatvecTeam, closeMatvecWorkers } from '../src/parallel/matvecTeam.js';
import { projectAndSolve } from '../src/pipeline/solve.js';

const [hamiltonian, samples, weightArg, ...rest] = process.argv.slice(2);
if (!hamiltonian || !samples || !weightArg) throw new Error('usage: locality.js HAMILTONIAN SAMPLES WEIGHT [--reps N] [--threads T]');
const flag = (name: string, fallback: number): number => (rest.includes(name) ? Number(rest[rest.indexOf(name) + 1]) : fallback);
const reps = flag('--reps', 3);
const threads = flag('--threads', 2);
const sector = { weights: [{ lo: 0, hi: -1, weight: Number(weightArg) }] };
const { basis } = selectSubspace(await readSamples([samples]), { sector, shared: true });
const h = await readHamiltonian(hamiltonian);
const groups = groupByFlipMask(h, basis.nWords);
const plan = rowScanPlan(groups, sectorFlipTest(groups, compileSector(sector, basis.qubits, basis.nWords)));
// The pieces a two-thread build makes (16 chunks), built here on this thread.
const work: SharedChunks = { basis, plan, upperPerRow: upperPerRowEstimate(basis, plan), step: Math.ceil(basis.dim / 16), progress: new Int32Array(new SharedArrayBuffer(8)) };
const pieces = buildTakenChunks(work);
const dim = basis.dim;

const seconds = (f: () => void): number => {
  const t = performance.now();
  f();
  return (performance.now() - t) / 1000;
};
const best: Record<string, number> = {};
const keep = (key: string, s: number): void => void (best[key] = Math.min(best[key] ?? Infinity, s));
let plain: StoredHamiltonian | undefined;
let renumbered: StoredHamiltonian | undefined;
// Alternate the variants so drifting load on shared cores hits each alike.
for (let rep = 0; rep < reps; rep++) {
  keep('assembleBasisOrder', seconds(() => (plain = storedFromPieces(dim, false, pieces, true))));
  // What the solver runs: the order found and the rows assembled in it, in one call.
  keep('assembleInOrder', seconds(() => (renumbered = storedFromPieces(dim, false, pieces, true, 'locality'))));
  keep('localityOrderAlone', seconds(() => localityOrder(dim, pieces)));
  // The older route: a basis-order matrix, then a renumbered copy of it.
  keep('reorderForLocality', seconds(() => reorderForLocality(plain!, true)));
}
const x = new Float64Array(dim).fill(1);
const y = new Float64Array(dim);
const product = (m: StoredHamiltonian, team?: MatvecTeam): number => {
  const apply = team ? () => team.apply(x, y) : () => applyStoredRows(m, x, y);
  apply();
  let t = Infinity;
  for (let k = 0; k < 5; k++) t = Math.min(t, seconds(apply));
  return t;
};
for (let rep = 0; rep < reps; rep++) {
  for (const [name, m] of [['BasisOrder', plain!], ['InOrder', renumbered!]] as const) {
    keep(`product1${name}`, product(m));
    const team = new MatvecTeam({ kind: 'stored', complex: false, dim, matrix: m }, 2);
    keep(`product2${name}`, product(m, team));
    team.close();
  }
}
const nnz = plain!.rowPtr[dim]!;
plain = renumbered = undefined;
const solves: Record<string, number> = {};
const add = (key: string, v: number): void => void (solves[key] = (solves[key] ?? 0) + v);
for (let seed = 1; seed <= reps; seed++) {
  for (const [name, reorderFromDim] of [['Off', Infinity], ['On', 0]] as const) {
    const p = await projectAndSolve(h, basis, sector, { threads, seed, reorderFromDim });
    add(`build${name}`, p.timings.build);
    add(`solve${name}`, p.timings.solve);
    add(`matvecs${name}`, p.eigen.matvecs);
  }
}
closeMatvecWorkers();
closeMatvecWorkers();
process.stdout.write(
  JSON.stringify({
    dim,
    threads,
    offDiagonal: nnz,
    ...best,
    productRatio1: best.product1InOrder! / best.product1BasisOrder!,
    productRatio2: best.product2InOrder! / best.product2BasisOrder!,
    ...solves,
    solvePerMatvecRatio: solves.solveOn! / solves.matvecsOn! / (solves.solveOff! / solves.matvecsOff!),
    buildPlusSolveRatio: (solves.buildOn! + solves.solveOn!) / (solves.buildOff! + solves.solveOff!),
  }) + '\n',
);
