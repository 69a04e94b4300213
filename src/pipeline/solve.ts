import { BitspanError } from '../errors.js';
import { basisIndexOf, type Basis } from '../bits/basis.js';
import { formatBitstring } from '../bits/packed.js';
import { buildProjectedHamiltonianParallel, MIN_ROWS_PARALLEL } from '../build/parallelBuild.js';
import { planMemory, type MemoryPlan } from '../build/memoryPlan.js';
import { applyUpperRows, buildProjectedHamiltonian, sectorFlipTest } from '../build/projectedHamiltonian.js';
import { filterOrder, FILTER_ORDER_MIN_BYTES, rowScanPlan } from '../build/rowScan.js';
import { applyStoredRows, permuteVector, replayStoredRows, storedNonzeros, toBasisOrderInPlace, type StoredHamiltonian } from '../build/storedHamiltonian.js';
import { MatvecTeam, startMatvecWorkers } from '../parallel/matvecTeam.js';
import { defaultThreads } from '../parallel/threads.js';
import { makeBasis } from '../bits/basis.js';
import { csrApplyRows, type SparseMatrix } from '../build/sparseMatrix.js';
import type { Qubit0 } from '../io/bitstringParser.js';
import { readHamiltonian } from '../io/readHamiltonian.js';
import { readSamples, type SampleFormat } from '../io/readSamples.js';
import { groupByFlipMask, highestQubit, type PauliSum } from '../operators/pauliSum.js';
import { compileSector, describeSector, type Sector } from '../sectors/sector.js';
import { selectSubspace, type SubspaceReport } from '../sectors/selectSubspace.js';
import { lanczos, LANCZOS_DEFAULTS, type LanczosResult, type LinearOperator } from '../solvers/lanczos.js';
import type { SampleSet } from '../io/readSamples.js';
import { stateOnBasis, type StateOnConfigs } from '../analysis/stateOnBasis.js';
import type { AnalysisOptions, AnalysisReport, ReferenceEnergy } from './analyze.js';
import type { ExpandOptions, ExpansionReport } from './expand.js';
import type { Fcidump } from '../io/fcidump.js';
import type { ProductSpaceReport, RepairReport } from './solveSubspace.js';
import type { IntegralsReport } from './solveWithRepair.js';
import { collectGarbage } from '../util/collectGarbage.js';

/** The dumps, the sector filters and the solver settings, shared by `solve` and `sweep`. */
export interface SampledRunOptions {
  samples: string[];
  sector?: Sector;
  minCount?: number;
  maxDim?: number;
  eigs?: number;
  tol?: number;
  seed?: number;
  qubits?: number;
  qubit0?: Qubit0;
  format?: SampleFormat;
  /** Most probable configurations of the ground state to report. */
  top?: number;
  threads?: number;
  memoryBytes?: number;
  matrixFree?: boolean;
}

/** Read the dumps a run names, with its register size, qubit order and format. */
export function readRunSamples(opts: SampledRunOptions, extra: { keepOrder?: boolean } = {}): Promise<SampleSet> {
  return readSamples(opts.samples, { qubits: opts.qubits, qubit0: opts.qubit0, format: opts.format, ...extra });
}

/**
 * Seconds per stage into `timings`: each `lap(name)` closes the stage begun at the previous lap;
 * `finish()` adds the total and the process's peak memory (run-to-run varying like the times).
 */
export function stageClock(timings: Record<string, number>): { lap(name: string): void; finish(): void } {
  const start = performance.now();
  let last = start;
  return {
    lap(name) {
      const now = performance.now();
      timings[name] = (now - last) / 1000;
      last = now;
    },
    finish() {
      timings.total = (performance.now() - start) / 1000;
      timings.peakRSSMB = process.resourceUsage().maxRSS / 1024;
    },
  };
}

/** Everything `solve` needs; file paths are read here, at the edge. */
export interface SolveOptions extends SampledRunOptions {
  /** See SolverSettings.releaseIndex: the returned basis then holds only its configurations (ignored with expansion, a start state or an analysis). */
  releaseIndex?: boolean;
  /** Pauli-sum Hamiltonian file; exactly one of `hamiltonian` and `integrals` is given. */
  hamiltonian?: string;
  /** FCIDUMP file: the Hamiltonian as molecular integrals, solved in the determinant basis. */
  integrals?: string;
  /** Spin-up and spin-down electron counts for `integrals` (default: NELEC and MS2 of the header). */
  electrons?: [number, number];
  /** Repair off-sector samples instead of dropping them, for up to `repairRounds` rounds. */
  repair?: boolean;
  repairRounds?: number;
  /** Close the determinant subspace under spin-up × spin-down combination (`integrals` only). */
  productSpace?: boolean;
  /** Progress lines (e.g. the product-space dimension before building). */
  log?: (line: string) => void;
  onBuildProgress?: SolverSettings['onBuildProgress'];
  onSolveProgress?: SolverSettings['onSolveProgress'];
  /** Add the configurations H connects to the sampled subspace (N steps, within the sector) before solving. */
  expand?: ExpandOptions;
  /** A state CSV written by `--save-state`, used as the Lanczos start vector. */
  startState?: string;
  /** Error estimates, bounds, observables, diagnostics and batches of the lowest state. */
  analysis?: SolveAnalysisOptions;
}

