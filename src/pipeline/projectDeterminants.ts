import { totalmem } from 'node:os';
import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { buildDeterminantRows, countDeterminantRows, determinantNonzeroBound, pieceMatrix, prepareDeterminants } from '../build/determinantHamiltonian.js';
import { determinantOperator } from '../build/determinantOperator.js';
import type { SparseMatrix } from '../build/sparseMatrix.js';
import type { Integrals } from '../operators/integrals.js';
import { lanczos, LANCZOS_DEFAULTS, type LanczosResult, type LinearOperator } from '../solvers/lanczos.js';
import { matrixOperator, type SolverSettings } from './solve.js';

/** Memory the determinant path may use unless told otherwise: 60% of the machine, at most 16 GiB. */
export const DEFAULT_MEMORY_BUDGET = Math.min(16 * 2 ** 30, Math.floor(0.6 * totalmem()));

/** How the determinant Hamiltonian is held while Lanczos runs. */
export type DeterminantStorage = 'csr' | 'matrix-free';

/** The determinant-basis Hamiltonian, its lowest eigenpairs, and how it was held. */
export interface DeterminantProjection {
  /** The stored matrix; absent when it was applied matrix-free. */
  matrix: SparseMatrix | undefined;
  operator: LinearOperator;
  eigen: LanczosResult;
  nonzeros: number;
  storage: DeterminantStorage;
  /** Estimated bytes of the stored matrix and of the Lanczos vectors. */
  memory: { matrixBytes: number; vectorBytes: number; budget: number };
  timings: { build: number; solve: number };
}

/** Settings of `projectDeterminants` beyond the solver's. */
export interface DeterminantSettings extends SolverSettings {
  /** Bytes the matrix and Lanczos vectors may take (default `DEFAULT_MEMORY_BUDGET`). */
  memoryBudget?: number;
  /** Force a storage form instead of choosing by the budget. */
  storage?: DeterminantStorage;
}

/** Bytes of the Lanczos vectors for `dim` unknowns and `eigs` pairs (basis plus restart copies). */
export function lanczosVectorBytes(dim: number, eigs: number): number {
  const m = Math.max(2 * eigs + 18, eigs + 2);
  return (2 * m + 4) * dim * 8;
}

/**
 * Build H on a determinant basis from molecular integrals (Slater–Condon rules, no Pauli
 * expansion) and find its lowest eigenpairs. The matrix is stored (CSR) when it fits in the memory
 * budget, otherwise applied matrix-free; throws `too-large` when even the Lanczos vectors do not fit.
 */
export function projectDeterminants(ints: Integrals, basis: Basis, settings: DeterminantSettings = {}): DeterminantProjection {
  const t0 = performance.now();
  const eigs = settings.eigs ?? 1;
  const budget = settings.memoryBudget ?? DEFAULT_MEMORY_BUDGET;
  const vectorBytes = lanczosVectorBytes(basis.dim, eigs);
  if (vectorBytes > budget) {
    throw new BitspanError(
      'too-large',
      `${basis.dim} determinants need about ${gib(vectorBytes)} GiB of Lanczos vectors, over the ${gib(budget)} GiB budget`,
      'reduce the subspace (--min-count, --max-dim, no --product-space) or raise --memory',
    );
  }
  const ctx = prepareDeterminants(basis, ints);
  // The bound is exact on product spaces but can be far above the truth on sampled ones, where
  // most connected determinants are absent: count exactly before giving up on storing.
  const bytesFor = (entries: number): number => entries * 12 + (basis.dim + 1) * 8;
  let matrixBytes = bytesFor(determinantNonzeroBound(ctx));
  let rowEnd: Float64Array | undefined;
  if (settings.storage !== 'csr' && matrixBytes + vectorBytes > budget) {
    rowEnd = countDeterminantRows(ctx, 0, basis.dim);
    matrixBytes = bytesFor(basis.dim > 0 ? rowEnd[basis.dim - 1]! : 0);
  }
  const storage: DeterminantStorage = settings.storage ?? (matrixBytes + vectorBytes <= budget ? 'csr' : 'matrix-free');
  let matrix: SparseMatrix | undefined;
  let operator: LinearOperator;
  let nonzeros: number;
  if (storage === 'csr') {
    matrix = pieceMatrix(basis.dim, buildDeterminantRows(ctx, 0, basis.dim, rowEnd));
    operator = matrixOperator(matrix);
    nonzeros = matrix.cols.length;
  } else {
    operator = determinantOperator(ctx);
    rowEnd ??= countDeterminantRows(ctx, 0, basis.dim);
    nonzeros = basis.dim > 0 ? rowEnd[basis.dim - 1]! : 0;
  }
  const t1 = performance.now();
  const eigen = lanczos(operator, {
    eigs,
    tol: settings.tol ?? LANCZOS_DEFAULTS.tol,
    seed: settings.seed ?? LANCZOS_DEFAULTS.seed,
    start: settings.start,
  });
  const t2 = performance.now();
  return { matrix, operator, eigen, nonzeros, storage, memory: { matrixBytes, vectorBytes, budget }, timings: { build: (t1 - t0) / 1000, solve: (t2 - t1) / 1000 } };
}

function gib(bytes: number): string {
  return (bytes / 2 ** 30).toFixed(2);
}
