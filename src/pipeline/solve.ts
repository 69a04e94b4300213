import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { formatBitstring } from '../bits/packed.js';
import { buildProjectedHamiltonian } from '../build/projectedHamiltonian.js';
import { csrApplyRows, nonzeros, type SparseMatrix } from '../build/sparseMatrix.js';
import type { Qubit0 } from '../io/bitstringParser.js';
import { readFcidump, type Fcidump } from '../io/fcidump.js';
import { readHamiltonian } from '../io/readHamiltonian.js';
import { readSamples, type SampleFormat } from '../io/readSamples.js';
import { countNonzeroIntegrals } from '../operators/integrals.js';
import { groupByFlipMask, highestQubit, type PauliSum } from '../operators/pauliSum.js';
import { electronSector, electronsFromHeader } from '../sectors/electronSector.js';
import { compileSector, describeSector, type Sector } from '../sectors/sector.js';
import type { SubspaceReport } from '../sectors/selectSubspace.js';
import { lanczos, LANCZOS_DEFAULTS, type LanczosResult, type LinearOperator } from '../solvers/lanczos.js';
import { DEFAULT_MEMORY_BUDGET, projectDeterminants, type DeterminantStorage } from './projectDeterminants.js';
import { solveSubspace, type ProductSpaceReport, type RepairReport } from './solveSubspace.js';

/** Everything `solve` needs; file paths are read here, at the edge. */
export interface SolveOptions {
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
  /** Bytes the determinant path may use for its matrix and vectors. */
  memoryBudget?: number;
  /** Progress lines (e.g. the product-space dimension before building). */
  log?: (line: string) => void;
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
}

/** The JSON `solve --json` prints: every energy travels with its residual and its subspace. */
export interface SolveReport {
  command: 'solve';
  qubits: number;
  dimension: number;
  nonzeros: number;
  complex: boolean;
  energies: number[];
  residuals: number[];
  converged: boolean;
  iterations: number;
  matvecs: number;
  tolerance: number;
  seed: number;
  hamiltonian: { file: string; terms: number; constant: number; qubits: number };
  samples: SubspaceReport;
  sector: SectorReport;
  timings: Record<string, number>;
  groundState: { top: Array<{ bitstring: string; probability: number }> };
  /** Present with `integrals`: what the FCIDUMP held and how H was stored. */
  integrals?: IntegralsReport;
  /** Present with `repair`: per round, shots recovered and the energy. */
  repair?: RepairReport;
  /** Present with `productSpace`. */
  productSpace?: ProductSpaceReport;
}

/** The `integrals` entry of a report: what the FCIDUMP held and how H was stored. */
export interface IntegralsReport {
  file: string;
  orbitals: number;
  electrons: [number, number];
  nelec: number | null;
  ms2: number;
  isym: number;
  orbsym: number[];
  core: number;
  storage: DeterminantStorage;
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
  /** The stored projected matrix; absent when the determinant path applied H matrix-free. */
  matrix: SparseMatrix | undefined;
  /** The operator the eigenpairs belong to. */
  operator: LinearOperator;
  /** The Pauli Hamiltonian (qubit path) or the FCIDUMP (determinant path). */
  hamiltonian: PauliSum | undefined;
  integrals: Fcidump | undefined;
  eigen: LanczosResult;
}

/** The Hamiltonian a run works with: a Pauli sum or molecular integrals. */
export type LoadedOperator = { kind: 'pauli'; file: string; sum: PauliSum } | { kind: 'integrals'; file: string; dump: Fcidump };

/** Read the Hamiltonian named by the options; throws `bad-argument` unless exactly one is given. */
export async function loadOperator(opts: Pick<SolveOptions, 'hamiltonian' | 'integrals'>): Promise<LoadedOperator> {
  if ((opts.hamiltonian === undefined) === (opts.integrals === undefined)) {
    throw new BitspanError('bad-argument', opts.hamiltonian ? 'both --hamiltonian and --integrals given' : 'no Hamiltonian given', 'give a Pauli sum with --hamiltonian FILE or molecular integrals with --integrals FILE.fcidump');
  }
  if (opts.integrals !== undefined) return { kind: 'integrals', file: opts.integrals, dump: await readFcidump(opts.integrals) };
  return { kind: 'pauli', file: opts.hamiltonian!, sum: await readHamiltonian(opts.hamiltonian!) };
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
}

/** The projected matrix, its eigenpairs and how long each took. */
export interface Projection {
  matrix: SparseMatrix;
  eigen: LanczosResult;
  timings: { build: number; solve: number };
}

/**
 * Build H_S on `basis` and find its lowest eigenpairs. This is the one place the build and the
 * solve are chosen (threads, matrix-free), so every command gets the same behaviour.
 */
export function projectAndSolve(hamiltonian: PauliSum, basis: Basis, sector: Sector, settings: SolverSettings = {}): Projection {
  const t0 = performance.now();
  const groups = groupByFlipMask(hamiltonian, basis.nWords);
  const matrix = buildProjectedHamiltonian(basis, groups, compileSector(sector, basis.qubits, basis.nWords));
  const t1 = performance.now();
  const eigen = lanczos(matrixOperator(matrix), {
    eigs: settings.eigs ?? 1,
    tol: settings.tol ?? LANCZOS_DEFAULTS.tol,
    seed: settings.seed ?? LANCZOS_DEFAULTS.seed,
    start: settings.start,
  });
  const t2 = performance.now();
  return { matrix, eigen, timings: { build: (t1 - t0) / 1000, solve: (t2 - t1) / 1000 } };
}

