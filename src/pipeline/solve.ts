import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { formatBitstring } from '../bits/packed.js';
import { buildProjectedHamiltonianParallel } from '../build/parallelBuild.js';
import { planMemory, type MemoryPlan } from '../build/memoryPlan.js';
import { applyUpperRows, sectorFlipTest } from '../build/projectedHamiltonian.js';
import { MatvecTeam } from '../parallel/matvecTeam.js';
import { defaultThreads } from '../parallel/threadPool.js';
import { csrApplyRows, nonzeros, type SparseMatrix } from '../build/sparseMatrix.js';
import type { Qubit0 } from '../io/bitstringParser.js';
import { readHamiltonian } from '../io/readHamiltonian.js';
import { readSamples, type SampleFormat } from '../io/readSamples.js';
import { groupByFlipMask, highestQubit, type PauliSum } from '../operators/pauliSum.js';
import { compileSector, describeSector, type Sector } from '../sectors/sector.js';
import { selectSubspace, type SubspaceReport } from '../sectors/selectSubspace.js';
import { lanczos, LANCZOS_DEFAULTS, type LanczosResult, type LinearOperator } from '../solvers/lanczos.js';

/** Everything `solve` needs; file paths are read here, at the edge. */
export interface SolveOptions {
  hamiltonian: string;
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
  onBuildProgress?: SolverSettings['onBuildProgress'];
  onSolveProgress?: SolverSettings['onSolveProgress'];
}

/** The JSON `solve --json` prints: every energy travels with its residual and its subspace. */
export interface SolveReport {
  command: 'solve';
  qubits: number;
  dimension: number;
  nonzeros: number;
  complex: boolean;
  /** `stored` CSR or `matrix-free` products. */
  storage: 'stored' | 'matrix-free';
  memory: { budgetBytes: number; estimatedBytes: number; reason: string };
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
  matrix?: SparseMatrix;
  hamiltonian: PauliSum;
  eigen: LanczosResult;
}

/** Operator view of a stored sparse matrix. */
export function matrixOperator(m: SparseMatrix): LinearOperator {
  return { dim: m.dim, complex: m.complex, apply: (x, y) => csrApplyRows(m, x, y) };
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
  const prob = new Float64Array(n);
  for (let i = 0; i < n; i++) prob[i] = complex ? v[2 * i]! ** 2 + v[2 * i + 1]! ** 2 : v[i]! ** 2;
  // Partial selection: keep a small sorted list rather than sorting all of D.
  const best: number[] = [];
  for (let i = 0; i < n; i++) {
    if (best.length === top && prob[i]! <= prob[best[best.length - 1]!]!) continue;
    let at = best.length;
    while (at > 0 && prob[best[at - 1]!]! < prob[i]!) at--;
    best.splice(at, 0, i);
    if (best.length > top) best.pop();
  }
  return best.map((i) => ({ bitstring: formatBitstring(basis.states, i * basis.nWords, basis.qubits, qubit0), probability: prob[i]! }));
}

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
  /** Progress of the build (rows) and of the solve (matrix-vector products, residual). */
  onBuildProgress?: (rowsDone: number, rows: number) => void;
  onSolveProgress?: (info: { matvecs: number; residual: number; energy: number }) => void;
}