/** `SolveOptions.analysis`: the analysis options with file inputs still as paths. */
export interface SolveAnalysisOptions extends Omit<AnalysisOptions, 'reference' | 'observables' | 'batches'> {
  /** A known reference energy. */
  reference?: number;
  /** Diagonalise the whole sector for the reference (small systems). */
  exact?: boolean;
  /** Largest sector `exact` enumerates (default 2^20). */
  exactMaxDim?: number;
  /** Pauli strings to evaluate, one per line, in the Hamiltonian text format. */
  observables?: string;
  batches?: { count: number; size: number; seed?: number };
}

/** The JSON `solve --json` prints: every energy travels with its residual and its subspace. */
export interface SolveReport extends Partial<AnalysisReport> {
  command: 'solve';
  qubits: number;
  dimension: number;
  nonzeros: number;
  complex: boolean;
  /** `stored` CSR or `matrix-free` products. */
  storage: 'stored' | 'matrix-free';
  /** The memory plan; keptVectors: Lanczos vectors a matrix-free run could keep to skip the two-pass replay. */
  memory: { budgetBytes: number; estimatedBytes: number; reason: string; keptVectors?: number };
  energies: number[];
  residuals: number[];
  converged: boolean;
  iterations: number;
  matvecs: number;
  tolerance: number;
  seed: number;
  threads: number;
  hamiltonian: { file: string; terms: number; constant: number; qubits: number };
  samples: SubspaceReport;
  sector: SectorReport;
  timings: Record<string, number>;
  groundState: { top: Array<{ bitstring: string; probability: number }> };
  /** Present with `expand`. */
  expansion?: ExpansionReport;
  /** Present with `integrals`: what the FCIDUMP held and how H was stored. */
  integrals?: IntegralsReport;
  /** Present with `repair`: per round, shots recovered and the energy. */
  repair?: RepairReport;
  /** Present with `productSpace`. */
  productSpace?: ProductSpaceReport;
  /** Present with `startState`: how much of the saved state the subspace holds. */
  startState?: { file: string; configurations: number; matched: number; used: boolean };
}

export interface SectorReport {
  description: string;
  weights: Array<{ qubits: [number, number]; weight: number }>;
  parity: 'even' | 'odd' | null;
  minCount: number | null;
  maxDim: number | null;
}

/** In-memory results for library callers that need the basis, matrix or vectors themselves. */
export interface SolveOutcome {
  report: SolveReport;
  basis: Basis;
  /** The stored matrix (the compact form from `projectAndSolve`, CSR from the repair and determinant paths); undefined when products were matrix-free. */
  matrix?: StoredHamiltonian | SparseMatrix;
  /** The Pauli Hamiltonian (undefined on the determinant path, which sets `integrals`). */
  hamiltonian?: PauliSum;
  integrals?: Fcidump;
  /** The operator the eigenpairs belong to, when the path kept one. */
  operator?: LinearOperator;
  eigen: LanczosResult;
}

/** A single-thread matrix-free operator for H_S on `basis` (used when no matrix was stored). */
export function matrixFreeOperator(hamiltonian: PauliSum, basis: Basis, sector: Sector): LinearOperator {
  const groups = groupByFlipMask(hamiltonian, basis.nWords);
  const scan = rowScanPlan(groups, sectorFlipTest(groups, compileSector(sector, basis.qubits, basis.nWords)));
  return { dim: basis.dim, complex: groups.complex, apply: (x, y) => (y.fill(0), applyUpperRows(basis, scan, 0, basis.dim, x, y)) };
}

/** Operator view of a stored Hamiltonian (single thread). */
export function storedOperator(m: StoredHamiltonian): LinearOperator {
  if (!m.order) return storageOrderOperator(m);
  // Vectors are in basis order; the rows are not: permute in and out around each product.
  const len = m.complex ? 2 * m.dim : m.dim;
  const xs = new Float64Array(len);
  const ys = new Float64Array(len);
  return {
    dim: m.dim,
    complex: m.complex,
    apply: (x, y) => {
      permuteVector(m, x, xs, true);
      applyStoredRows(m, xs, ys);
      permuteVector(m, ys, y, false);
    },
  };
}

