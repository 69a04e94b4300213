import { MessageChannel, type MessagePort, type Worker } from 'node:worker_threads';
import type { Basis } from '../bits/basis.js';
import { applyUpperRows } from '../build/projectedHamiltonian.js';
import type { RowScanPlan } from '../build/rowScan.js';
import { applyStoredRows, replayStoredRows, type StoredHamiltonian } from '../build/storedHamiltonian.js';
import type { LinearOperator } from '../solvers/lanczos.js';
import { localSweeps, replayRange, scaleRange, stepDotsRange, stepUpdateRange, type LanczosSweeps } from '../solvers/lanczosSweeps.js';
import { closeSolveWorkers, releaseSolveWorkers, startSolveWorkers, takeSolveWorkers, type SolveWorkerMessage } from './solveWorkers.js';

/**
 * What every team member needs, all on SharedArrayBuffers: the operator (a stored matrix, or the
 * basis and row-scan plan for matrix-free products), the team's vectors (two staging vectors for
 * callers' own arrays, then the ones handed out by `vector()`), one output vector per member for
 * matrix-free products (whose mirrored updates cross row ranges), the row split of products and the
 * element split of vector sweeps, and the control, scalar and partial-sum slots of a task.
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
  /** Element ranges per member for the Lanczos vector sweeps (equal lengths). */
  sweepBounds: Int32Array;
  /** Int32 slots: generation, members done, task (TASK_*), then four team vector indices. */
  control: SharedArrayBuffer;
  /** Scalars of a sweep (a, b, inv, yj). */
  params: Float64Array;
  /** Two partial sums per member. */
  partials: Float64Array;
}

/** Team tasks: the product (vector 0 in, vector 1 out) and the Lanczos sweeps of lanczosSweeps.ts. */
const TASK_PRODUCT = 0;
const TASK_DOTS = 1;
const TASK_UPDATE = 2;
const TASK_SCALE = 3;
const TASK_REPLAY = 4;
/** The replay fused with a stored product (replayFusedRange): vectors v, vPrev, x; scalars a, b, inv, yj. */
const TASK_REPLAY_PRODUCT = 5;
/** Control slots: generation, done, task, then the task's vector indices from slot 3. */
const SLOT_TASK = 2;
const SLOT_VECTORS = 3;

/** Team vectors handed out by `vector()`: what the two-pass Lanczos holds at once. */
const HANDED_OUT = 4;

