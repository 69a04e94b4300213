import { createRequire } from 'node:module';
import type { SingleBar } from 'cli-progress';
import type { CliIo } from './io.js';

// cli-progress is loaded on the first bar only: runs without a terminal never pay for it.
const requireCjs = createRequire(import.meta.url);

/** Progress reporters for the build and the solve; no-ops unless stderr is a terminal and output is not JSON. */
export interface Progress {
  build(done: number, total: number): void;
  solve(info: { matvecs: number; residual: number; energy: number }): void;
  stop(): void;
}

const silent: Progress = { build: () => undefined, solve: () => undefined, stop: () => undefined };

/** A cli-progress bar for rows built, then a line for Lanczos iterations with the current residual. */
export function progressFor(io: CliIo, json: boolean): Progress {
  if (json || !io.stderrIsTTY) return silent;
  const stream = { write: (s: string) => io.stderr(s), isTTY: true, columns: process.stderr.columns ?? 80, cursorTo: process.stderr.cursorTo?.bind(process.stderr), clearLine: process.stderr.clearLine?.bind(process.stderr), moveCursor: process.stderr.moveCursor?.bind(process.stderr) };
  let bar: SingleBar | undefined;
  let solving = false;
  return {
    build(done, total) {
      if (!bar) {
        const { SingleBar, Presets } = requireCjs('cli-progress') as typeof import('cli-progress');
        bar = new SingleBar({ format: 'build  [{bar}] {percentage}% | {value}/{total} rows', stream: stream as unknown as NodeJS.WritableStream, hideCursor: false, clearOnComplete: true }, Presets.shades_classic);
        bar.start(total, 0);
      }
      bar.update(done);
      if (done >= total) {
        bar.stop();
        bar = undefined;
      }
    },
    solve(info) {
      solving = true;
      io.stderr(`\rLanczos: ${info.matvecs} products, residual ${info.residual.toExponential(2)}, energy ${info.energy.toFixed(10)}   `);
    },
    stop() {
      bar?.stop();
      if (solving) io.stderr('\n');
    },
  };
}