/** A stored matrix as an operator on vectors in its storage order, on this thread, with the fused two-pass replay. */
export function storageOrderOperator(m: StoredHamiltonian): LinearOperator {
  return {
    dim: m.dim,
    complex: m.complex,
    apply: (x, y) => applyStoredRows(m, x, y),
    replayStep: (v, vPrev, x, a, b, inv, yj) => replayStoredRows(m, v, vPrev, x, a, b, inv, yj),
  };
}

/**
 * Dimension from which the stored matrix is built renumbered for locality when its products run
 * on one thread. The renumbered rows are assembled straight from the build's pieces, so the peak
 * does not rise (bench Heisenberg cases, 64 qubits, 2 shared cores: 403 vs 433 MB at D = 2×10^6,
 * medians of 5). When this was set, before rows were also sorted by length: on one thread a
 * product took 0.5–0.76× the time and a one-eigenpair solve gained 3–15% overall from D ≈ 5×10^4,
 * for ~0.2 µs a row of renumbering; a two-thread team's product took 0.75–0.95×, which a
 * one-eigenpair solve (~50 products) did not win back. So teams keep basis order (sorted by length,
 * see LENGTH_SORT_MIN_DIM) unless `reorderFromDim` asks.
 */
export const REORDER_MIN_DIM = 50000;

/**
 * Dimension from which a real stored matrix that keeps basis order has its rows sorted by length
 * within windows (`lengthSorted`), so the product kernel sums four rows at a time. Measured on the
 * bench Heisenberg cases, 64 qubits, 2 shared cores, one process each: a two-thread product at
 * D = 10^6 took 3.6–3.8 ms instead of 8.6–9.2 ms, at 2×10^6 10.2 ms instead of 23.1 ms, for
 * 70–90 ms more assembly at 10^6 when introduced (the sort and the diagonal placed by position).
 */
export const LENGTH_SORT_MIN_DIM = 4096;

/** How the solver stores a matrix's rows (options of `buildProjectedHamiltonianParallel`); the bench builds its matrices by this too. */
export function storedRowOrder(dim: number, complex: boolean, teamed: boolean, reorderFromDim?: number): { locality: boolean; lengths: boolean } {
  const locality = dim >= (reorderFromDim ?? (teamed ? Infinity : REORDER_MIN_DIM));
  return { locality, lengths: !locality && !complex && dim >= LENGTH_SORT_MIN_DIM };
}

/** Operator view of a stored sparse matrix. */
export function matrixOperator(m: SparseMatrix): LinearOperator {
  return { dim: m.dim, complex: m.complex, apply: (x, y) => csrApplyRows(m, x, y) };
}

/** The report keys of a set of eigenpairs and how they were found (every solve path). */
export function eigenReport(eigen: LanczosResult, tol: number, seed: number): Pick<SolveReport, 'energies' | 'residuals' | 'converged' | 'iterations' | 'matvecs' | 'tolerance' | 'seed'> {
  return {
    energies: Array.from(eigen.values),
    residuals: Array.from(eigen.residuals),
    converged: eigen.converged,
    iterations: eigen.iterations,
    matvecs: eigen.matvecs,
    tolerance: tol,
    seed,
  };
}

/** The report keys that describe a projection and its eigenpairs (shared by solve and exact). */
export function projectionReport(projection: Projection, tol: number, seed: number): Pick<SolveReport, 'nonzeros' | 'complex' | 'storage' | 'memory' | 'energies' | 'residuals' | 'converged' | 'iterations' | 'matvecs' | 'tolerance' | 'seed'> {
  const { eigen, plan } = projection;
  return {
    nonzeros: projection.nonzeros,
    complex: projection.complex,
    storage: plan.storage,
    memory: { budgetBytes: plan.budgetBytes, estimatedBytes: plan.bytes.total, reason: plan.reason, ...(plan.keepVectors !== undefined ? { keptVectors: plan.keepVectors } : {}) },
    ...eigenReport(eigen, tol, seed),
  };
}

/** The `hamiltonian` report entry of a Pauli sum. */
export function hamiltonianReport(file: string, h: PauliSum): SolveReport['hamiltonian'] {
  return { file, terms: h.terms.length, constant: h.constant, qubits: h.qubits };
}