/** Run member m's part (the main thread is member 0) of the task posted in the control slots. */
export function runTeamTask(spec: TeamSpec, m: number, ctrl: Int32Array): void {
  const task = Atomics.load(ctrl, SLOT_TASK);
  const vec = (k: number): Float64Array => spec.vectors[Atomics.load(ctrl, SLOT_VECTORS + k)]!;
  if (task === TASK_REPLAY_PRODUCT) {
    const p = spec.params;
    replayStoredRows(spec.matrix!, vec(0), vec(1), vec(2), p[0]!, p[1]!, p[2]!, p[3]!, spec.bounds[m]!, spec.bounds[m + 1]!);
    return;
  }
  if (task === TASK_PRODUCT) {
    const r0 = spec.bounds[m]!;
    const r1 = spec.bounds[m + 1]!;
    if (spec.kind === 'stored') {
      applyStoredRows(spec.matrix!, vec(0), vec(1), r0, r1);
    } else {
      const y = spec.ys[m]!;
      y.fill(0);
      applyUpperRows(spec.basis!, spec.plan!, r0, r1, vec(0), y, spec.rows);
    }
    return;
  }
  const i0 = spec.sweepBounds[m]!;
  const i1 = spec.sweepBounds[m + 1]!;
  const p = spec.params;
  if (task === TASK_DOTS) stepDotsRange(vec(0), vec(1), vec(2), i0, i1, spec.partials, 2 * m);
  else if (task === TASK_UPDATE) spec.partials[2 * m] = stepUpdateRange(vec(0), vec(1), vec(2), p[0]!, p[1]!, i0, i1);
  else if (task === TASK_SCALE) scaleRange(vec(0), p[0]!, i0, i1);
  else if (task === TASK_REPLAY) replayRange(vec(0), vec(1), vec(2), vec(3), p[0]!, p[1]!, p[2]!, p[3]!, i0, i1);
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
 * over shared memory, woken through Atomics, so Lanczos stays a plain loop; its `sweeps` split
 * the Lanczos vector updates over the same threads. Vectors from `vector()` are applied in place;
 * other arrays are copied through staging vectors, made when first needed. Close it when done.
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

  constructor(spec: Omit<TeamSpec, 'vectors' | 'ys' | 'bounds' | 'sweepBounds' | 'control' | 'params' | 'partials'>, threads: number) {
    const len = spec.complex ? 2 * spec.dim : spec.dim;
    const members = teamMembers(spec.dim, threads);
    const control = new SharedArrayBuffer(4 * (SLOT_VECTORS + 4));
    const ys = spec.kind === 'stored' ? [] : Array.from({ length: members }, () => sharedVector(len));
    // Members never need a renumbered matrix's order, and posting it would copy it to each of them.
    const matrix = spec.matrix?.order ? { ...spec.matrix, order: undefined } : spec.matrix;
    const sweepBounds = Int32Array.from({ length: members + 1 }, (_, m) => Math.floor((len * m) / members));
    const params = sharedVector(4);
    const partials = sharedVector(2 * members);
    this.spec = { ...spec, matrix, vectors: [], ys, bounds: splitRows(spec, members), sweepBounds, control, params, partials };
    this.ctrl = new Int32Array(control);
    if (spec.kind === 'stored') this.replayStep = this.storedReplayStep.bind(this);
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
    this.run(TASK_PRODUCT, [xi, yi]);
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

  /** Post a task, do this thread's part, and wait for the members. */
  private run(task: number, vectorIndices: number[], params: number[] = []): void {
    const members = this.workers.length + 1;
    Atomics.store(this.ctrl, SLOT_TASK, task);
    vectorIndices.forEach((v, k) => Atomics.store(this.ctrl, SLOT_VECTORS + k, v));
    params.forEach((v, k) => (this.spec.params[k] = v));
    Atomics.store(this.ctrl, 1, 0);
    Atomics.add(this.ctrl, 0, 1);
    Atomics.notify(this.ctrl, 0);
    runTeamTask(this.spec, 0, this.ctrl);
    for (;;) {
      const done = Atomics.load(this.ctrl, 1);
      if (done >= members - 1) break;
      Atomics.wait(this.ctrl, 1, done);
    }
  }

  /** Sum of partial k over the members. */
  private partial(k: number): number {
    let s = 0;
    for (let m = 0; m <= this.workers.length; m++) s += this.spec.partials[2 * m + k]!;
    return s;
  }

  /** Team indices of the given vectors, or undefined when one is not a team vector. */
  private indices(...vs: Float64Array[]): number[] | undefined {
    const out = vs.map((v) => this.spec.vectors.indexOf(v));
    return out.some((i) => i < 0) ? undefined : out;
  }

  /** The Lanczos sweeps split over the team when every vector is one of its own (else on this thread). */
  readonly sweeps: LanczosSweeps = {
    dots: (v, w, vPrev) => {
      const at = this.indices(v, w, vPrev);
      if (!at) return localSweeps.dots(v, w, vPrev);
      this.run(TASK_DOTS, at);
      return [this.partial(0), this.partial(1)];
    },
    update: (v, vPrev, w, a, b) => {
      const at = this.indices(v, vPrev, w);
      if (!at) return localSweeps.update(v, vPrev, w, a, b);
      this.run(TASK_UPDATE, at, [a, b]);
      return this.partial(0);
    },
    scale: (w, s) => {
      const at = this.indices(w);
      if (!at) return localSweeps.scale(w, s);
      this.run(TASK_SCALE, at, [s]);
    },
    replay: (v, vPrev, w, x, a, b, inv, yj) => {
      const at = this.indices(v, vPrev, w, x);
      if (!at) return localSweeps.replay(v, vPrev, w, x, a, b, inv, yj);
      this.run(TASK_REPLAY, at, [a, b, inv, yj]);
    },
  };

  /** The fused replay over the team's rows (stored matrices only; see LinearOperator.replayStep). */
  readonly replayStep?: LinearOperator['replayStep'];

  private storedReplayStep(v: Float64Array, vPrev: Float64Array, x: Float64Array, a: number, b: number, inv: number, yj: number): void {
    const at = this.indices(v, vPrev, x);
    if (!at) return replayStoredRows(this.spec.matrix!, v, vPrev, x, a, b, inv, yj);
    this.run(TASK_REPLAY_PRODUCT, at, [a, b, inv, yj]);
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
function splitRows(spec: Omit<TeamSpec, 'vectors' | 'ys' | 'bounds' | 'sweepBounds' | 'control' | 'params' | 'partials'>, members: number): Int32Array {
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
