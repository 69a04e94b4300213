import { MessageChannel, Worker, type MessagePort } from 'node:worker_threads';
import { workerScript } from '../util/packageRoot.js';
import { applyFullSpace, type FullSpaceOperator } from './fullSpaceOperator.js';
import { addScaledRange, energyMomentsRange, fillPhasesRange, phaseRange, rotatePairs, scaleRange, type EnergyMoments, type SimKernels } from './simKernels.js';
import type { StateVector } from './stateVector.js';

/** Command codes shared with workers/simKernels.ts. */
export const SimCommand = { ApplyH: 1, Scale: 2, AddScaled: 3, FillPhases: 4, PhaseDiagonal: 5, RotateGroup: 6, EnergyMoments: 7 } as const;
export type SimCommand = (typeof SimCommand)[keyof typeof SimCommand];

// Control words: [generation, done, command, a, b, c, d, e, group, terms]; −1 generation stops.
export const CTRL = { generation: 0, done: 1, command: 2, ids: 3, group: 8, terms: 9, size: 10 } as const;
/** Room for the term lists of one rotation pass. */
export const MAX_PASS_TERMS = 4096;

/** The part of a kernel call each member (main thread = member 0) runs: [lo, hi) of rows or pairs. */
export function memberRange(n: number, members: number, m: number): [number, number] {
  // Aligned to 4096 so members do not share cache lines of the state.
  const chunk = Math.ceil(n / members / 4096) * 4096;
  return [Math.min(n, m * chunk), Math.min(n, (m + 1) * chunk)];
}

/** Everything a member needs to run one command on its range. */
export interface KernelCall {
  op: FullSpaceOperator;
  arrays: Map<number, Float64Array>;
  ctrl: Int32Array;
  args: Float64Array;
  terms: Int32Array;
  taus: Float64Array;
  results: Float64Array;
}

const state = (arrays: Map<number, Float64Array>, re: number, im: number, dim: number): StateVector => ({ qubits: 0, dim, re: arrays.get(re)!, im: arrays.get(im)! });

/** Run the current command on member m's range (shared by the main thread and the workers). */
export function runMember(c: KernelCall, m: number, members: number): void {
  const { op, arrays, ctrl, args } = c;
  const id = (k: number): number => ctrl[CTRL.ids + k]!;
  const dim = op.dim;
  const [lo, hi] = memberRange(dim, members, m);
  switch (ctrl[CTRL.command] as SimCommand) {
    case SimCommand.ApplyH:
      applyFullSpace(op, arrays.get(id(0))!, arrays.get(id(1))!, arrays.get(id(2))!, arrays.get(id(3))!, args[0]!, args[1]!, args[2]!, lo, hi);
      break;
    case SimCommand.Scale:
      scaleRange(state(arrays, id(0), id(1), dim), args[0]!, args[1]!, lo, hi);
      break;
    case SimCommand.AddScaled:
      addScaledRange(state(arrays, id(0), id(1), dim), state(arrays, id(2), id(3), dim), args[0]!, args[1]!, lo, hi);
      break;
    case SimCommand.FillPhases:
      fillPhasesRange(op, args[0]!, arrays.get(id(0))!, arrays.get(id(1))!, lo, hi);
      break;
    case SimCommand.PhaseDiagonal:
      phaseRange(state(arrays, id(0), id(1), dim), arrays.get(id(2))!, arrays.get(id(3))!, lo, hi);
      break;
    case SimCommand.RotateGroup: {
      const [p0, p1] = memberRange(dim / 2, members, m);
      const n = ctrl[CTRL.terms]!;
      rotatePairs(op, state(arrays, id(0), id(1), dim), ctrl[CTRL.group]!, c.terms.subarray(0, n), c.taus.subarray(0, n), p0, p1);
      break;
    }
    case SimCommand.EnergyMoments: {
      const e = energyMomentsRange(op, state(arrays, id(0), id(1), dim), lo, hi);
      c.results[2 * m] = e.first;
      c.results[2 * m + 1] = e.second;
      break;
    }
  }
}

const sharedF64 = (n: number): Float64Array => new Float64Array(new SharedArrayBuffer(n * 8));

/**
 * Simulator kernels split over this thread and `threads − 1` workers sharing the state vectors
 * (SharedArrayBuffers) and woken through Atomics, so the propagators stay plain synchronous
 * loops. Arrays are introduced to the workers on first use through a message port they drain
 * synchronously. Start with `WorkerKernels.start`, release with `close`.
 */
export class WorkerKernels implements SimKernels {
  private readonly ids = new WeakMap<Float64Array, number>();
  private readonly call: KernelCall;
  private nextId = 1;

  private constructor(
    op: FullSpaceOperator,
    private readonly workers: Worker[],
    private readonly ports: MessagePort[],
    control: { ctrl: Int32Array; args: Float64Array; terms: Int32Array; taus: Float64Array; results: Float64Array },
  ) {
    this.call = { op, arrays: new Map(), ...control };
  }

