import type { Basis } from '../bits/basis.js';
import type { FlipGroups } from '../operators/pauliSum.js';
import type { CompiledSector } from '../sectors/sector.js';
import { runInPool, threadPool } from '../parallel/threadPool.js';
import { buildUpperRows, sectorFlipTest, type UpperPiece } from './projectedHamiltonian.js';
import { rowScanPlan, upperPerRowEstimate } from './rowScan.js';
import { storedFromPieces, type StoredHamiltonian } from './storedHamiltonian.js';

/** Rows per task below which one thread is faster than shipping work to the pool. */
const MIN_ROWS_PARALLEL = 20000;

/**
 * Build H_S over `threads` worker threads: the basis must sit on SharedArrayBuffers (makeBasis with
 * `shared`), rows are split into chunks (several per thread for balance), and the upper-triangle
 * pieces are mirrored into one stored Hamiltonian. Identical output for any thread count.
 */
export async function buildProjectedHamiltonianParallel(
  basis: Basis,
  groups: FlipGroups,
  sector: CompiledSector | undefined,
  threads: number,
  onProgress?: (rowsDone: number, rows: number) => void,
): Promise<StoredHamiltonian> {
  const plan = rowScanPlan(groups, sectorFlipTest(groups, sector));
  const shared = basis.states.buffer instanceof SharedArrayBuffer && basis.slots.buffer instanceof SharedArrayBuffer;
  if (threads <= 1 || basis.dim < MIN_ROWS_PARALLEL || !shared) {
    const piece = buildUpperRows(basis, plan, 0, basis.dim);
    onProgress?.(basis.dim, basis.dim);
    return storedFromPieces(basis.dim, groups.complex, [piece]);
  }
  const pool = threadPool('buildRows', threads);
  const upperPerRow = upperPerRowEstimate(basis, plan);
  const chunks = Math.min(64, threads * 8);
  const step = Math.ceil(basis.dim / chunks);
  // Only the shared arrays travel; `counts` stays on this thread.
  const view: Basis = { qubits: basis.qubits, nWords: basis.nWords, dim: basis.dim, states: basis.states, slots: basis.slots, filter: basis.filter, counts: new Float64Array(0) };
  let done = 0;
  const tasks: Array<Promise<UpperPiece>> = [];
  for (let r0 = 0; r0 < basis.dim; r0 += step) {
    const r1 = Math.min(basis.dim, r0 + step);
    tasks.push(
      runInPool<unknown, UpperPiece>(pool, { basis: view, plan, r0, r1, upperPerRow, shared: true }).then((p) => {
        done += p.r1 - p.r0;
        onProgress?.(done, basis.dim);
        return p;
      }),
    );
  }
  const pieces = await Promise.all(tasks);
  return storedFromPieces(basis.dim, groups.complex, pieces, true);
}
