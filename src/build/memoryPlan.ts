import { totalmem } from 'node:os';
import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { FILTER_ORDER_MIN_BYTES, upperPerRowEstimate, type RowScanPlan } from './rowScan.js';
import { rowStartBytes } from './storedHamiltonian.js';

/** How H_S will be applied and what that costs, decided before anything large is allocated. */
export interface MemoryPlan {
  storage: 'stored' | 'matrix-free';
  budgetBytes: number;
  /** Estimated nonzeros of the full stored matrix (from a sample of rows). */
  nonzerosEstimate: number;
  bytes: { basis: number; matrix: number; solver: number; total: number };
  reason: string;
  /**
   * Matrix-free: Lanczos vectors the budget leaves room to keep, so a run that converges within
   * them skips the two-pass replay (each product is a full row scan there). Counted in `bytes`.
   */
  keepVectors?: number;
}

/** Most Lanczos vectors a matrix-free run keeps (a run rarely needs more steps). */
const MAX_KEEP_VECTORS = 300;

/** Default memory budget: half of the machine's RAM. */
export function defaultMemoryBudget(): number {
  return Math.floor(totalmem() * 0.5);
}

/** Parse a size like `4G`, `512M`, `2GiB` or a byte count. */
export function parseMemorySize(text: string): number {
  const m = /^\s*(\d+(?:\.\d+)?)\s*([kmgt]?)(i?b)?\s*$/i.exec(text);
  if (!m) throw new BitspanError('bad-argument', `--memory '${text}' is not a size`, 'e.g. --memory 4G or --memory 512M');
  const unit = { '': 1, k: 2 ** 10, m: 2 ** 20, g: 2 ** 30, t: 2 ** 40 }[m[2]!.toLowerCase() as '' | 'k' | 'm' | 'g' | 't'];
  const bytes = Math.floor(Number(m[1]) * unit);
  if (bytes < 1) throw new BitspanError('bad-argument', `--memory '${text}' is no memory at all`, 'e.g. --memory 4G or --memory 512M');
  return bytes;
}

/** A byte count in the largest binary unit that keeps it at least 1, e.g. `3.50 MiB`. */
function formatBytes(x: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
  let u = 0;
  while (u < units.length - 1 && x >= 1024) {
    x /= 1024;
    u++;
  }
  return u === 0 ? `${x} bytes` : `${x.toFixed(2)} ${units[u]}`;
}

/** Lanczos vectors held at once for `eigs` pairs (see solvers/lanczos.ts). */
function solverVectors(dim: number, eigs: number): number {
  return eigs === 1 && dim >= 50000 ? 6 : 2 * eigs + 22;
}

/**
 * Estimate the memory of a stored build from ~2000 sampled rows and choose stored or matrix-free
 * storage; refuse with a hint when even matrix-free products will not fit.
 */
export function planMemory(basis: Basis, scan: RowScanPlan, opts: { budgetBytes?: number; eigs?: number; matrixFree?: boolean; threads?: number }): MemoryPlan {
  const dim = basis.dim;
  const budget = opts.budgetBytes ?? defaultMemoryBudget();
  const c = scan.complex ? 2 : 1;
  const upperEstimate = Math.ceil(upperPerRowEstimate(basis, scan) * dim);
  const nnz = 2 * upperEstimate + dim;
  const basisBytes = basis.states.byteLength + basis.slots.byteLength + basis.filter.byteLength + basis.counts.byteLength;
  // Stored (see storedHamiltonian.ts): both off-diagonal triangles with 32-bit columns, valued as
  // doubles in case the values are too varied for codes, the diagonal and the row starts; plus, at
  // the assembly, the larger of the upper-triangle pieces and a second copy (what a library caller's
  // `reorderForLocality` makes; the solver's own renumbering assembles straight from the pieces).
  const storedBytes = 2 * upperEstimate * (4 + 8 * c) + dim * 8 * c + (dim + 1) * rowStartBytes(2 * upperEstimate);
  const matrixBytes = storedBytes + Math.max(storedBytes, upperEstimate * (4 + 8 * c) + dim * 8 * c);
  const vectorBytes = dim * 8 * c;
  const threads = Math.max(1, opts.threads ?? 1);
  const solverBytes = solverVectors(dim, opts.eigs ?? 1) * vectorBytes;
  // Matrix-free: the Lanczos vectors, one output per thread, and the scan order of a large filter (4 bytes a row).
  const freeBytes = solverBytes + (threads + 1) * vectorBytes + (basis.filter.byteLength >= FILTER_ORDER_MIN_BYTES ? 4 * dim : 0);
  const storedTotal = basisBytes + matrixBytes + solverBytes + 2 * vectorBytes;
  if (!opts.matrixFree && storedTotal <= budget) {
    return { storage: 'stored', budgetBytes: budget, nonzerosEstimate: nnz, bytes: { basis: basisBytes, matrix: matrixBytes, solver: solverBytes, total: storedTotal }, reason: 'fits the memory budget' };
  }
  const freeTotal = basisBytes + freeBytes;
  if (freeTotal > budget) {
    throw new BitspanError(
      'too-large',
      `dimension ${dim} needs about ${formatBytes(freeTotal)} even without storing the matrix (basis ${formatBytes(basisBytes)}, Lanczos vectors ${formatBytes(freeBytes)}), over the ${formatBytes(budget)} budget`,
      'lower --max-dim, ask for fewer --eigs, or raise --memory if the machine has the RAM',
    );
  }
  const keepVectors = Math.min(MAX_KEEP_VECTORS, Math.floor((budget - freeTotal) / vectorBytes));
  const keptBytes = keepVectors * vectorBytes;
  return {
    storage: 'matrix-free',
    budgetBytes: budget,
    nonzerosEstimate: nnz,
    keepVectors,
    bytes: { basis: basisBytes, matrix: 0, solver: freeBytes + keptBytes, total: freeTotal + keptBytes },
    reason: opts.matrixFree ? 'requested with --matrix-free' : `a stored matrix (~${formatBytes(matrixBytes)}) would exceed the memory budget`,
  };
}