/** The projected operator, its eigenpairs and how long each took. */
export interface Projection {
  /** The stored matrix; undefined in matrix-free mode. */
  matrix?: SparseMatrix;
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
  const test = sectorFlipTest(groups, compiled);
  const eigs = settings.eigs ?? 1;
  const plan = planMemory(basis, groups, test, { budgetBytes: settings.memoryBytes, eigs, matrixFree: settings.matrixFree, threads });
  const shared = basis.states.buffer instanceof SharedArrayBuffer;
  let matrix: SparseMatrix | undefined;
  let op: LinearOperator;
  let team: MatvecTeam | undefined;
  if (plan.storage === 'stored') {
    matrix = await buildProjectedHamiltonianParallel(basis, groups, compiled, threads, settings.onBuildProgress);
    op = threads > 1 && shared ? (team = new MatvecTeam({ kind: 'stored', complex: matrix.complex, dim: matrix.dim, matrix }, threads)) : matrixOperator(matrix);
  } else {
    const view: Basis = { ...basis, counts: new Float64Array(0) };
    const spec = { kind: 'free' as const, complex: groups.complex, dim: basis.dim, basis: view, groups, test };
    op = threads > 1 && shared ? (team = new MatvecTeam(spec, threads)) : { dim: basis.dim, complex: groups.complex, apply: (x, y) => (y.fill(0), applyUpperRows(basis, groups, test, 0, basis.dim, x, y)) };
  }
  const t1 = performance.now();
  let eigen: LanczosResult;
  try {
    eigen = lanczos(op, {
      eigs,
      tol: settings.tol ?? LANCZOS_DEFAULTS.tol,
      seed: settings.seed ?? LANCZOS_DEFAULTS.seed,
      start: settings.start,
      onProgress: settings.onSolveProgress,
    });
  } finally {
    team?.close();
  }
  const t2 = performance.now();
  return {
    matrix,
    nonzeros: matrix ? nonzeros(matrix) : plan.nonzerosEstimate,
    complex: groups.complex,
    plan,
    eigen,
    timings: { build: (t1 - t0) / 1000, solve: (t2 - t1) / 1000 },
  };
}

/** Read the Hamiltonian and dumps, select the subspace, build H_S and find its lowest eigenpairs. */
export async function solve(opts: SolveOptions): Promise<SolveOutcome> {
  const t0 = performance.now();
  const timings: Record<string, number> = {};
  const lap = (name: string, since: number): number => {
    const now = performance.now();
    timings[name] = (now - since) / 1000;
    return now;
  };
  const hamiltonian = await readHamiltonian(opts.hamiltonian);
  const t = lap('readHamiltonian', t0);
  const samples = await readSamples(opts.samples, { qubits: opts.qubits, qubit0: opts.qubit0, format: opts.format });
  const tSamples = lap('readSamples', t);
  checkRegister(hamiltonian, opts.hamiltonian, samples.qubits, opts.samples[0]!);
  const sector = opts.sector ?? { weights: [] };
  const threads = opts.threads ?? defaultThreads();
  const { basis, report } = selectSubspace(samples, { sector, minCount: opts.minCount, maxDim: opts.maxDim, shared: threads > 1 });
  lap('filter', tSamples);
  const tol = opts.tol ?? LANCZOS_DEFAULTS.tol;
  const seed = opts.seed ?? LANCZOS_DEFAULTS.seed;
  const projection = await projectAndSolve(hamiltonian, basis, sector, {
    eigs: opts.eigs,
    tol,
    seed,
    threads,
    memoryBytes: opts.memoryBytes,
    matrixFree: opts.matrixFree,
    onBuildProgress: opts.onBuildProgress,
    onSolveProgress: opts.onSolveProgress,
  });
  const { matrix, eigen, plan } = projection;
  timings.build = projection.timings.build;
  timings.solve = projection.timings.solve;
  timings.total = (performance.now() - t0) / 1000;
  // Run-to-run varying like the times, so it travels with them (process peak, in MiB).
  timings.peakRSSMB = process.resourceUsage().maxRSS / 1024;
  const result: SolveReport = {
    command: 'solve',
    qubits: samples.qubits,
    dimension: basis.dim,
    nonzeros: projection.nonzeros,
    complex: projection.complex,
    storage: plan.storage,
    memory: { budgetBytes: plan.budgetBytes, estimatedBytes: plan.bytes.total, reason: plan.reason },
    energies: Array.from(eigen.values),
    residuals: Array.from(eigen.residuals),
    converged: eigen.converged,
    iterations: eigen.iterations,
    matvecs: eigen.matvecs,
    tolerance: tol,
    seed,
    hamiltonian: { file: opts.hamiltonian, terms: hamiltonian.terms.length, constant: hamiltonian.constant, qubits: hamiltonian.qubits },
    samples: report,
    sector: sectorReport(sector, samples.qubits, opts.minCount, opts.maxDim),
    threads,
    timings,
    groundState: { top: topConfigurations(basis, eigen.vectors[0]!, projection.complex, opts.top ?? 10, opts.qubit0) },
  };
  return { report: result, basis, matrix, hamiltonian, eigen };
}