/** Check that the Hamiltonian and the samples describe the same register. */
export function checkRegister(h: PauliSum, hamiltonianFile: string, sampleQubits: number, sampleFile: string): void {
  const top = highestQubit(h);
  if (top >= sampleQubits) {
    throw new BitspanError(
      'qubit-mismatch',
      `Hamiltonian acts on qubit ${top} but the samples (${sampleFile}) have ${sampleQubits} qubits`,
      'check that the Hamiltonian and the dumps describe the same register (and the qubit order, --qubit0)',
      { file: hamiltonianFile },
    );
  }
  if (h.declaredQubits && h.qubits !== sampleQubits) {
    throw new BitspanError(
      'qubit-mismatch',
      `Hamiltonian declares qubits ${h.qubits} but the samples (${sampleFile}) have ${sampleQubits}`,
      'make the qubits line match the bitstring length',
      { file: hamiltonianFile },
    );
  }
}

/** Sector report for JSON output. */
export function sectorReport(sector: Sector, qubits: number, minCount?: number, maxDim?: number): SectorReport {
  return {
    description: describeSector(sector, qubits),
    weights: sector.weights.map((w) => ({ qubits: [w.lo, w.hi < 0 ? qubits - 1 : w.hi] as [number, number], weight: w.weight })),
    parity: sector.parity ?? null,
    minCount: minCount ?? null,
    maxDim: maxDim ?? null,
  };
}

/** The `top` most probable configurations of a (normalised) state over `basis`. */
export function topConfigurations(basis: Basis, v: Float64Array, complex: boolean, top: number, qubit0: Qubit0 = 'right'): Array<{ bitstring: string; probability: number }> {
  const n = basis.dim;
  // Probabilities computed as needed (no D-long array at the end of a solve, where memory peaks).
  const prob = (i: number): number => (complex ? v[2 * i]! ** 2 + v[2 * i + 1]! ** 2 : v[i]! ** 2);
  // Partial selection: keep a small sorted list rather than sorting all of D.
  const best: number[] = [];
  const bestProb: number[] = [];
  for (let i = 0; i < n; i++) {
    const p = prob(i);
    if (best.length === top && p <= bestProb[bestProb.length - 1]!) continue;
    let at = best.length;
    while (at > 0 && bestProb[at - 1]! < p) at--;
    best.splice(at, 0, i);
    bestProb.splice(at, 0, p);
    if (best.length > top) {
      best.pop();
      bestProb.pop();
    }
  }
  return best.map((i, k) => ({ bitstring: formatBitstring(basis.states, i * basis.nWords, basis.qubits, qubit0), probability: bestProb[k]! }));
}

/** Dimension from which a solve collects garbage between stages (a collection costs a few milliseconds). */
const COLLECT_MIN_DIM = 100000;

/** Solver settings shared by every command that diagonalises a projected Hamiltonian. */
export interface SolverSettings {
  eigs?: number;
  tol?: number;
  seed?: number;
  /** Optional start vector for Lanczos (e.g. a saved state). */
  start?: Float64Array;
  /** Worker threads for the build and the products (default: the machine's cores). */
  threads?: number;
  /** Memory budget in bytes (default: half the machine's RAM). */
  memoryBytes?: number;
  /** Apply H on the fly instead of storing H_S. */
  matrixFree?: boolean;
  /**
   * Once a stored matrix is built, release the basis's hash slots, Bloom filter and counts (the
   * basis object is left holding empty arrays): for a caller that reads only the configurations
   * afterwards, such as the CLI's plain solve. About 18 MB at D = 10^6 off the solve's peak.
   */
  releaseIndex?: boolean;
  /** Renumber a stored matrix's rows for locality from this dimension (default: REORDER_MIN_DIM when products run on one thread, else never). */
  reorderFromDim?: number;
  /** Progress of the build (rows) and of the solve (matrix-vector products, residual). */
  onBuildProgress?: (rowsDone: number, rows: number) => void;
  onSolveProgress?: (info: { matvecs: number; residual: number; energy: number }) => void;
}

/** The projected operator, its eigenpairs and how long each took. */
export interface Projection {
  /** The stored matrix; undefined in matrix-free mode. */
  matrix?: StoredHamiltonian;
  /** Nonzeros of H_S (estimated in matrix-free mode). */
  nonzeros: number;
  complex: boolean;
  plan: MemoryPlan;
  eigen: LanczosResult;
  timings: { build: number; solve: number };
}

/**
 * Build H_S on `basis` and find its lowest eigenpairs. This is the one place the build and the
 * solve are chosen (threads, matrix-free), so every command gets the same behaviour.
 */
