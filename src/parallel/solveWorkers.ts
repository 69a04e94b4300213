import { Worker, type MessagePort } from 'node:worker_threads';
import type { SharedChunks } from '../build/parallelBuild.js';
import type { UpperPiece } from '../build/projectedHamiltonian.js';
import { BitspanError, type BitspanErrorCode } from '../errors.js';
import { workerScript } from '../util/packageRoot.js';
import type { MemberSpec } from './matvecTeam.js';

/**
 * The worker threads of a solve: each builds row chunks of H_S, then serves as a member of the
 * product team, so a solve on t threads holds t − 1 worker isolates (about 10 MB each), not two
 * sets. Plain worker_threads rather than a pool library: a team member is handed its spec while the
 * calling thread is about to block in Atomics.wait, and a message to a worker is delivered without
 * that thread's event loop, where a pool's dispatch would wait for it.
 */
export type SolveWorkerMessage = { team: MemberSpec } | { build: SharedChunks; reply: MessagePort };

/** What a build job posts back on its reply port. */
export type BuildReply = { pieces: UpperPiece[] } | { error: { code?: string; message: string; hint?: string; file?: string; line?: number } };

/** Workers not in use; unref'd, so an idle one never keeps a process alive. */
const idle: Worker[] = [];

/** Start workers until `n` are idle: their start-up (isolate and modules) then overlaps other work. */
export function startSolveWorkers(n: number): void {
  for (let k = n - idle.length; k > 0; k--) {
    const w = new Worker(workerScript('solveWorker'));
    w.unref();
    idle.push(w);
  }
}

/** Take `n` idle workers (starting any that are missing); give them back with `releaseSolveWorkers`. */
export function takeSolveWorkers(n: number): Worker[] {
  startSolveWorkers(n);
  return idle.splice(idle.length - n, n);
}

/** Return workers to the idle set. */
export function releaseSolveWorkers(workers: Worker[]): void {
  idle.push(...workers);
}

/** Stop the idle workers (a command calls this once when it ends); their teardown is not waited for. */
export function closeSolveWorkers(): void {
  for (const w of idle.splice(0)) void w.terminate();
}

/** An error that crossed from a worker, as a BitspanError when it was one. */
export function errorFromWorker(o: { code?: string; message: string; hint?: string; file?: string; line?: number }): Error {
  if (typeof o.code === 'string' && o.hint !== undefined) return BitspanError.fromJSON({ code: o.code as BitspanErrorCode, message: o.message, hint: o.hint, file: o.file, line: o.line });
  return new Error(o.message);
}