  /**
   * Start `threads − 1` workers for `op` (built with `shared`, so its diagonal is not copied) and
   * wait until they run. With one thread every call runs here.
   */
  static async start(op: FullSpaceOperator, threads: number): Promise<WorkerKernels> {
    const control = {
      ctrl: new Int32Array(new SharedArrayBuffer(CTRL.size * 4)),
      args: sharedF64(8),
      terms: new Int32Array(new SharedArrayBuffer(MAX_PASS_TERMS * 4)),
      taus: sharedF64(MAX_PASS_TERMS),
      results: sharedF64(2 * Math.max(1, threads)),
    };
    const workers: Worker[] = [];
    const ports: MessagePort[] = [];
    const ready: Array<Promise<void>> = [];
    for (let m = 1; m < threads; m++) {
      const { port1, port2 } = new MessageChannel();
      const w = new Worker(workerScript('simKernels'), {
        workerData: { op, member: m, members: threads, port: port2, ...control },
        transferList: [port2],
      });
      ready.push(
        new Promise((resolve, reject) => {
          w.once('message', () => resolve());
          w.once('error', reject);
        }),
      );
      workers.push(w);
      ports.push(port1);
    }
    await Promise.all(ready);
    return new WorkerKernels(op, workers, ports, control);
  }

  private get members(): number {
    return this.workers.length + 1;
  }

  /** The id of a shared array, introducing it to the workers the first time. */
  private idOf(a: Float64Array): number {
    let id = this.ids.get(a);
    if (id === undefined) {
      id = this.nextId++;
      this.ids.set(a, id);
      this.call.arrays.set(id, a);
      for (const p of this.ports) p.postMessage({ id, array: a });
    }
    return id;
  }

  private run(command: SimCommand, arrays: Float64Array[], args: number[] = []): void {
    const { ctrl } = this.call;
    ctrl[CTRL.command] = command;
    arrays.forEach((a, k) => (ctrl[CTRL.ids + k] = this.idOf(a)));
    args.forEach((v, k) => (this.call.args[k] = v));
    Atomics.store(ctrl, CTRL.done, 0);
    Atomics.add(ctrl, CTRL.generation, 1);
    Atomics.notify(ctrl, CTRL.generation);
    runMember(this.call, 0, this.members);
    const others = this.workers.length;
    for (;;) {
      const done = Atomics.load(ctrl, CTRL.done);
      if (done >= others) break;
      Atomics.wait(ctrl, CTRL.done, done);
    }
  }

  applyH(x: StateVector, y: StateVector, alpha: number, beta: number, gamma: number): void {
    this.run(SimCommand.ApplyH, [x.re, x.im, y.re, y.im], [alpha, beta, gamma]);
  }
  scaleInPlace(psi: StateVector, cr: number, ci: number): void {
    this.run(SimCommand.Scale, [psi.re, psi.im], [cr, ci]);
  }
  addScaled(psi: StateVector, x: StateVector, cr: number, ci: number): void {
    this.run(SimCommand.AddScaled, [psi.re, psi.im, x.re, x.im], [cr, ci]);
  }
  fillPhases(tau: number, cos: Float64Array, sin: Float64Array): void {
    this.run(SimCommand.FillPhases, [cos, sin], [tau]);
  }
  phaseDiagonal(psi: StateVector, cos: Float64Array, sin: Float64Array): void {
    this.run(SimCommand.PhaseDiagonal, [psi.re, psi.im, cos, sin]);
  }
  rotateGroup(psi: StateVector, g: number, terms: Int32Array, taus: Float64Array): void {
    if (terms.length > MAX_PASS_TERMS) {
      // Rare: a flip group longer than the shared list; split it (the order is kept).
      for (let k = 0; k < terms.length; k += MAX_PASS_TERMS) this.rotateGroup(psi, g, terms.subarray(k, k + MAX_PASS_TERMS), taus.subarray(k, k + MAX_PASS_TERMS));
      return;
    }
    this.call.terms.set(terms);
    this.call.taus.set(taus);
    this.call.ctrl[CTRL.group] = g;
    this.call.ctrl[CTRL.terms] = terms.length;
    this.run(SimCommand.RotateGroup, [psi.re, psi.im]);
  }
  energyMoments(psi: StateVector): EnergyMoments {
    this.run(SimCommand.EnergyMoments, [psi.re, psi.im]);
    let first = 0;
    let second = 0;
    for (let m = 0; m < this.members; m++) {
      first += this.call.results[2 * m]!;
      second += this.call.results[2 * m + 1]!;
    }
    return { first, second };
  }
  close(): void {
    Atomics.store(this.call.ctrl, CTRL.generation, -1);
    Atomics.notify(this.call.ctrl, CTRL.generation);
    for (const p of this.ports) p.close();
    for (const w of this.workers) void w.terminate();
  }
}
