import { createRequire } from 'node:module';
import { availableParallelism } from 'node:os';
import type { Piscina } from 'piscina';
import { BitspanError, type BitspanErrorCode } from '../errors.js';
import { workerScript } from '../util/packageRoot.js';

// piscina is loaded with the first pool: small builds run on one thread and never need it.
const requireCjs = createRequire(import.meta.url);

/** Worker pools by script and size, kept for the life of a command and closed by `closeThreadPools`. */
const pools = new Map<string, Piscina>();

/** Default thread count: the machine's cores. */
export function defaultThreads(): number {
  return Math.max(1, availableParallelism());
}

/** A pool of `threads` workers running `dist/workers/<script>.js` (piscina). */
export function threadPool(script: string, threads: number): Piscina {
  const key = `${script}:${threads}`;
  let pool = pools.get(key);
  if (!pool) {
    // Idle workers exit after a second so a library caller that forgets closeThreadPools still exits.
    const { Piscina: Pool } = requireCjs('piscina') as typeof import('piscina');
    pool = new Pool({ filename: workerScript(script), minThreads: 0, maxThreads: threads, idleTimeout: 1000 });
    pools.set(key, pool);
  }
  return pool;
}

/** Run a task, turning an error that crossed the thread boundary back into a BitspanError. */
export async function runInPool<T, R>(pool: Piscina, task: T): Promise<R> {
  try {
    return (await pool.run(task)) as R;
  } catch (e) {
    const o = e as { code?: string; message?: string; hint?: string; file?: string; line?: number };
    if (o && typeof o.code === 'string' && typeof o.message === 'string' && 'hint' in o) {
      throw BitspanError.fromJSON({ code: o.code as BitspanErrorCode, message: o.message, hint: o.hint, file: o.file, line: o.line });
    }
    throw e;
  }
}

/** Stop every pool (call once when a command ends so the process can exit). */
export async function closeThreadPools(): Promise<void> {
  const all = [...pools.values()];
  pools.clear();
  await Promise.all(all.map((p) => p.destroy()));
}
