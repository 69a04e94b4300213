import { expect } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../src/cli/main.js';

/** Assert |actual − expected| ≤ tol with a readable message. */
export function closeTo(actual: number, expected: number, tol: number, what = 'value'): void {
  if (!(Math.abs(actual - expected) <= tol)) {
    throw new Error(`${what}: expected ${expected} ± ${tol}, got ${actual} (off by ${Math.abs(actual - expected)})`);
  }
}

/** Compare two spectra order-free (both sorted ascending first). */
export function spectraClose(actual: ArrayLike<number>, expected: ArrayLike<number>, tol: number): void {
  const a = Array.from(actual).sort((x, y) => x - y);
  const b = Array.from(expected).sort((x, y) => x - y);
  expect(a.length).toBe(b.length);
  a.forEach((x, i) => closeTo(x, b[i]!, tol, `eigenvalue ${i}`));
}

/** A fresh temporary folder. */
export function tempDir(prefix = 'bitspan-test-'): string {
  return mkdtempSync(join(tmpdir(), prefix));
}

/** Write files into a folder and return their paths by name. */
export function writeFiles(dir: string, files: Record<string, string>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [name, text] of Object.entries(files)) {
    const p = join(dir, name);
    writeFileSync(p, text);
    out[name] = p;
  }
  return out;
}

/** Run the CLI in-process (with `env` as its environment); returns exit status and captured streams. */
export async function runCli(argv: string[], env: Record<string, string | undefined> = {}): Promise<{ status: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const status = await main(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t), stderrIsTTY: false, env });
  return { status, stdout, stderr };
}
