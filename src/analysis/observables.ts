import type { Basis } from '../bits/basis.js';
import { basisIndexOf } from '../bits/basis.js';
import { popcount32 } from '../bits/packed.js';

/** One Pauli-string observable coeff · P with its flip (X/Y) and phase (Z/Y) masks. */
export interface PauliObservable {
  /** The operators as written, e.g. `X0 Z3`; empty for a constant. */
  ops: string;
  coeff: number;
  x: Uint32Array;
  z: Uint32Array;
  /** Where it was read (for messages). */
  line?: number;
}

/** Expectation of one Pauli observable in the subspace state. */
export interface PauliExpectation {
  ops: string;
  coeff: number;
  /** coeff · ⟨ψ|P|ψ⟩. */
  value: number;
  /** Whether P is diagonal (Z and identities only); off-diagonal ones only see the subspace. */
  diagonal: boolean;
}

/** Observables of a state over a basis. */
export interface StateObservables {
  /** ⟨Z_q⟩ for q = 0 … qubits−1. */
  z: number[];
  /** ⟨n_q⟩ = (1 − ⟨Z_q⟩)/2, the probability that qubit q reads 1. */
  occupation: number[];
  /** ⟨Z_i Z_j⟩ as a full symmetric matrix (diagonal 1), when computed. */
  zz?: number[][];
  pauli?: PauliExpectation[];
}

/** Options of `stateObservables`. */
export interface ObservableOptions {
  /** Compute ⟨Z_i Z_j⟩ (qubits² numbers; default: when qubits ≤ 64). */
  correlations?: boolean;
  pauli?: PauliObservable[];
}

/**
 * Per-qubit ⟨Z⟩ and occupations, ⟨Z_i Z_j⟩ and Pauli-string expectations of the state `psi` over
 * `basis` (interleaved when complex), normalised here. Off-diagonal strings are evaluated with ψ as
 * it is: zero outside the subspace, so they carry the subspace's truncation.
 */
export function stateObservables(basis: Basis, psi: Float64Array, complex: boolean, opts: ObservableOptions = {}): StateObservables {
  const { dim, nWords, qubits, states } = basis;
  const prob = new Float64Array(dim);
  let total = 0;
  for (let i = 0; i < dim; i++) {
    prob[i] = complex ? psi[2 * i]! ** 2 + psi[2 * i + 1]! ** 2 : psi[i]! ** 2;
    total += prob[i]!;
  }
  for (let i = 0; i < dim; i++) prob[i]! /= total;
  const occ = new Float64Array(qubits);
  const corr = opts.correlations ?? qubits <= 64;
  const pair = corr ? new Float64Array(qubits * qubits) : null;
  const ones = new Int32Array(qubits);
  for (let i = 0; i < dim; i++) {
    const p = prob[i]!;
    if (p === 0) continue;
    let w = 0;
    for (let k = 0; k < nWords; k++) {
      let word = states[i * nWords + k]!;
      while (word !== 0) {
        const bit = 31 - Math.clz32(word & -word);
        ones[w++] = k * 32 + bit;
        word &= word - 1;
      }
    }
    for (let a = 0; a < w; a++) {
      occ[ones[a]!]! += p;
      if (pair) for (let b = a + 1; b < w; b++) pair[ones[a]! * qubits + ones[b]!]! += p;
    }
  }
  const z = Array.from(occ, (n) => 1 - 2 * n);
  const out: StateObservables = { z, occupation: Array.from(occ) };
  if (pair) {
    // Z_i Z_j = (1 − 2n_i)(1 − 2n_j) = 1 − 2n_i − 2n_j + 4 n_i n_j.
    const zz = Array.from({ length: qubits }, () => new Array<number>(qubits).fill(1));
    for (let i = 0; i < qubits; i++) {
      for (let j = i + 1; j < qubits; j++) {
        const v = 1 - 2 * occ[i]! - 2 * occ[j]! + 4 * pair[i * qubits + j]!;
        zz[i]![j] = v;
        zz[j]![i] = v;
      }
    }
    out.zz = zz;
  }
  if (opts.pauli) out.pauli = opts.pauli.map((o) => ({ ops: o.ops, coeff: o.coeff, value: o.coeff * pauliExpectation(basis, psi, complex, o.x, o.z) / total, diagonal: isZero(o.x) }));
  return out;
}

/** ⟨ψ|P|ψ⟩ (unnormalised ψ) for the Pauli string with masks x, z: Σ_a ψ*_{a⊕x} c_P(a) ψ_a. */
export function pauliExpectation(basis: Basis, psi: Float64Array, complex: boolean, x: Uint32Array, z: Uint32Array): number {
  const { dim, nWords, states } = basis;
  let ny = 0;
  for (let k = 0; k < nWords; k++) ny += popcount32((x[k] ?? 0) & (z[k] ?? 0));
  // P|a⟩ = i^{#Y} (−1)^{popcount(a & z)} |a ⊕ x⟩
  const ph = ny & 3;
  const phr = ph === 0 ? 1 : ph === 2 ? -1 : 0;
  const phi = ph === 1 ? 1 : ph === 3 ? -1 : 0;
  const b = new Uint32Array(nWords);
  let re = 0;
  for (let i = 0; i < dim; i++) {
    let par = 0;
    for (let k = 0; k < nWords; k++) {
      par ^= popcount32(states[i * nWords + k]! & (z[k] ?? 0));
      b[k] = states[i * nWords + k]! ^ (x[k] ?? 0);
    }
    const j = basisIndexOf(basis, b);
    if (j < 0) continue;
    const s = par & 1 ? -1 : 1;
    const ar = complex ? psi[2 * i]! : psi[i]!;
    const ai = complex ? psi[2 * i + 1]! : 0;
    const br = complex ? psi[2 * j]! : psi[j]!;
    const bi = complex ? psi[2 * j + 1]! : 0;
    // Re( conj(ψ_b) · phase · s · ψ_a )
    const pr = s * (phr * ar - phi * ai);
    const pi = s * (phr * ai + phi * ar);
    re += br * pr + bi * pi;
  }
  return re;
}

function isZero(m: Uint32Array): boolean {
  for (let k = 0; k < m.length; k++) if (m[k] !== 0) return false;
  return true;
}