export async function projectAndSolve(hamiltonian: PauliSum, basis: Basis, sector: Sector, settings: SolverSettings = {}): Promise<Projection> {
  const t0 = performance.now();
  const groups = groupByFlipMask(hamiltonian, basis.nWords);
  const threads = settings.threads ?? defaultThreads();
  const compiled = compileSector(sector, basis.qubits, basis.nWords);
  const scan = rowScanPlan(groups, sectorFlipTest(groups, compiled));
  const eigs = settings.eigs ?? 1;
  // Large runs start with what the previous stage dropped (e.g. the sample tables) given back.
  if (basis.dim >= COLLECT_MIN_DIM) collectGarbage();
  const plan = planMemory(basis, scan, { budgetBytes: settings.memoryBytes, eigs, matrixFree: settings.matrixFree, threads });
  const shared = basis.states.buffer instanceof SharedArrayBuffer;
  // Products run on a team of threads, or on this one.
  const teamed = threads > 1 && shared;
  // The product workers start now, so they are ready by the end of the build.
  if (teamed) startMatvecWorkers(basis.dim, threads);
  let matrix: StoredHamiltonian | undefined;
  let op: LinearOperator;
  let team: MatvecTeam | undefined;
  if (plan.storage === 'stored') {
    // The memory plan sampled rows already: nonzeros = 2·upper + dim.
    const upperPerRow = (plan.nonzerosEstimate - basis.dim) / (2 * Math.max(1, basis.dim));
    const order = storedRowOrder(basis.dim, scan.complex, teamed, settings.reorderFromDim);
    matrix = await buildProjectedHamiltonianParallel(basis, scan, threads, { upperPerRow, ...order, onProgress: settings.onBuildProgress });
    // Lanczos runs in storage order; its start vector goes in and its eigenvectors come out below.
    const m = matrix;
    op = teamed ? (team = new MatvecTeam({ kind: 'stored', complex: m.complex, dim: m.dim, matrix: m }, threads)) : storageOrderOperator(m);
  } else {
    const view: Basis = { ...basis, counts: new Float64Array(0) };
    const rows = basis.filter.byteLength >= FILTER_ORDER_MIN_BYTES ? filterOrder(basis) : undefined;
    const spec = { kind: 'free' as const, complex: groups.complex, dim: basis.dim, basis: view, plan: scan, rows };
    op = teamed ? (team = new MatvecTeam(spec, threads)) : { dim: basis.dim, complex: groups.complex, apply: (x, y) => (y.fill(0), applyUpperRows(basis, scan, 0, basis.dim, x, y, rows)) };
  }
  if (settings.releaseIndex && matrix) {
    basis.slots = new Int32Array(0);
    basis.filter = new Uint32Array(0);
    basis.counts = new Float64Array(0);
  }
  // The build's pieces are garbage now: give them back before Lanczos allocates its vectors.
  if (basis.dim >= COLLECT_MIN_DIM) collectGarbage();
  const t1 = performance.now();
  let eigen: LanczosResult;
  const reordered = matrix?.order ? matrix : undefined;
  let start = settings.start;
  if (reordered && start) {
    start = new Float64Array(start.length);
    permuteVector(reordered, settings.start!, start, true);
  }
  try {
    eigen = lanczos(op, {
      eigs,
      tol: settings.tol ?? LANCZOS_DEFAULTS.tol,
      seed: settings.seed ?? LANCZOS_DEFAULTS.seed,
      start,
      keepVectors: plan.keepVectors,
      onProgress: settings.onSolveProgress,
    });
  } finally {
    team?.close();
  }
  // In place: a second D-long vector here would add to the peak.
  if (reordered) for (const v of eigen.vectors) toBasisOrderInPlace(reordered, v);
  const t2 = performance.now();
  return {
    matrix,
    nonzeros: matrix ? storedNonzeros(matrix) : plan.nonzerosEstimate,
    complex: groups.complex,
    plan,
    eigen,
    timings: { build: (t1 - t0) / 1000, solve: (t2 - t1) / 1000 },
  };
}

/**
 * Synchronous single-thread stored build and solve, for callers that cannot await (the repair
 * loop, tests); same builder and Lanczos as `projectAndSolve`.
 */
export function projectAndSolveSync(hamiltonian: PauliSum, basis: Basis, sector: Sector, settings: SolverSettings = {}): { matrix: SparseMatrix; eigen: LanczosResult; timings: { build: number; solve: number } } {
  const t0 = performance.now();
  const matrix = buildProjectedHamiltonian(basis, groupByFlipMask(hamiltonian, basis.nWords), compileSector(sector, basis.qubits, basis.nWords));
  const t1 = performance.now();
  const eigen = lanczos(matrixOperator(matrix), {
    eigs: settings.eigs ?? 1,
    tol: settings.tol ?? LANCZOS_DEFAULTS.tol,
    seed: settings.seed ?? LANCZOS_DEFAULTS.seed,
    start: settings.start,
  });
  return { matrix, eigen, timings: { build: (t1 - t0) / 1000, solve: (performance.now() - t1) / 1000 } };
}

