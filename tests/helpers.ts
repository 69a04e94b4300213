import { expect } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
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

/** A dense complex matrix, row-major, real and imaginary parts apart. */
export interface DenseComplex {
  dim: number;
  re: Float64Array;
  im: Float64Array;
}

// The Pauli matrices as [re, im] 2×2 blocks.
const PAULI: Record<'I' | 'X' | 'Y' | 'Z', { re: number[]; im: number[] }> = {
  I: { re: [1, 0, 0, 1], im: [0, 0, 0, 0] },
  X: { re: [0, 1, 1, 0], im: [0, 0, 0, 0] },
  Y: { re: [0, 0, 0, 0], im: [0, -1, 1, 0] },
  Z: { re: [1, 0, 0, -1], im: [0, 0, 0, 0] },
};

/**
 * Dense matrix of a Pauli sum by explicit Kronecker products P_{n−1} ⊗ … ⊗ P_0 (qubit 0 the least
 * significant index bit) — written from the textbook definition, independently of the bit tricks
 * of src/, so tests can compare against it.
 */
export function denseFromPauliSum(h: { constant: number; terms: Array<{ coeff: number; x: Uint32Array; z: Uint32Array }> }, qubits: number): DenseComplex {
  const dim = 2 ** qubits;
  const re = new Float64Array(dim * dim);
  const im = new Float64Array(dim * dim);
  for (let i = 0; i < dim; i++) re[i * dim + i] = h.constant;
  for (const t of h.terms) {
    let mRe = new Float64Array([t.coeff]);
    let mIm = new Float64Array([0]);
    let size = 1;
    for (let q = qubits - 1; q >= 0; q--) {
      const xb = (t.x[q >>> 5]! >>> (q & 31)) & 1;
      const zb = (t.z[q >>> 5]! >>> (q & 31)) & 1;
      const p = PAULI[xb && zb ? 'Y' : xb ? 'X' : zb ? 'Z' : 'I'];
      const n = size * 2;
      const nRe = new Float64Array(n * n);
      const nIm = new Float64Array(n * n);
      for (let a = 0; a < size; a++) {
        for (let b = 0; b < size; b++) {
          const ar = mRe[a * size + b]!;
          const ai = mIm[a * size + b]!;
          if (ar === 0 && ai === 0) continue;
          for (let c = 0; c < 2; c++) {
            for (let d = 0; d < 2; d++) {
              const pr = p.re[c * 2 + d]!;
              const pi = p.im[c * 2 + d]!;
              nRe[(a * 2 + c) * n + b * 2 + d] = ar * pr - ai * pi;
              nIm[(a * 2 + c) * n + b * 2 + d] = ar * pi + ai * pr;
            }
          }
        }
      }
      mRe = nRe;
      mIm = nIm;
      size = n;
    }
    for (let k = 0; k < dim * dim; k++) {
      re[k]! += mRe[k]!;
      im[k]! += mIm[k]!;
    }
  }
  return { dim, re, im };
}

/**
 * Eigenvalues (ascending) of a dense Hermitian matrix with ml-matrix, through the real symmetric
 * embedding [[Re, −Im], [Im, Re]], whose spectrum is each eigenvalue twice.
 */
export function hermitianEigenvalues(m: DenseComplex): number[] {
  const n = m.dim;
  if (m.im.every((v) => v === 0)) {
    const real = Array.from({ length: n }, (_, i) => Array.from(m.re.subarray(i * n, (i + 1) * n)));
    return new EigenvalueDecomposition(new Matrix(real), { assumeSymmetric: true }).realEigenvalues.sort((a, b) => a - b);
  }
  const rows: number[][] = [];
  for (let i = 0; i < 2 * n; i++) {
    const row = new Array<number>(2 * n).fill(0);
    for (let j = 0; j < 2 * n; j++) {
      const a = i % n;
      const b = j % n;
      const r = m.re[a * n + b]!;
      const s = m.im[a * n + b]!;
      row[j] = (i < n) === (j < n) ? r : i < n ? -s : s;
    }
    rows.push(row);
  }
  const values = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true }).realEigenvalues.sort((a, b) => a - b);
  return values.filter((_, i) => i % 2 === 0);
}
