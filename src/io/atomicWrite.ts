import { promises as fsp, rmSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { BitspanError } from '../errors.js';

/** Temporary files in flight, removed by `removePendingTemps` when a run is interrupted. */
const pending = new Set<string>();
/** Told of every temporary file as it starts and stops being pending (see `watchPendingTemps`). */
let watcher: ((tmp: string, pendingNow: boolean) => void) | undefined;

/**
 * Write `data` to `file` atomically: a temporary file in the same folder, fsync, then rename, so a
 * reader never sees a half-written file and an earlier version survives any failure.
 */
export async function writeFileAtomic(file: string, data: string | Uint8Array): Promise<void> {
  const dir = dirname(file);
  const tmp = join(dir, `.${basename(file)}.tmp-${process.pid}-${Math.random().toString(36).slice(2, 10)}`);
  pending.add(tmp);
  watcher?.(tmp, true);
  try {
    const fh = await fsp.open(tmp, 'w');
    try {
      await fh.writeFile(data);
      await fh.sync();
    } finally {
      await fh.close();
    }
    await fsp.rename(tmp, file);
  } catch (e) {
    await fsp.rm(tmp, { force: true }).catch(() => undefined);
    const code = (e as NodeJS.ErrnoException).code;
    throw new BitspanError('output-unwritable', `cannot write output (${code ?? String(e)})`, 'check that the folder exists and is writable', { file });
  } finally {
    pending.delete(tmp);
    watcher?.(tmp, false);
  }
}

/**
 * Report each temporary file when it is created and when it is renamed or removed, so a thread
 * other than the writer (the CLI's signal handler) can clean up after an interrupted write.
 */
export function watchPendingTemps(listener: ((tmp: string, pendingNow: boolean) => void) | undefined): void {
  watcher = listener;
}

/** Remove every temporary file still being written (called on SIGINT/SIGTERM). */
export function removePendingTemps(): void {
  for (const tmp of pending) {
    try {
      // Synchronous on purpose: this runs in a signal handler just before exit.
      rmSync(tmp, { force: true });
    } catch {
      /* already gone */
    }
  }
  pending.clear();
}
