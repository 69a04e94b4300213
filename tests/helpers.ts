import { expect } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../src/cli/main.js';
import { BitspanError } from '../src/errors.js';
import { complexMatrix, type ComplexMatrix } from '../src/solvers/complexMatrix.js';
import { seededNormal } from '../src/util/normal.js';

/** The BitspanError code a promise rejects with, or 'no error'. */
export async function codeOf(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (e) {
    if (e instanceof BitspanError) return e.code;
    throw e;
  }
  return 'no error';
}

/** The BitspanError a synchronous call throws (fails the test when it throws nothing). */
export function errorOf(f: () => unknown): BitspanError {
  try {
    f();
  } catch (e) {
    if (e instanceof BitspanError) return e;
    throw e;
  }
  throw new Error('expected a BitspanError');
}

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

/** Noise-free Krylov matrices of a small Heisenberg chain, built independently of bitspan's code. */
export interface KrylovFixture {
  h: ComplexMatrix;
  s: ComplexMatrix;
  /** Lowest eigenvalue of the dense Hamiltonian (ml-matrix). */
  exactGround: number;
  /** Number of distinct eigenvalues of H whose eigenspaces ψ0 overlaps: the reachable dimension. */
  reachableDimension: number;
}

/**
 * H̃_jk = ⟨ψ_j|H|ψ_k⟩ and S_jk = ⟨ψ_j|ψ_k⟩ for ψ_k = e^{−ikΔtH}ψ0, k = 0..r−1, with H the open
 * Heisenberg chain Σ (XX + YY + ZZ) + field·Σ Z on `qubits` sites built by mathjs `kron` and
 * ψ0 the Néel state |0101…⟩; the propagator is mathjs `expm` (outside references). Takes ~0.3 s at
 * 4 sites and ~2 s at 6.
 */
export async function heisenbergKrylov(qubits: number, dt: number, r: number, field = 0): Promise<KrylovFixture> {
  // Imported here, not at the top, so test files that do not build Krylov matrices skip mathjs.
  const math = await import('mathjs');
  type MathMatrix = import('mathjs').Matrix;
  type MathComplex = import('mathjs').Complex;
  const { EigenvalueDecomposition, Matrix } = await import('ml-matrix');
  const pauli = {
    I: math.matrix([[1, 0], [0, 1]]),
    X: math.matrix([[0, 1], [1, 0]]),
    Y: math.matrix([[0, math.complex(0, -1)], [math.complex(0, 1), 0]]),
    Z: math.matrix([[1, 0], [0, -1]]),
  };
  const dim = 2 ** qubits;
  const string = (ops: Record<number, 'X' | 'Y' | 'Z'>): MathMatrix => {
    let m: MathMatrix = math.matrix([[1]]);
    for (let q = 0; q < qubits; q++) m = math.kron(m, pauli[ops[q] ?? 'I']);
    return m;
  };
  let hm: MathMatrix = math.multiply(0, string({})) as MathMatrix;
  for (let q = 0; q + 1 < qubits; q++) {
    for (const p of ['X', 'Y', 'Z'] as const) hm = math.add(hm, string({ [q]: p, [q + 1]: p })) as MathMatrix;
  }
  for (let q = 0; q < qubits && field !== 0; q++) hm = math.add(hm, math.multiply(field, string({ [q]: 'Z' }))) as MathMatrix;
  const hRows = (hm.toArray() as Array<Array<number | MathComplex>>).map((row) => row.map((x) => (typeof x === 'number' ? x : x.re)));
  const u = math.expm(math.multiply(math.complex(0, -dt), math.matrix(hRows)) as MathMatrix);
  // Néel state: basis index with bits 0101… (which end is qubit 0 does not matter here).
  let neel = 0;
  for (let q = 0; q < qubits; q += 2) neel |= 1 << q;
  const states: MathMatrix[] = [];
  let psi: MathMatrix = math.matrix(Array.from({ length: dim }, (_, i) => (i === neel ? 1 : 0)));
  for (let k = 0; k < r; k++) {
    states.push(psi);
    psi = math.multiply(u, psi) as MathMatrix;
  }
  const hStates = states.map((v) => math.multiply(math.matrix(hRows), v) as MathMatrix);
  const h = complexMatrix(r);
  const s = complexMatrix(r);
  for (let j = 0; j < r; j++) {
    // mathjs `dot` conjugates its first argument: dot(a, b) = Σ conj(a_i) b_i.
    const bra = states[j]!;
    for (let k = 0; k < r; k++) {
      const hjk = math.complex(math.dot(bra, hStates[k]!) as unknown as MathComplex);
      const sjk = math.complex(math.dot(bra, states[k]!) as unknown as MathComplex);
      h.re[j * r + k] = hjk.re;
      h.im[j * r + k] = hjk.im;
      s.re[j * r + k] = sjk.re;
      s.im[j * r + k] = sjk.im;
    }
  }
  const eig = new EigenvalueDecomposition(new Matrix(hRows), { assumeSymmetric: true });
  const values = eig.realEigenvalues;
  const vectors = eig.eigenvectorMatrix;
  const weights = values.map((_, n) => vectors.get(neel, n) ** 2);
  const order = values.map((_, i) => i).sort((a, b) => values[a]! - values[b]!);
  let reachable = 0;
  for (let i = 0; i < order.length; ) {
    let w = 0;
    let j = i;
    while (j < order.length && values[order[j]!]! - values[order[i]!]! < 1e-9) w += weights[order[j++]!]!;
    if (w > 1e-12) reachable++;
    i = j;
  }
  return { h, s, exactGround: values[order[0]!]!, reachableDimension: reachable };
}

/**
 * A copy of `a` plus seeded Hermitian Gaussian noise: each pair (j,k),(k,j) gets re, im ~ N(0, eps²)
 * once, conjugate-symmetrically; diagonal entries get real noise only.
 */
export function addHermitianNoise(a: ComplexMatrix, eps: number, seed: number): ComplexMatrix {
  const g = seededNormal(seed);
  const n = a.n;
  const out = complexMatrix(n);
  out.re.set(a.re);
  out.im.set(a.im);
  for (let j = 0; j < n; j++) {
    for (let k = j; k < n; k++) {
      const x = eps * g.next();
      const y = j === k ? 0 : eps * g.next();
      out.re[j * n + k] = out.re[j * n + k]! + x;
      out.im[j * n + k] = out.im[j * n + k]! + y;
      if (k !== j) {
        out.re[k * n + j] = out.re[k * n + j]! + x;
        out.im[k * n + j] = out.im[k * n + j]! - y;
      }
    }
  }
  return out;
}

/** An n×n error matrix with the same error on every real and imaginary part. */
export function uniformErrors(n: number, sigma: number): ComplexMatrix {
  const e = complexMatrix(n);
  e.re.fill(sigma);
  e.im.fill(sigma);
  return e;
}

/** Synchronous single-thread build and solve (the library's `projectAndSolveSync`). */
export { projectAndSolveSync } from '../src/pipeline/solve.js';
