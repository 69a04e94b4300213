// Independent dense references for tests: Kronecker products of the 2×2 Pauli matrices, written
// from their textbook definitions and sharing no code with src/.
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';

export interface DenseComplex {
  n: number;
  re: Float64Array;
  im: Float64Array;
}

type Op = 'I' | 'X' | 'Y' | 'Z';
const PAULI: Record<Op, { re: number[]; im: number[] }> = {
  I: { re: [1, 0, 0, 1], im: [0, 0, 0, 0] },
  X: { re: [0, 1, 1, 0], im: [0, 0, 0, 0] },
  Y: { re: [0, 0, 0, 0], im: [0, -1, 1, 0] },
  Z: { re: [1, 0, 0, -1], im: [0, 0, 0, 0] },
};

function kron(a: DenseComplex, b: DenseComplex): DenseComplex {
  const n = a.n * b.n;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let i = 0; i < a.n; i++)
    for (let j = 0; j < a.n; j++)
      for (let k = 0; k < b.n; k++)
        for (let l = 0; l < b.n; l++) {
          const ar = a.re[i * a.n + j]!, ai = a.im[i * a.n + j]!;
          const br = b.re[k * b.n + l]!, bi = b.im[k * b.n + l]!;
          const r = i * b.n + k, c = j * b.n + l;
          re[r * n + c] = ar * br - ai * bi;
          im[r * n + c] = ar * bi + ai * br;
        }
  return { n, re, im };
}

/**
 * Dense 2^N matrix of Σ coeff · P, with basis index = the bitstring read as a binary number
 * (qubit 0 the least significant bit), i.e. the Kronecker product P_{N−1} ⊗ … ⊗ P_0.
 */
export function densePauliSum(qubits: number, terms: Array<{ coeff: number; ops: Array<[Op, number]> }>): DenseComplex {
  const dim = 2 ** qubits;
  const total: DenseComplex = { n: dim, re: new Float64Array(dim * dim), im: new Float64Array(dim * dim) };
  for (const t of terms) {
    let m: DenseComplex = { n: 1, re: new Float64Array([1]), im: new Float64Array([0]) };
    for (let q = qubits - 1; q >= 0; q--) {
      const op = t.ops.find(([, k]) => k === q)?.[0] ?? 'I';
      m = kron(m, { n: 2, re: Float64Array.from(PAULI[op].re), im: Float64Array.from(PAULI[op].im) });
    }
    for (let i = 0; i < dim * dim; i++) {
      total.re[i]! += t.coeff * m.re[i]!;
      total.im[i]! += t.coeff * m.im[i]!;
    }
  }
  return total;
}

/** Rows/columns `idx` of a dense matrix. */
export function project(m: DenseComplex, idx: number[]): DenseComplex {
  const n = idx.length;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  idx.forEach((a, i) => idx.forEach((b, j) => {
    re[i * n + j] = m.re[a * m.n + b]!;
    im[i * n + j] = m.im[a * m.n + b]!;
  }));
  return { n, re, im };
}

/**
 * Eigenvalues of a dense Hermitian matrix with ml-matrix: the real symmetric embedding
 * [[A, −B], [B, A]] of A + iB has each eigenvalue twice; every other sorted value is returned.
 */
export function hermitianEigenvalues(m: DenseComplex): number[] {
  const n = m.n;
  const big = Matrix.zeros(2 * n, 2 * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      const a = m.re[i * n + j]!, b = m.im[i * n + j]!;
      big.set(i, j, a);
      big.set(i + n, j + n, a);
      big.set(i, j + n, -b);
      big.set(i + n, j, b);
    }
  const vals = new EigenvalueDecomposition(big, { assumeSymmetric: true }).realEigenvalues.sort((x, y) => x - y);
  return vals.filter((_, i) => i % 2 === 0);
}

/** Binary string of index `i` with `qubits` characters, qubit 0 rightmost. */
export function bitstringOf(i: number, qubits: number): string {
  return i.toString(2).padStart(qubits, '0');
}

/** All indices of 2^N with Hamming weight w. */
export function weightIndices(qubits: number, w: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < 2 ** qubits; i++) {
    let c = 0;
    for (let x = i; x; x &= x - 1) c++;
    if (c === w) out.push(i);
  }
  return out;
}

/**
 * ⟨a|coeff·P|b⟩ for one Pauli string on bit arrays a, b (a[q] is qubit q), as the product of the
 * single-qubit textbook matrix elements above; qubits outside `ops` carry the identity.
 */
export function pauliStringElement(a: number[], b: number[], coeff: number, ops: Array<[Op, number]>): [number, number] {
  let re = coeff;
  let im = 0;
  const acted = new Set(ops.map(([, q]) => q));
  for (let q = 0; q < a.length; q++) if (!acted.has(q) && a[q] !== b[q]) return [0, 0];
  for (const [op, q] of ops) {
    const e = 2 * a[q]! + b[q]!;
    const pr = PAULI[op].re[e]!;
    const pi = PAULI[op].im[e]!;
    [re, im] = [re * pr - im * pi, re * pi + im * pr];
  }
  return [re, im];
}
