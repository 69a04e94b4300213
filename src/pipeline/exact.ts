import { totalmem } from 'node:os';
import { BitspanError } from '../errors.js';
import { makeBasis, type Basis } from '../bits/basis.js';
import type { StoredHamiltonian } from '../build/storedHamiltonian.js';
import { defaultThreads } from '../parallel/threads.js';
import { sectorFlipTest } from '../build/projectedHamiltonian.js';
import type { Qubit0 } from '../io/bitstringParser.js';
import { readHamiltonian } from '../io/readHamiltonian.js';
import { groupByFlipMask, highestQubit, type PauliSum } from '../operators/pauliSum.js';
import { compileSector, describeSector, type Sector } from '../sectors/sector.js';
import { enumerateSector, sectorDimension } from '../sectors/enumerateSector.js';
import type { SubspaceReport } from '../sectors/selectSubspace.js';
import { LANCZOS_DEFAULTS, type LanczosResult } from '../solvers/lanczos.js';
import { hamiltonianReport, projectAndSolve, projectionReport, sectorReport, topConfigurations, type SolveReport } from './solve.js';

/** Options of `exact`: a Hamiltonian file and the sector whose every configuration is kept. */
export interface ExactOptions {
  hamiltonian: string;
  sector?: Sector;
  /** Register size when the file does not declare one (must match when it does). */
  qubits?: number;
  eigs?: number;
  tol?: number;
  seed?: number;
  top?: number;
  qubit0?: Qubit0;
  threads?: number;
  memoryBytes?: number;
  matrixFree?: boolean;
}

/** The `samples` block of an exact run: the enumerated sector stands where the dumps would be. */
export interface EnumeratedSamples extends SubspaceReport {
  /** Always true: the subspace is the whole sector, not sampled. */
  enumerated: true;
}

/** `exact --json`: the keys of `solve --json`, with the enumerated sector as its samples. */
export type ExactReport = Omit<SolveReport, 'command' | 'samples'> & { command: 'exact'; samples: EnumeratedSamples };

/** In-memory results of `exact`. */
export interface ExactOutcome {
  report: ExactReport;
  basis: Basis;
  matrix?: StoredHamiltonian;
  hamiltonian: PauliSum;
  eigen: LanczosResult;
}

/** Fraction of physical memory an exact solve may plan to use. */
const MEMORY_FRACTION = 0.6;

/**
 * Bytes an exact solve of dimension `dim` needs: packed states (twice while sorting), the hash
 * slots, the CSR matrix with at most one entry per allowed flip group per row, and the Lanczos vectors.
 */
export function exactMemoryEstimate(h: PauliSum, sector: Sector, qubits: number, dim: number, eigs: number): number {
  const nWords = Math.max(1, (qubits + 31) >>> 5);
  const groups = groupByFlipMask(h, nWords);
  const test = sectorFlipTest(groups, compileSector(sector, qubits, nWords));
  let allowed = 0;
  for (let g = 0; g < groups.count; g++) allowed += test.groupAllowed[g]!;
  const scalar = groups.complex ? 16 : 8;
  const lanczosVectors = Math.max(2 * eigs + 18, eigs + 2) + eigs + 2;
  return dim * (2 * nWords * 4 + 4 * 4 + 8 + 8 + (allowed + 1) * (4 + scalar) + lanczosVectors * scalar);
}

/** Resolve the register size from the file and `--qubits`. */
function registerSize(h: PauliSum, file: string, qubits: number | undefined): number {
  if (qubits === undefined) return h.qubits;
  if (h.declaredQubits && h.qubits !== qubits) {
    throw new BitspanError('qubit-mismatch', `--qubits ${qubits} but the Hamiltonian declares qubits ${h.qubits}`, 'drop --qubits or make them agree', { file });
  }
  if (highestQubit(h) >= qubits) {
    throw new BitspanError('qubit-mismatch', `--qubits ${qubits} but the Hamiltonian acts on qubit ${highestQubit(h)}`, 'qubit indices are 0-based; raise --qubits', { file });
  }
  return qubits;
}

/**
 * The lowest eigenpairs of H in a whole sector: every configuration with the given weights and
 * parity is enumerated, then built and solved exactly as `solve` does (`projectAndSolve`).
 * Throws `too-large` when the sector will not fit in memory, and `empty-subspace` when it is empty.
 */
export async function exact(opts: ExactOptions): Promise<ExactOutcome> {
  const t0 = performance.now();
  const timings: Record<string, number> = {};
  const hamiltonian = await readHamiltonian(opts.hamiltonian);
  const t1 = performance.now();
  timings.readHamiltonian = (t1 - t0) / 1000;
  const qubits = registerSize(hamiltonian, opts.hamiltonian, opts.qubits);
  const sector = opts.sector ?? { weights: [] };
  const eigs = opts.eigs ?? 1;
  const dim = sectorDimension(sector, qubits);
  const description = describeSector(sector, qubits);
  if (dim === 0) {
    throw new BitspanError('empty-subspace', `the sector (${description}) of ${qubits} qubits holds no configuration`, 'check the weights against the register sizes and the parity');
  }
  const need = exactMemoryEstimate(hamiltonian, sector, qubits, dim, eigs);
  const budget = MEMORY_FRACTION * totalmem();
  if (!(need <= budget) || dim > 2 ** 31 - 1) {
    throw new BitspanError(
      'too-large',
      `the sector (${description}) of ${qubits} qubits has ${dim.toExponential(3)} configurations, needing about ${(need / 2 ** 30).toFixed(1)} GiB; this machine allows ${(budget / 2 ** 30).toFixed(1)} GiB`,
      'narrow the sector with --weight A-B=K per register and --parity, or use a smaller model',
      { file: opts.hamiltonian },
    );
  }
  const { states, count, nWords } = enumerateSector(sector, qubits);
  const threads = opts.threads ?? defaultThreads();
  const basis = makeBasis(qubits, nWords, states, count, undefined, threads > 1);
  const t2 = performance.now();
  timings.enumerate = (t2 - t1) / 1000;
  const tol = opts.tol ?? LANCZOS_DEFAULTS.tol;
  const seed = opts.seed ?? LANCZOS_DEFAULTS.seed;
  const projection = await projectAndSolve(hamiltonian, basis, sector, { eigs, tol, seed, threads, memoryBytes: opts.memoryBytes, matrixFree: opts.matrixFree });
  const { matrix, eigen } = projection;
  timings.build = projection.timings.build;
  timings.solve = projection.timings.solve;
  timings.total = (performance.now() - t0) / 1000;
  const none = { configs: 0, shots: 0 };
  const report: ExactReport = {
    command: 'exact',
    qubits,
    dimension: basis.dim,
    ...projectionReport(projection, tol, seed),
    hamiltonian: hamiltonianReport(opts.hamiltonian, hamiltonian),
    samples: {
      enumerated: true,
      shots: 0,
      distinct: basis.dim,
      kept: basis.dim,
      keptShots: 0,
      dropped: { weight: { ...none }, parity: { ...none }, minCount: { ...none }, maxDim: { ...none } },
      groups: [],
    },
    sector: sectorReport(sector, qubits),
    threads,
    timings,
    groundState: { top: topConfigurations(basis, eigen.vectors[0]!, projection.complex, opts.top ?? 10, opts.qubit0) },
  };
  return { report, basis, matrix, hamiltonian, eigen };
}
