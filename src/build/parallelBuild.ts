import type { Basis } from '../bits/basis.js';
import { MessageChannel } from 'node:worker_threads';
import { errorFromWorker, releaseSolveWorkers, takeSolveWorkers, type BuildReply, type SolveWorkerMessage } from '../parallel/solveWorkers.js';
import { PieceSlab, SLAB_MIN_DIM } from './pieceSlab.js';
import { buildUpperRows, type UpperPiece } from './projectedHamiltonian.js';
import { upperPerRowEstimate, type RowScanPlan } from './rowScan.js';
import { storedFromPieces, type StoredHamiltonian } from './storedHamiltonian.js';

/** Rows below which one thread is faster than shipping work to the solve workers. */
export const MIN_ROWS_PARALLEL = 20000;

/**
 * Work shared by the threads of one build: chunk k covers rows [k·step, (k+1)·step); `progress`
 * holds the next chunk to take (slot 0) and the rows finished (slot 1).
 */
export interface SharedChunks {
  basis: Basis;
  plan: RowScanPlan;
  upperPerRow: number;
  step: number;
  progress: Int32Array;
  /** The whole diagonal (shared): pieces write theirs into it, so assembly reuses it without a copy. */
  diag?: Float64Array;
}

/** Take chunks until none are left; each piece on SharedArrayBuffers, so it returns without a copy (a one-value piece keeps one value). */
export function buildTakenChunks(work: SharedChunks, maxChunks = Infinity, slab = work.basis.dim >= SLAB_MIN_DIM ? new PieceSlab() : undefined): UpperPiece[] {
  const pieces: UpperPiece[] = [];
  const dim = work.basis.dim;
  while (pieces.length < maxChunks) {
    const r0 = Atomics.add(work.progress, 0, 1) * work.step;
    if (r0 >= dim) break;
    const r1 = Math.min(dim, r0 + work.step);
    pieces.push(buildUpperRows(work.basis, work.plan, r0, r1, { upperPerRow: work.upperPerRow, shared: true, diag: work.diag, compactValues: true, slab }));
    Atomics.add(work.progress, 1, r1 - r0);
  }
  return pieces;
}

/**
 * Build H_S on this thread and threads−1 solve workers: the basis must sit on SharedArrayBuffers
 * (makeBasis with `shared`); every thread takes row chunks from a shared counter (several per
 * thread for balance), and the upper-triangle pieces are mirrored, in row order, into one stored
 * Hamiltonian. Identical output for any thread count. With `locality` or `lengths` the rows are
 * stored renumbered (see the options), assembled so from the pieces: no basis-order copy is made.
 */
export async function buildProjectedHamiltonianParallel(
  basis: Basis,
  plan: RowScanPlan,
  threads: number,
  opts: {
    /** Upper entries per row, when the caller has estimated them already (see `upperPerRowEstimate`). */
    upperPerRow?: number;
    /** Store the rows renumbered for locality, then sorted by length in windows (as `sortRowsByLength(reorderForLocality(m))` would). */
    locality?: boolean;
    /** Store the rows in basis order sorted by length in windows (as `sortRowsByLength(m)` would); ignored with `locality`. */
    lengths?: boolean;
    onProgress?: (rowsDone: number, rows: number) => void;
  } = {},
): Promise<StoredHamiltonian> {
  const { onProgress } = opts;
  const shared = basis.states.buffer instanceof SharedArrayBuffer && basis.slots.buffer instanceof SharedArrayBuffer;
  // The pieces are dropped when this returns, before the caller allocates its solver vectors.
  const assemble = (pieces: UpperPiece[], sharedArrays: boolean): StoredHamiltonian =>
    storedFromPieces(basis.dim, plan.complex, pieces, sharedArrays, opts.locality ? 'locality' : opts.lengths ? 'lengths' : undefined);
  const single = threads <= 1 || basis.dim < MIN_ROWS_PARALLEL || !shared;
  const renumbered = opts.locality === true || opts.lengths === true;
  const w = plan.complex ? 2 : 1;
  const work: SharedChunks = {
    // Only the shared arrays travel; `counts` stays on this thread.
    basis: single ? basis : { qubits: basis.qubits, nWords: basis.nWords, dim: basis.dim, states: basis.states, slots: basis.slots, filter: basis.filter, counts: new Float64Array(0) },
    plan,
    upperPerRow: opts.upperPerRow ?? upperPerRowEstimate(basis, plan),
    // Many chunks per thread, so the last ones even out a late-starting worker (and on one thread,
    // pieces of bounded size).
    step: Math.ceil(basis.dim / Math.min(256, threads * 32)),
    progress: new Int32Array(new SharedArrayBuffer(8)),
    // Basis order: the stored matrix keeps this diagonal as it is (see storedFromPieces).
    diag: renumbered ? undefined : single ? new Float64Array(w * basis.dim) : new Float64Array(new SharedArrayBuffer(8 * Math.max(1, w * basis.dim))),
  };
  // This thread's slabs for its pieces (a worker makes its own in buildTakenChunks).
  const slab = basis.dim >= SLAB_MIN_DIM ? new PieceSlab() : undefined;
  if (single) {
    const pieces: UpperPiece[] = [];
    for (let got = buildTakenChunks(work, 1, slab); got.length > 0; got = buildTakenChunks(work, 1, slab)) {
      pieces.push(...got);
      onProgress?.(Atomics.load(work.progress, 1), basis.dim);
    }
    onProgress?.(basis.dim, basis.dim);
    // A renumbered matrix goes on shared memory when the basis does, as reorderForLocality put it.
    return assemble(pieces, renumbered && shared);
  }
  const workers = takeSolveWorkers(threads - 1);
  const helpers = workers.map(
    (w) =>
      new Promise<UpperPiece[]>((resolve, reject) => {
        const { port1, port2 } = new MessageChannel();
        const died = (): void => reject(new Error('a build worker stopped before it finished'));
        w.once('exit', died);
        port1.once('message', (m: BuildReply) => {
          w.off('exit', died);
          port1.close();
          if ('error' in m) reject(errorFromWorker(m.error));
          else resolve(m.pieces);
        });
        w.postMessage({ build: work, reply: port2 } satisfies SolveWorkerMessage, [port2]);
      }),
  );
  // This thread takes chunks too, one at a time, yielding between them so replies can arrive.
  const own: UpperPiece[] = [];
  let helped: UpperPiece[][];
  try {
    for (;;) {
      await new Promise<void>((resolve) => setImmediate(resolve));
      const got = buildTakenChunks(work, 1, slab);
      if (got.length === 0) break;
      own.push(...got);
      onProgress?.(Atomics.load(work.progress, 1), basis.dim);
    }
    helped = await Promise.all(helpers);
  } finally {
    releaseSolveWorkers(workers);
  }
  const pieces = [...own, ...helped.flat()].sort((a, b) => a.r0 - b.r0);
  onProgress?.(basis.dim, basis.dim);
  return assemble(pieces, true);
}
