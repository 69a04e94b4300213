import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { nonzeros, type SparseMatrix } from '../build/sparseMatrix.js';
import { readFcidump, type Fcidump } from '../io/fcidump.js';
import { readHamiltonian } from '../io/readHamiltonian.js';
import { countNonzeroIntegrals } from '../operators/integrals.js';
import type { PauliSum } from '../operators/pauliSum.js';
import { electronSector, electronsFromHeader } from '../sectors/electronSector.js';
import type { Sector } from '../sectors/sector.js';
import { LANCZOS_DEFAULTS, type LanczosResult, type LinearOperator } from '../solvers/lanczos.js';
import { DEFAULT_MEMORY_BUDGET, projectDeterminants, type DeterminantStorage } from './projectDeterminants.js';
import { solveSubspace } from './solveSubspace.js';
import {
  checkRegister,
  eigenReport,
  matrixOperator,
  projectAndSolveSync,
  readRunSamples,
  stageClock,
  sectorReport,
  topConfigurations,
  type SolveOptions,
  type SolveOutcome,
  type SolveReport,
  type SolverSettings,
} from './solve.js';

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
    // The repair loop is synchronous: one thread, stored matrix.
    const p = projectAndSolveSync(operator.sum, basis, sector, settings);
    return { ...p, operator: matrixOperator(p.matrix), nonzeros: nonzeros(p.matrix), complex: p.matrix.complex, storage: undefined };
  }
  return { ...projectDeterminants(operator.dump.integrals, basis, settings), complex: false };
}

/**
 * `solve` for molecular integrals, and for repair or product-space runs: select (or repair) the
 * subspace, build H_S in the determinant or qubit basis, and find its lowest eigenpairs.
 */
export async function solveWithRepair(opts: SolveOptions): Promise<SolveOutcome> {
  const timings: Record<string, number> = {};
  const clock = stageClock(timings);
  const operator = await loadOperator(opts);
  clock.lap('readHamiltonian');
  const samples = await readRunSamples(opts);
  clock.lap('readSamples');
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
  const memoryBudget = opts.memoryBytes ?? DEFAULT_MEMORY_BUDGET;
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
  clock.finish();
  const result: SolveReport = {
    command: 'solve',
    qubits: samples.qubits,
    dimension: basis.dim,
    nonzeros: projection.nonzeros,
    complex: projection.complex,
    storage: projection.storage === 'matrix-free' ? 'matrix-free' : 'stored',
    memory: { budgetBytes: memoryBudget, estimatedBytes: 0, reason: projection.storage === undefined ? 'qubit path with repair' : `determinant Hamiltonian ${projection.storage}` },
    ...eigenReport(eigen, tol, seed),
    hamiltonian:
      operator.kind === 'pauli'
        ? { file: operator.file, terms: operator.sum.terms.length, constant: operator.sum.constant, qubits: operator.sum.qubits }
        : { file: operator.file, terms: countNonzeroIntegrals(operator.dump.integrals), constant: operator.dump.integrals.core, qubits: 2 * operator.dump.integrals.orbitals },
    samples: report,
    sector: sectorReport(sector, samples.qubits, opts.minCount, opts.maxDim),
    threads: 1,
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