/** Read the Hamiltonian and dumps, select the subspace, build H_S and find its lowest eigenpairs. */
export async function solve(opts: SolveOptions): Promise<SolveOutcome> {
  if (opts.integrals !== undefined || opts.repair || opts.productSpace) {
    if (opts.analysis || opts.expand || opts.startState) {
      throw new BitspanError('bad-argument', 'estimates, expansion and start states are not available with --integrals, --repair or --product-space yet', 'run those without the molecular/repair flags');
    }
    // Optional stages are loaded when asked for, so a plain solve starts without their modules.
    const { solveWithRepair } = await import('./solveWithRepair.js');
    return solveWithRepair(opts);
  }
  if (opts.hamiltonian === undefined) throw new BitspanError('bad-argument', 'no Hamiltonian given', 'give a Pauli sum with --hamiltonian FILE or molecular integrals with --integrals FILE.fcidump');
  const hamiltonianFile = opts.hamiltonian;
  const timings: Record<string, number> = {};
  const clock = stageClock(timings);
  const hamiltonian = await readHamiltonian(hamiltonianFile);
  clock.lap('readHamiltonian');
  const sector = opts.sector ?? { weights: [] };
  const settings: SolverSettings = {
    eigs: opts.eigs,
    tol: opts.tol ?? LANCZOS_DEFAULTS.tol,
    seed: opts.seed ?? LANCZOS_DEFAULTS.seed,
    threads: opts.threads ?? defaultThreads(),
    memoryBytes: opts.memoryBytes,
    matrixFree: opts.matrixFree,
    onBuildProgress: opts.onBuildProgress,
    onSolveProgress: opts.onSolveProgress,
    releaseIndex: opts.releaseIndex,
  };
  const selected = await readAndSelect(opts, hamiltonian, hamiltonianFile, sector, settings, clock, timings);
  const sub: SubspaceSolveOptions = { hamiltonianFile, sector, minCount: opts.minCount, maxDim: opts.maxDim, ...settings, top: opts.top, qubit0: opts.qubit0, expand: opts.expand, start: selected.start, analysis: selected.analysis };
  const outcome = await solveSelected(hamiltonian, selected.sampled, selected.report, sub, selected.samples, timings);
  clock.finish();
  return outcome;
}

/**
 * Read the dumps and select the subspace. The samples are returned only when an analysis reads
 * them: otherwise nothing holds them once this returns, so their tables are freed before the build.
 */
async function readAndSelect(
  opts: SolveOptions,
  hamiltonian: PauliSum,
  hamiltonianFile: string,
  sector: Sector,
  settings: SolverSettings,
  clock: ReturnType<typeof stageClock>,
  timings: Record<string, number>,
): Promise<{ sampled: Basis; report: SubspaceReport; samples?: SampleSet; analysis?: AnalysisOptions; start?: SubspaceSolveOptions['start'] }> {
  const samples = await readRunSamples(opts);
  clock.lap('readSamples');
  checkRegister(hamiltonian, hamiltonianFile, samples.qubits, opts.samples[0]!);
  // Start the build's workers now when the subspace may be large enough to use them: their start-up
  // then overlaps the selection instead of the build.
  const threads = settings.threads ?? defaultThreads();
  const distinct = samples.groups.reduce((n, g) => n + g.table.size, 0);
  if (threads > 1 && Math.min(distinct, opts.maxDim ?? Infinity) >= MIN_ROWS_PARALLEL) startMatvecWorkers(distinct, threads);
  const analysis = opts.analysis ? await resolveAnalysis(opts.analysis, hamiltonian, samples.qubits, sector, settings, timings) : undefined;
  const start = opts.startState ? { file: opts.startState, state: await readStartState(opts.startState, samples.qubits, opts.qubit0) } : undefined;
  const { basis: sampled, report } = selectTimed(samples, { sector, minCount: opts.minCount, maxDim: opts.maxDim }, threads, timings);
  return { sampled, report, samples: analysis ? samples : undefined, analysis, start };
}

/** Options of `solveSamples` and `solveBasis`: `solve`'s options with every file already read. */
export interface SubspaceSolveOptions extends Omit<SolverSettings, 'start'> {
  hamiltonianFile: string;
  sector: Sector;
  minCount?: number;
  maxDim?: number;
  top?: number;
  qubit0?: Qubit0;
  expand?: ExpandOptions;
  /** A saved state to start Lanczos from (mapped onto the final basis). */
  start?: { file: string; state: StateOnConfigs };
  analysis?: AnalysisOptions;
}

