import { Worker } from 'node:worker_threads';
import type { Basis } from '../bits/basis.js';
import { applyUpperRows, type SectorFlipTest } from '../build/projectedHamiltonian.js';
import { csrApplyRows, type SparseMatrix } from '../build/sparseMatrix.js';
import type { FlipGroups } from '../operators/pauliSum.js';
import type { LinearOperator } from '../solvers/lanczos.js';
import { workerScript } from '../util/packageRoot.js';

/**
 * What every team member needs, all on SharedArrayBuffers: the operator (a stored CSR matrix, or
 * the basis and Pauli groups for matrix-free products), the input vector, one output vector per
 * member for matrix-free products (whose mirrored updates cross row ranges), and the row split.
 */
export interface TeamSpec {
  kind: 'stored' | 'free';
  complex: boolean;
  dim: number;
  matrix?: SparseMatrix;
  basis?: Basis;
  groups?: FlipGroups;
  test?: SectorFlipTest;
  x: Float64Array;
  ys: Float64Array[];
  bounds: Int32Array;
  control: SharedArrayBuffer;
}

/** Apply member m's rows (the main thread is member 0). */
export function applyTeamRows(spec: TeamSpec, m: number): void {
  const r0 = spec.bounds[m]!;
  const r1 = spec.bounds[m + 1]!;
  if (spec.kind === 'stored') {
    csrApplyRows(spec.matrix!, spec.x, spec.ys[0]!, r0, r1);
  } else {
    const y = spec.ys[m]!;
    y.fill(0);
    applyUpperRows(spec.basis!, spec.groups!, spec.test!, r0, r1, spec.x, y);
  }
}

const sharedVector = (len: number): Float64Array => new Float64Array(new SharedArrayBuffer(Math.max(8, len * 8)));

/** A spec posted to a member worker: the team's shared arrays and the member's index. */
export type MemberSpec = TeamSpec & { member: number };

/**
 * Member workers not in a team: started ahead by `startMatvecWorkers`, or handed back by a closed
 * team. Each waits for a `MemberSpec` message; unref'd so an idle one never keeps a process alive.
 */
const idle: Worker[] = [];

/** How many threads (this one included) a team on `dim` rows uses: below ~2000 rows per thread a product is too short to share. */
export function teamMembers(dim: number, threads: number): number {
  return Math.max(1, Math.min(threads, Math.ceil(dim / 2000)));
}

/**
 * Start the member workers a team on `dim` rows will need, now: a worker's start-up (its V8
 * isolate and modules) then overlaps the build instead of delaying the first product.
 */
export function startMatvecWorkers(dim: number, threads: number): void {
  for (let n = teamMembers(dim, threads) - 1 - idle.length; n > 0; n--) {
    const w = new Worker(workerScript('matvecTeam'));
    w.unref();
    idle.push(w);
  }
}

/** Stop the idle member workers (a command calls this once when it ends); their teardown is not waited for. */
export function closeMatvecWorkers(): void {
  for (const w of idle.splice(0)) void w.terminate();
}

/**
 * A synchronous operator whose products run on `threads` threads (this one and threads−1 workers)
 * over shared memory, woken through Atomics, so Lanczos stays a plain loop. Close it when done.
 */
export class MatvecTeam implements LinearOperator {
  readonly dim: number;
  readonly complex: boolean;
  private readonly spec: TeamSpec;
  private readonly workers: Worker[] = [];
  private readonly ctrl: Int32Array;

  constructor(spec: Omit<TeamSpec, 'x' | 'ys' | 'bounds' | 'control'>, threads: number) {
    const len = spec.complex ? 2 * spec.dim : spec.dim;
    const members = teamMembers(spec.dim, threads);
    const control = new SharedArrayBuffer(8);
    const ys = spec.kind === 'stored' ? [sharedVector(len)] : Array.from({ length: members }, () => sharedVector(len));
    this.spec = { ...spec, x: sharedVector(len), ys, bounds: splitRows(spec, members), control };
    this.ctrl = new Int32Array(control);
    this.dim = spec.dim;
    this.complex = spec.complex;
    startMatvecWorkers(spec.dim, threads);
    for (let m = 1; m < members; m++) {
      const w = idle.pop()!;
      w.postMessage({ ...this.spec, member: m } satisfies MemberSpec);
      this.workers.push(w);
    }
  }

  apply(x: Float64Array, y: Float64Array): void {
    const members = this.workers.length + 1;
    this.spec.x.set(x);
    Atomics.store(this.ctrl, 1, 0);
    Atomics.add(this.ctrl, 0, 1);
    Atomics.notify(this.ctrl, 0);
    applyTeamRows(this.spec, 0);
    for (;;) {
      const done = Atomics.load(this.ctrl, 1);
      if (done >= members - 1) break;
      Atomics.wait(this.ctrl, 1, done);
    }
    const ys = this.spec.ys;
    y.set(ys[0]!);
    for (let m = 1; m < ys.length; m++) {
      const part = ys[m]!;
      for (let i = 0; i < y.length; i++) y[i]! += part[i]!;
    }
  }

  /** Release the workers: they leave this team's loop and wait, idle, for the next team. */
  close(): void {
    Atomics.store(this.ctrl, 0, -1);
    Atomics.notify(this.ctrl, 0);
    idle.push(...this.workers.splice(0));
  }
}

/** Row bounds per member: equal nonzeros for a stored matrix, equal rows otherwise. */
function splitRows(spec: Omit<TeamSpec, 'x' | 'ys' | 'bounds' | 'control'>, members: number): Int32Array {
  const b = new Int32Array(members + 1);
  b[members] = spec.dim;
  if (spec.kind === 'stored' && spec.matrix) {
    const total = spec.matrix.rowPtr[spec.dim]!;
    let r = 0;
    for (let m = 1; m < members; m++) {
      const target = (total * m) / members;
      while (r < spec.dim && spec.matrix.rowPtr[r]! < target) r++;
      b[m] = r;
    }
  } else for (let m = 1; m < members; m++) b[m] = Math.floor((spec.dim * m) / members);
  return b;
}
