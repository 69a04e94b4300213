// Runs inside a worker thread of a solve (see src/parallel/solveWorkers.ts): takes build jobs (row
// chunks of H_S from a shared counter, the basis read from SharedArrayBuffers without copying) and
// team specs (a member of the matrix–vector product team, until that team closes).
import { parentPort, receiveMessageOnPort } from 'node:worker_threads';
import { buildTakenChunks } from '../src/build/parallelBuild.js';
import { BitspanError } from '../src/errors.js';
import { collectGarbage } from '../src/util/collectGarbage.js';
import { runTeamTask, type MemberSpec } from '../src/parallel/matvecTeam.js';
import type { BuildReply, SolveWorkerMessage } from '../src/parallel/solveWorkers.js';

/** Do this member's part of each task the team posts (a new generation of its counter), until the counter goes negative. */
function serve(spec: MemberSpec): void {
  const ctrl = new Int32Array(spec.control);
  let seen = 0;
  for (;;) {
    while (Atomics.load(ctrl, 0) === seen) Atomics.wait(ctrl, 0, seen);
    seen = Atomics.load(ctrl, 0);
    if (seen < 0) break;
    // Vectors made since the last product arrive on the port (posted before this wake-up).
    for (let m = receiveMessageOnPort(spec.port); m; m = receiveMessageOnPort(spec.port)) spec.vectors.push(m.message as Float64Array);
    runTeamTask(spec, spec.member, ctrl);
    Atomics.add(ctrl, 1, 1);
    Atomics.notify(ctrl, 1);
  }
  spec.port.close();
}

parentPort!.on('message', (m: SolveWorkerMessage) => {
  if ('team' in m) {
    serve(m.team);
    return;
  }
  let reply: BuildReply;
  try {
    reply = { pieces: buildTakenChunks(m.build) };
  } catch (e) {
    reply = { error: e instanceof BitspanError ? e.toJSON() : { message: e instanceof Error ? e.message : String(e) } };
  }
  m.reply.postMessage(reply);
  m.reply.close();
  // This isolate's handles on the pieces (and the basis) would otherwise keep their shared memory
  // alive after the caller drops them: an idle member blocked in Atomics.wait never collects.
  collectGarbage();
});
