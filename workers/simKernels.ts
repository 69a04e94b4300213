// Runs inside a worker thread: one member of the simulator's kernel team. It waits on a shared
// generation counter, picks up newly shared arrays from its port, runs the current command on its
// range of rows or pairs, and signals completion.
import { receiveMessageOnPort, parentPort, workerData, type MessagePort } from 'node:worker_threads';
import { CTRL, runMember, type KernelCall } from '../src/sim/workerKernels.js';
import type { FullSpaceOperator } from '../src/sim/fullSpaceOperator.js';

const data = workerData as { op: FullSpaceOperator; member: number; members: number; port: MessagePort } & Omit<KernelCall, 'op' | 'arrays'>;
const call: KernelCall = { op: data.op, arrays: new Map(), ctrl: data.ctrl, args: data.args, terms: data.terms, taus: data.taus, results: data.results };
const ctrl = data.ctrl;
parentPort!.postMessage('ready');
let seen = 0;
for (;;) {
  while (Atomics.load(ctrl, CTRL.generation) === seen) Atomics.wait(ctrl, CTRL.generation, seen);
  seen = Atomics.load(ctrl, CTRL.generation);
  if (seen < 0) break;
  for (let m = receiveMessageOnPort(data.port); m; m = receiveMessageOnPort(data.port)) {
    const { id, array } = m.message as { id: number; array: Float64Array };
    call.arrays.set(id, array);
  }
  runMember(call, data.member, data.members);
  Atomics.add(ctrl, CTRL.done, 1);
  Atomics.notify(ctrl, CTRL.done);
}
