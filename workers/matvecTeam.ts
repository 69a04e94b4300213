// Runs inside a worker thread: one member of a matrix–vector product team. It waits for a team's
// spec, then on the team's shared generation counter: applies its row range to the shared input
// vector and signals completion, until the team closes; then it waits for the next team.
import { parentPort } from 'node:worker_threads';
import { applyTeamRows, type MemberSpec } from '../src/parallel/matvecTeam.js';

function serve(spec: MemberSpec): void {
  const ctrl = new Int32Array(spec.control);
  let seen = 0;
  for (;;) {
    while (Atomics.load(ctrl, 0) === seen) Atomics.wait(ctrl, 0, seen);
    seen = Atomics.load(ctrl, 0);
    if (seen < 0) break;
    applyTeamRows(spec, spec.member);
    Atomics.add(ctrl, 1, 1);
    Atomics.notify(ctrl, 1);
  }
}

parentPort!.on('message', serve);