/**
 * Select the subspace from samples already read, expand it if asked, then `solveBasis`. The sweep
 * calls this for every point, so each point is exactly a solve. `timings` receives the stages.
 */
export async function solveSamples(hamiltonian: PauliSum, samples: SampleSet, opts: SubspaceSolveOptions, timings: Record<string, number> = {}): Promise<SolveOutcome> {
  const { basis: sampled, report } = selectTimed(samples, opts, opts.threads ?? defaultThreads(), timings);
  return solveSelected(hamiltonian, sampled, report, opts, samples, timings);
}

/** `selectSubspace` (on shared memory when threads will read the basis), timed as the `filter` stage. */
function selectTimed(samples: SampleSet, sel: { sector: Sector; minCount?: number; maxDim?: number }, threads: number, timings: Record<string, number>): { basis: Basis; report: SubspaceReport } {
  const t = performance.now();
  const selected = selectSubspace(samples, { sector: sel.sector, minCount: sel.minCount, maxDim: sel.maxDim, shared: threads > 1 });
  timings.filter = (performance.now() - t) / 1000;
  return selected;
}

/** Expand the selected subspace if asked, then `solveBasis`; `samples` only for the analysis that reads them. */
export async function solveSelected(hamiltonian: PauliSum, sampled: Basis, report: SubspaceReport, opts: SubspaceSolveOptions, samples: SampleSet | undefined, timings: Record<string, number> = {}): Promise<SolveOutcome> {
  let basis = sampled;
  let expansion: ExpansionReport | undefined;
  if (opts.expand && opts.expand.steps > 0) {
    const t = performance.now();
    const lowestOf = async (b: Basis): Promise<{ energy: number; psi: Float64Array }> => {
      // Expansion looks configurations up between its solves: their bases keep their index.
      const p = await projectAndSolve(hamiltonian, b, opts.sector, { ...opts, start: undefined, eigs: 1, releaseIndex: false });
      return { energy: p.eigen.values[0]!, psi: p.eigen.vectors[0]! };
    };
    const { expandSubspace } = await import('./expand.js');
    ({ basis, report: expansion } = await expandSubspace(hamiltonian, sampled, opts.sector, opts.expand, lowestOf));
    timings.expand = (performance.now() - t) / 1000;
  }
  return solveBasis(hamiltonian, basis, report, opts, { samples, sampledBasis: sampled, expansion }, timings);
}

/**
 * Build and solve on a given basis and make the report (plus the analysis asked for). `subspace` is
 * the shot account of the sampled configurations the basis came from.
 */
export async function solveBasis(
  hamiltonian: PauliSum,
  basis: Basis,
  subspace: SubspaceReport,
  opts: SubspaceSolveOptions,
  extras: { samples?: SampleSet; sampledBasis?: Basis; expansion?: ExpansionReport } = {},
  timings: Record<string, number> = {},
): Promise<SolveOutcome> {
  const tol = opts.tol ?? LANCZOS_DEFAULTS.tol;
  const seed = opts.seed ?? LANCZOS_DEFAULTS.seed;
  const complex = groupByFlipMask(hamiltonian, basis.nWords).complex;
  const start = opts.start ? stateOnBasis(opts.start.state, basis, complex) : null;
  const threads = opts.threads ?? defaultThreads();
  // The index is needed afterwards to match a start state and by the analyses; after an expansion
  // it is kept, as SolveOptions.releaseIndex says.
  const releaseIndex = opts.releaseIndex === true && !opts.start && !opts.analysis && !extras.expansion;
  const projection = await projectAndSolve(hamiltonian, basis, opts.sector, { ...opts, tol, seed, threads, start: start ?? undefined, releaseIndex });
  const { matrix, eigen } = projection;
  timings.build = projection.timings.build;
  timings.solve = projection.timings.solve;
  const result: SolveReport = {
    command: 'solve',
    qubits: basis.qubits,
    dimension: basis.dim,
    ...projectionReport(projection, tol, seed),
    hamiltonian: hamiltonianReport(opts.hamiltonianFile, hamiltonian),
    samples: subspace,
    sector: sectorReport(opts.sector, basis.qubits, opts.minCount, opts.maxDim),
    threads,
    timings,
    groundState: { top: topConfigurations(basis, eigen.vectors[0]!, projection.complex, opts.top ?? 10, opts.qubit0) },
  };
  if (extras.expansion) result.expansion = extras.expansion;
  if (opts.start) {
    const matched = countMatched(opts.start.state, basis);
    result.startState = { file: opts.start.file, configurations: opts.start.state.count, matched, used: start !== null };
  }
  if (opts.analysis) {
    const solveOn = async (b: Basis): Promise<{ energy: number; residual: number }> => {
      const p = await projectAndSolve(hamiltonian, b, opts.sector, { ...opts, start: undefined, eigs: 1, tol, seed, threads, releaseIndex: false });
      return { energy: p.eigen.values[0]!, residual: p.eigen.residuals[0]! };
    };
    const operator = matrix ? storedOperator(matrix) : matrixFreeOperator(hamiltonian, basis, opts.sector);
    const { analyzeLowest } = await import('./analyze.js');
    const { keys, timings: at } = await analyzeLowest(
      { hamiltonian, basis, sector: opts.sector, eigen, operator, sampledBasis: extras.sampledBasis, samples: extras.samples, solveOn },
      opts.analysis,
    );
    Object.assign(result, keys);
    Object.assign(timings, at);
  }
  return { report: result, basis, matrix, hamiltonian, eigen };
}