/** A projection of either kind of Hamiltonian, in the shape a report needs. */
interface OperatorProjection {
  matrix: SparseMatrix | undefined;
  operator: LinearOperator;
  eigen: LanczosResult;
  nonzeros: number;
  complex: boolean;
  /** How the determinant Hamiltonian was held (undefined for Pauli sums). */
  storage: DeterminantStorage | undefined;
  timings: { build: number; solve: number };
}

/** Project a Pauli sum (qubit path) or molecular integrals (determinant path) on `basis` and solve. */
function projectOperator(operator: LoadedOperator, basis: Basis, sector: Sector, settings: SolverSettings & { memoryBudget: number }): OperatorProjection {
  if (operator.kind === 'pauli') {
    const p = projectAndSolve(operator.sum, basis, sector, settings);
    return { ...p, operator: matrixOperator(p.matrix), nonzeros: nonzeros(p.matrix), complex: p.matrix.complex, storage: undefined };
  }
  return { ...projectDeterminants(operator.dump.integrals, basis, settings), complex: false };
}

/** Read the Hamiltonian and dumps, select (or repair) the subspace, build H_S and find its lowest eigenpairs. */
export async function solve(opts: SolveOptions): Promise<SolveOutcome> {
  const t0 = performance.now();
  const timings: Record<string, number> = {};
  const lap = (name: string, since: number): number => {
    const now = performance.now();
    timings[name] = (now - since) / 1000;
    return now;
  };
  const operator = await loadOperator(opts);
  const t = lap('readHamiltonian', t0);
  const samples = await readSamples(opts.samples, { qubits: opts.qubits, qubit0: opts.qubit0, format: opts.format });
  lap('readSamples', t);
  let sector = opts.sector ?? { weights: [] };
  let electrons: [number, number] | undefined;
  if (operator.kind === 'pauli') {
    checkRegister(operator.sum, operator.file, samples.qubits, opts.samples[0]!);
    if (opts.productSpace) throw new BitspanError('bad-argument', '--product-space needs --integrals', 'the spin-up × spin-down closure is defined for determinants of molecular orbitals');
  } else {
    const m = operator.dump.integrals.orbitals;
    if (samples.qubits !== 2 * m) {
      throw new BitspanError('qubit-mismatch', `the integrals have ${m} orbitals (${2 * m} qubits) but the samples (${opts.samples[0]}) have ${samples.qubits} qubits`, 'spin-up orbital p is qubit p−1 and spin-down orbital p is qubit M+p−1: samples need 2·NORB qubits', { file: operator.file });
    }
    electrons = opts.electrons ?? electronsFromHeader(operator.dump.electrons, operator.dump.ms2, operator.file);
    const spins = electronSector(m, electrons[0], electrons[1]);
    sector = { weights: [...spins.weights, ...sector.weights], parity: sector.parity };
  }
  const tol = opts.tol ?? LANCZOS_DEFAULTS.tol;
  const seed = opts.seed ?? LANCZOS_DEFAULTS.seed;
  const settings = { eigs: opts.eigs, tol, seed };
  const memoryBudget = opts.memoryBudget ?? DEFAULT_MEMORY_BUDGET;
  const run = solveSubspace(
    samples,
    {
      sector,
      minCount: opts.minCount,
      maxDim: opts.maxDim,
      repair: opts.repair ? { rounds: opts.repairRounds ?? 3, seed, tol } : undefined,
      productSpace: opts.productSpace && operator.kind === 'integrals' ? { orbitals: operator.dump.integrals.orbitals, memoryBudget } : undefined,
      log: opts.log,
    },
    (basis) => projectOperator(operator, basis, sector, { ...settings, memoryBudget }),
  );
  const { basis, projection, report } = run;
  const { eigen } = projection;
  timings.filter = run.timings.filter;
  timings.build = run.timings.build;
  timings.solve = run.timings.solve;
  timings.total = (performance.now() - t0) / 1000;
  const result: SolveReport = {
    command: 'solve',
    qubits: samples.qubits,
    dimension: basis.dim,
    nonzeros: projection.nonzeros,
    complex: projection.complex,
    energies: Array.from(eigen.values),
    residuals: Array.from(eigen.residuals),
    converged: eigen.converged,
    iterations: eigen.iterations,
    matvecs: eigen.matvecs,
    tolerance: tol,
    seed,
    hamiltonian:
      operator.kind === 'pauli'
        ? { file: operator.file, terms: operator.sum.terms.length, constant: operator.sum.constant, qubits: operator.sum.qubits }
        : { file: operator.file, terms: countNonzeroIntegrals(operator.dump.integrals), constant: operator.dump.integrals.core, qubits: 2 * operator.dump.integrals.orbitals },
    samples: report,
    sector: sectorReport(sector, samples.qubits, opts.minCount, opts.maxDim),
    timings,
    groundState: { top: topConfigurations(basis, eigen.vectors[0]!, projection.complex, opts.top ?? 10, opts.qubit0) },
  };
  if (operator.kind === 'integrals' && electrons && projection.storage) {
    const d = operator.dump;
    result.integrals = { file: d.file, orbitals: d.integrals.orbitals, electrons, nelec: d.electrons ?? null, ms2: d.ms2, isym: d.isym, orbsym: d.orbsym, core: d.integrals.core, storage: projection.storage };
  }
  if (run.repair) result.repair = run.repair;
  if (run.productSpace) result.productSpace = run.productSpace;
  return {
    report: result,
    basis,
    matrix: projection.matrix,
    operator: projection.operator,
    hamiltonian: operator.kind === 'pauli' ? operator.sum : undefined,
    integrals: operator.kind === 'integrals' ? operator.dump : undefined,
    eigen,
  };
}
