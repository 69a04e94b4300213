import { MessageChannel, type MessagePort, type Worker } from 'node:worker_threads';
import type { Basis } from '../bits/basis.js';
import { applyUpperRows } from '../build/projectedHamiltonian.js';
import type { RowScanPlan } from '../build/rowScan.js';
import { applyStoredRows, type StoredHamiltonian } from '../build/storedHamiltonian.js';
import type { LinearOperator } from '../solvers/lanczos.js';
import { closeSolveWorkers, releaseSolveWorkers, startSolveWorkers, takeSolveWorkers, type SolveWorkerMessage } from './solveWorkers.js';

/**
 * What every team member needs, all on SharedArrayBuffers: the operator (a stored matrix, or the
 * basis and row-scan plan for matrix-free products), the team's vectors (two staging vectors for
 * callers' own arrays, then the ones handed out by `vector()`), one output vector per member for
 * matrix-free products (whose mirrored updates cross row ranges), and the row split.
 */
export interface TeamSpec {
  kind: 'stored' | 'free';
  complex: boolean;
  dim: number;
  matrix?: StoredHamiltonian;
  basis?: Basis;
  plan?: RowScanPlan;
  /** Matrix-free: the order rows are scanned in (see `filterOrder`); members split its positions. */
  rows?: Int32Array;
  /** Grows as vectors are made; members learn of new ones through their port before each product. */
  vectors: Float64Array[];
  ys: Float64Array[];
  bounds: Int32Array;
  /** Int32 slots: generation, members done, input vector index, output vector index. */
  control: SharedArrayBuffer;
}

/** Team vectors handed out by `vector()`: what the two-pass Lanczos holds at once. */
const HANDED_OUT = 4;

/** Apply member m's rows (the main thread is member 0) from team vector xi into team vector yi. */
export function applyTeamRows(spec: TeamSpec, m: number, xi: number, yi: number): void {
  const r0 = spec.bounds[m]!;
  const r1 = spec.bounds[m + 1]!;
  if (spec.kind === 'stored') {
    applyStoredRows(spec.matrix!, spec.vectors[xi]!, spec.vectors[yi]!, r0, r1);
  } else {
    const y = spec.ys[m]!;
    y.fill(0);
    applyUpperRows(spec.basis!, spec.plan!, r0, r1, spec.vectors[xi]!, y, spec.rows);
  }
}

const sharedVector = (len: number): Float64Array => new Float64Array(new SharedArrayBuffer(Math.max(8, len * 8)));

/** A spec posted to a member worker: the team's shared arrays, the member's index and the port new team vectors arrive on. */
export type MemberSpec = TeamSpec & { member: number; port: MessagePort };

/** How many threads (this one included) a team on `dim` rows uses: below ~2000 rows per thread a product is too short to share. */
export function teamMembers(dim: number, threads: number): number {
  return Math.max(1, Math.min(threads, Math.ceil(dim / 2000)));
}

/**
 * Start the member workers a team on `dim` rows will need, now: a worker's start-up (its V8
 * isolate and modules) then overlaps the build (which runs on the same workers) instead of
 * delaying it or the first product.
 */
export function startMatvecWorkers(dim: number, threads: number): void {
  startSolveWorkers(teamMembers(dim, threads) - 1);
}

/** Stop the idle workers (a command calls this once when it ends); their teardown is not waited for. */
export function closeMatvecWorkers(): void {
  closeSolveWorkers();
}

/**
 * A synchronous operator whose products run on `threads` threads (this one and threads−1 workers)
 * over shared memory, woken through Atomics, so Lanczos stays a plain loop. Vectors from
 * `vector()` are applied in place; other arrays are copied through staging vectors, made when
 * first needed. Close it when done.
 */
export class MatvecTeam implements LinearOperator {
  readonly dim: number;
  readonly complex: boolean;
  private readonly spec: TeamSpec;
  private readonly workers: Worker[];
  private readonly ctrl: Int32Array;
  private readonly ports: MessagePort[] = [];
  private handedOut = 0;
  /** Team indices of the staging vectors (input, output), −1 until made. */
  private staging = [-1, -1];

  constructor(spec: Omit<TeamSpec, 'vectors' | 'ys' | 'bounds' | 'control'>, threads: number) {
    const len = spec.complex ? 2 * spec.dim : spec.dim;
    const members = teamMembers(spec.dim, threads);
    const control = new SharedArrayBuffer(16);
    const ys = spec.kind === 'stored' ? [] : Array.from({ length: members }, () => sharedVector(len));
    // Members never need a renumbered matrix's order, and posting it would copy it to each of them.
    const matrix = spec.matrix?.order ? { ...spec.matrix, order: undefined } : spec.matrix;
    this.spec = { ...spec, matrix, vectors: [], ys, bounds: splitRows(spec, members), control };
    this.ctrl = new Int32Array(control);
    this.dim = spec.dim;
    this.complex = spec.complex;
    this.workers = takeSolveWorkers(members - 1);
    this.workers.forEach((w, i) => {
      const { port1, port2 } = new MessageChannel();
      this.ports.push(port1);
      w.postMessage({ team: { ...this.spec, member: i + 1, port: port2 } } satisfies SolveWorkerMessage, [port2]);
    });
  }

  /** A new shared vector, announced to every member; returns its team index. */
  private addVector(): number {
    const v = sharedVector(this.complex ? 2 * this.dim : this.dim);
    this.spec.vectors.push(v);
    for (const p of this.ports) p.postMessage(v);
    return this.spec.vectors.length - 1;
  }

  vector(): Float64Array {
    if (this.handedOut === HANDED_OUT) return new Float64Array(this.complex ? 2 * this.dim : this.dim);
    this.handedOut++;
    return this.spec.vectors[this.addVector()]!;
  }

  /** Team index of staging vector k (0 input, 1 output), made on first use. */
  private stagingIndex(k: 0 | 1): number {
    if (this.staging[k]! < 0) this.staging[k] = this.addVector();
    return this.staging[k]!;
  }

  apply(x: Float64Array, y: Float64Array): void {
    const members = this.workers.length + 1;
    const { vectors, ys } = this.spec;
    let xi = vectors.indexOf(x);
    if (xi < 0) {
      xi = this.stagingIndex(0);
      vectors[xi]!.set(x);
    }
    const stored = this.spec.kind === 'stored';
    // Matrix-free members write their own outputs (ys); the index is then unused.
    let yi = stored ? vectors.indexOf(y) : xi;
    if (stored && (yi < 0 || yi === xi)) yi = this.stagingIndex(1);
    Atomics.store(this.ctrl, 2, xi);
    Atomics.store(this.ctrl, 3, yi);
    Atomics.store(this.ctrl, 1, 0);
    Atomics.add(this.ctrl, 0, 1);
    Atomics.notify(this.ctrl, 0);
    applyTeamRows(this.spec, 0, xi, yi);
    for (;;) {
      const done = Atomics.load(this.ctrl, 1);
      if (done >= members - 1) break;
      Atomics.wait(this.ctrl, 1, done);
    }
    if (stored) {
      if (vectors[yi] !== y) y.set(vectors[yi]!);
      return;
    }
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
    for (const p of this.ports.splice(0)) p.close();
    releaseSolveWorkers(this.workers.splice(0));
  }
}

/** Row bounds per member: equal nonzeros for a stored matrix, equal rows otherwise. */
function splitRows(spec: Omit<TeamSpec, 'vectors' | 'ys' | 'bounds' | 'control'>, members: number): Int32Array {
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
