// Runs inside a worker thread: the whole CLI, so the main thread stays free to handle signals
// (src/cli/signals.ts). Output travels to the main thread as ordered messages.
import { parentPort, workerData } from 'node:worker_threads';
import { main } from '../src/cli/main.js';
import type { CliWorkerData, CliWorkerMessage } from '../src/cli/signals.js';
import { watchPendingTemps } from '../src/io/atomicWrite.js';

const data = workerData as CliWorkerData;
const post = (m: CliWorkerMessage): void => parentPort!.postMessage(m);
watchPendingTemps((tmp, pending) => data.temps.postMessage({ tmp, pending }));
const status = await main(data.argv, {
  stdout: (t) => post({ out: t }),
  stderr: (t) => post({ err: t }),
  stderrIsTTY: data.stderrIsTTY,
  env: process.env,
});
watchPendingTemps(undefined);
data.temps.close();
post({ status });
