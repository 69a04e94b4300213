// Runs inside a worker thread: one member of a matrix–vector product team. It waits for a team's
// spec, then on the team's shared generation counter: applies its row range from and into the
// team's shared vectors and signals completion, until the team closes; then it waits for the next team.
import { parentPort, receiveMessageOnPort } from 'node:worker_threads';
import { applyTeamRows, type MemberSpec } from '../src/parallel/matvecTeam.js';

function serve(spec: MemberSpec): void {
  const ctrl = new Int32Array(spec.control);
  let seen = 0;
  for (;;) {
    while (Atomics.load(ctrl, 0) === seen) Atomics.wait(ctrl, 0, seen);
    seen = Atomics.load(ctrl, 0);
    if (seen < 0) break;
    // Vectors made since the last product arrive on the port (posted before this wake-up).
    for (let m = receiveMessageOnPort(spec.port); m; m = receiveMessageOnPort(spec.port)) spec.vectors.push(m.message as Float64Array);
    applyTeamRows(spec, spec.member, Atomics.load(ctrl, 2), Atomics.load(ctrl, 3));
    Atomics.add(ctrl, 1, 1);
    Atomics.notify(ctrl, 1);
  }
  spec.port.close();
}

parentPort!.on('message', serve);
