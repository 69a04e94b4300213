import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

let cached: string | undefined;

/** The folder holding bitspan's package.json, found from this module's location (src/ or dist/src/). */
export function packageRoot(): string {
  if (cached) return cached;
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i++) {
    if (existsSync(join(dir, 'package.json')) && existsSync(join(dir, 'src'))) return (cached = dir);
    dir = dirname(dir);
  }
  throw new Error('cannot locate the bitspan package root');
}

/** Path of a compiled worker script, e.g. `workerScript('solveWorker')` → <root>/dist/workers/solveWorker.js. */
export function workerScript(name: string): string {
  return join(packageRoot(), 'dist', 'workers', `${name}.js`);
}