/**
 * The exact lowest energy of H in the whole sector (enumerated, at most `maxDim` configurations),
 * solved by the same build-and-solve entry.
 */
export async function exactReference(hamiltonian: PauliSum, qubits: number, sector: Sector, maxDim: number, settings: SolverSettings = {}): Promise<ReferenceEnergy> {
  const { enumerateSector, sectorDimension } = await import('../sectors/enumerateSector.js');
  const dim = sectorDimension(sector, qubits);
  if (dim > maxDim) {
    throw new BitspanError('too-large', `the whole sector has ${dim} configurations, more than --exact-max-dim ${maxDim}`, 'give --reference E instead, or raise --exact-max-dim');
  }
  const e = enumerateSector(sector, qubits);
  const threads = settings.threads ?? defaultThreads();
  const basis = makeBasis(qubits, e.nWords, e.states, e.count, undefined, threads > 1);
  const p = await projectAndSolve(hamiltonian, basis, sector, { ...settings, eigs: 1, threads });
  return { energy: p.eigen.values[0]!, source: 'exact', dimension: basis.dim };
}

/** Default cap on the sector size `exact` diagonalises. */
export const EXACT_MAX_DIM = 1 << 20;

/** Turn `SolveAnalysisOptions` (paths, flags) into `AnalysisOptions` (parsed, computed), timing the exact reference. */
export async function resolveAnalysis(
  a: SolveAnalysisOptions,
  hamiltonian: PauliSum,
  qubits: number,
  sector: Sector,
  settings: SolverSettings,
  timings: Record<string, number> = {},
): Promise<AnalysisOptions> {
  const { reference, exact, exactMaxDim, observables, batches, ...rest } = a;
  const out: AnalysisOptions = { ...rest };
  if (observables) {
    const { readObservables } = await import('../io/observablesText.js');
    const read = await readObservables(observables);
    for (const o of read.observables) {
      const top = highestMaskBit(o.x, o.z);
      if (top >= qubits) {
        throw new BitspanError('qubit-mismatch', `observable '${o.ops}' acts on qubit ${top} but the samples have ${qubits} qubits`, 'qubit indices are 0-based', { file: observables, line: o.line });
      }
    }
    out.observables = read.observables;
  }
  if (batches) out.batches = { count: batches.count, size: batches.size, seed: batches.seed ?? settings.seed ?? LANCZOS_DEFAULTS.seed };
  if (exact) {
    const t = performance.now();
    out.reference = await exactReference(hamiltonian, qubits, sector, exactMaxDim ?? EXACT_MAX_DIM, settings);
    timings.exact = (performance.now() - t) / 1000;
  } else if (reference !== undefined) out.reference = { energy: reference, source: 'given' };
  return out;
}

/** Read a saved state for a register of `qubits` qubits (`bad-state` if the sizes differ). */
export async function readStartState(file: string, qubits: number, qubit0?: Qubit0): Promise<StateOnConfigs> {
  const { readStateCsv } = await import('../io/stateCsv.js');
  const state = await readStateCsv(file, { qubit0 });
  if (state.qubits !== qubits) {
    throw new BitspanError('bad-state', `saved state has ${state.qubits} qubits but the samples have ${qubits}`, 'give a state saved from the same register', { file });
  }
  return state;
}

function countMatched(state: StateOnConfigs, basis: Basis): number {
  let n = 0;
  for (let i = 0; i < state.count; i++) if (basisIndexOf(basis, state.states, i * state.nWords) >= 0) n++;
  return n;
}

function highestMaskBit(x: Uint32Array, z: Uint32Array): number {
  for (let k = x.length - 1; k >= 0; k--) {
    const m = (x[k]! | z[k]!) >>> 0;
    if (m !== 0) return k * 32 + 31 - Math.clz32(m);
  }
  return -1;
}
