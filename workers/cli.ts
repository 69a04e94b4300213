// Runs inside a worker thread: the whole CLI, so the main thread stays free to handle signals
// (src/cli/signals.ts). Output travels to the main thread as ordered messages.
import { parentPort, workerData } from 'node:worker_threads';
import { main } from '../src/cli/main.js';
import type { CliWorkerData, CliWorkerMessage } from '../src/cli/signals.js';
import { watchPendingTemps } from '../src/io/atomicWrite.js';

const data = workerData as CliWorkerData;
const post = (m: CliWorkerMessage): void => parentPort!.postMessage(m);
watchPendingTemps((tmp, pending) => data.temps.postMessage({ tmp, pending }));
// A command with its own shutdown (batch stops its job processes) listens for the signal here; the
// supervisor forwards it and gives the command a moment before terminating this thread.
parentPort!.on('message', (m: { signal?: NodeJS.Signals }) => {
  if (m.signal && process.listenerCount(m.signal) > 0) process.emit(m.signal, m.signal);
});
parentPort!.unref();
const status = await main(data.argv, {
  stdout: (t) => post({ out: t }),
  stderr: (t) => post({ err: t }),
  stderrIsTTY: data.stderrIsTTY,
  env: process.env,
});
watchPendingTemps(undefined);
data.temps.close();
// What went to this thread's own process.stdout/stderr (a progress bar, a Node warning) reaches the
// main thread before the status, on which it flushes and exits without waiting for this thread.
await Promise.all([process.stdout, process.stderr].map((s) => new Promise((done) => s.write('', done))));
post({ status });
