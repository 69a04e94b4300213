import { rmSync } from 'node:fs';
import { setFlagsFromString } from 'node:v8';
import { MessageChannel, receiveMessageOnPort, Worker, type MessagePort } from 'node:worker_threads';
import { workerScript } from '../util/packageRoot.js';

/** How long a command may take to act on a forwarded signal before its thread is terminated. */
const FORWARD_GRACE_MS = 400;

/**
 * Exit status after a signal: 128 + the signal number (common practice in POSIX shells). SIGHUP
 * comes when the terminal of an interactive session closes; it is handled like SIGTERM.
 */
export const SIGNAL_STATUS = { SIGINT: 130, SIGTERM: 143, SIGHUP: 129 } as const;

/** How long a worker may take to stop after `terminate()` before the process exits regardless. */
const STOP_GRACE_MS = 1500;

/** What `workers/cli.ts` receives. */
export interface CliWorkerData {
  argv: string[];
  stderrIsTTY: boolean;
  /** Receives `{ tmp, pending }` for every temporary output file the worker opens and closes. */
  temps: MessagePort;
}

/** Messages from `workers/cli.ts` on its parent port. */
export type CliWorkerMessage = { out: string } | { err: string } | { status: number };

/**
 * Run the CLI in a worker thread and keep this thread free for SIGINT/SIGTERM/SIGHUP, which Node can only
 * deliver to an idle main thread: the worker may sit in a long synchronous Lanczos loop or an
 * Atomics wait. On a signal the worker (and its own workers) is terminated, temporary output files
 * it had in flight are removed, earlier outputs are never touched, and the process exits 130/143/129.
 * Resolves with the exit status of a run that was not interrupted, as soon as the worker reports it
 * (its output has arrived by then; the worker and its own threads may still be tearing down). `script` replaces
 * `workers/cli.js` (tests use it to stand in a worker that never finishes).
 */
export function runCliSupervised(argv: string[], opts: { script?: string } = {}): Promise<number> {
  const channel = new MessageChannel();
  const temps = new Set<string>();
  const track = (m: { tmp: string; pending: boolean }): void => {
    if (m.pending) temps.add(m.tmp);
    else temps.delete(m.tmp);
  };
  channel.port1.on('message', track);
  channel.port1.unref();
  const data: CliWorkerData = { argv, stderrIsTTY: Boolean(process.stderr.isTTY), temps: channel.port2 };
  // Threads made from now on get V8's gc hook: a solve collects between stages (collectGarbage) so
  // its peak memory does not hold the previous stage's dropped arrays.
  setFlagsFromString('--expose-gc');
  const worker = new Worker(opts.script ?? workerScript('cli'), { workerData: data, transferList: [channel.port2] });

  let interrupted = false;
  const onSignal = (signal: keyof typeof SIGNAL_STATUS): void => {
    if (interrupted) return;
    interrupted = true;
    const exit = (): void => {
      // Temp files announced but not yet seen by the listener are still queued on the port.
      for (let m = receiveMessageOnPort(channel.port1); m; m = receiveMessageOnPort(channel.port1)) track(m.message as { tmp: string; pending: boolean });
      for (const tmp of temps) rmSync(tmp, { force: true });
      process.stderr.write(`bitspan: interrupted by ${signal}; its unfinished outputs were removed and earlier outputs left untouched\n`);
      process.exit(SIGNAL_STATUS[signal]);
    };
    const grace = setTimeout(exit, STOP_GRACE_MS + FORWARD_GRACE_MS);
    const stop = (): void => {
      void worker.terminate().then(() => {
        clearTimeout(grace);
        exit();
      });
    };
    // Let a command that handles the signal itself (batch: stop its job processes) do so first.
    worker.postMessage({ signal });
    const forward = setTimeout(stop, FORWARD_GRACE_MS);
    worker.once('exit', () => {
      clearTimeout(forward);
      stop();
    });
  };
  const signals = Object.keys(SIGNAL_STATUS) as Array<keyof typeof SIGNAL_STATUS>;
  const handlers = signals.map((signal) => [signal, (): void => onSignal(signal)] as const);
  for (const [signal, handler] of handlers) process.on(signal, handler);

  // A reader that stops early (`| head`) closes the pipe: drop the rest of the output quietly and let
  // the run finish (its --out file included) instead of dying on EPIPE with a stack trace.
  let stdoutOpen = true;
  let stderrOpen = true;
  process.stdout.on('error', () => (stdoutOpen = false));
  process.stderr.on('error', () => (stderrOpen = false));

  return new Promise((resolve) => {
    let status: number | undefined;
    worker.on('message', (m: CliWorkerMessage) => {
      if ('out' in m) {
        if (stdoutOpen) process.stdout.write(m.out);
      } else if ('err' in m) {
        if (stderrOpen) process.stderr.write(m.err);
      } else {
        status = m.status;
        resolve(status);
      }
    });
    worker.on('error', (e) => {
      if (interrupted) return;
      const oom = (e as NodeJS.ErrnoException).code === 'ERR_WORKER_OUT_OF_MEMORY';
      process.stderr.write(
        oom
          ? 'bitspan: internal error: ran out of memory although the memory plan allowed the run (please report this; meanwhile lower --max-dim or --memory, or use --matrix-free)\n'
          : `bitspan: internal error: ${e.message.replace(/\s+/g, ' ')} (please report this with the command you ran)\n`,
      );
      status = 1;
    });
    worker.on('exit', () => {
      if (interrupted) return;
      for (const [signal, handler] of handlers) process.off(signal, handler);
      channel.port1.close();
      resolve(status ?? 1);
    });
  });
}
