import { popcount32, wordsFor } from '../bits/packed.js';

/**
 * One Pauli string with a real coefficient. `x` marks qubits acted on by X or Y (the flip mask),
 * `z` marks qubits acted on by Z or Y (the phase mask); Y = i·X·Z up to order, so Y sits in both.
 */
export interface PauliTerm {
  coeff: number;
  x: Uint32Array;
  z: Uint32Array;
}

/** A qubit Hamiltonian: constant + Σ coeff · Pauli string, like terms combined. */
export interface PauliSum {
  /** Register size: the `qubits` directive, or the highest index + 1. */
  qubits: number;
  /** Whether the size was declared by the file (then samples must match it exactly). */
  declaredQubits: boolean;
  constant: number;
  terms: PauliTerm[];
}

/** Number of Y factors in a term. */
export function countY(t: PauliTerm): number {
  let n = 0;
  for (let k = 0; k < t.x.length; k++) n += popcount32(t.x[k]! & t.z[k]!);
  return n;
}

/** Whether the projected matrix is complex: some term has an odd number of Y factors. */
export function isComplexHamiltonian(h: PauliSum): boolean {
  return h.terms.some((t) => (countY(t) & 1) === 1);
}

/** Highest qubit index any term acts on, or -1 for a constant Hamiltonian. */
export function highestQubit(h: PauliSum): number {
  let top = -1;
  for (const t of h.terms) {
    for (let k = t.x.length - 1; k >= 0; k--) {
      const m = (t.x[k]! | t.z[k]!) >>> 0;
      if (m !== 0) {
        top = Math.max(top, k * 32 + 31 - Math.clz32(m));
        break;
      }
    }
  }
  return top;
}

/** Render a term's operators as `X0 Y3 Z5`. */
export function formatPauliOps(t: PauliTerm): string {
  const parts: string[] = [];
  const n = t.x.length * 32;
  for (let q = 0; q < n; q++) {
    const xb = (t.x[q >>> 5]! >>> (q & 31)) & 1;
    const zb = (t.z[q >>> 5]! >>> (q & 31)) & 1;
    if (xb && zb) parts.push(`Y${q}`);
    else if (xb) parts.push(`X${q}`);
    else if (zb) parts.push(`Z${q}`);
  }
  return parts.join(' ');
}

/**
 * Accumulates terms and combines like ones; used by every reader and model generator so that
 * the same Pauli string always ends up as one term.
 */
export class PauliSumBuilder {
  private readonly nWords: number;
  private readonly index = new Map<string, number>();
  private readonly terms: PauliTerm[] = [];
  private constant = 0;

  constructor(readonly qubits: number) {
    this.nWords = wordsFor(Math.max(1, qubits));
  }

  /** Add `coeff` times the Pauli string given as a list of [op, qubit]. */
  add(coeff: number, ops: ReadonlyArray<readonly ['X' | 'Y' | 'Z', number]>): void {
    const x = new Uint32Array(this.nWords);
    const z = new Uint32Array(this.nWords);
    for (const [op, q] of ops) {
      const bit = 1 << (q & 31);
      if (op !== 'Z') x[q >>> 5]! |= bit;
      if (op !== 'X') z[q >>> 5]! |= bit;
    }
    this.addMasks(coeff, x, z);
  }

  /** Add `coeff` times the Pauli string with the given flip and phase masks (copied). */
  addMasks(coeff: number, x: Uint32Array, z: Uint32Array): void {
    let identity = true;
    for (let k = 0; k < x.length; k++) if (x[k] || z[k]) identity = false;
    if (identity) {
      this.constant += coeff;
      return;
    }
    const key = `${Array.from(x).join(',')}|${Array.from(z).join(',')}`;
    const at = this.index.get(key);
    if (at !== undefined) {
      this.terms[at]!.coeff += coeff;
    } else {
      this.index.set(key, this.terms.length);
      this.terms.push({ coeff, x: Uint32Array.from(x), z: Uint32Array.from(z) });
    }
  }

  /** The combined sum; terms whose coefficients cancelled exactly are dropped. */
  finish(declaredQubits: boolean): PauliSum {
    return { qubits: this.qubits, declaredQubits, constant: this.constant, terms: this.terms.filter((t) => t.coeff !== 0) };
  }
}

/**
 * Terms grouped by flip mask, in flat arrays for the builder's inner loop. Within a group every
 * term maps |b⟩ to |b ⊕ flip⟩ with amplitude `phaseRe/Im[t] · (−1)^{popcount(b & zMask[t])}`,
 * where phase = coeff · i^{#Y}.
 */
export interface FlipGroups {
  nWords: number;
  count: number;
  /** count × nWords flip masks; the diagonal group (all-zero mask), if any, is first. */
  flipMasks: Uint32Array;
  /** count + 1 offsets into the term arrays. */
  termStart: Int32Array;
  zMasks: Uint32Array;
  phaseRe: Float64Array;
  phaseIm: Float64Array;
  /** Sum of |coeff| per group: an upper bound on any matrix element it produces. */
  weight: Float64Array;
  constant: number;
  complex: boolean;
}

/** Group the terms of `h` by flip mask, widened to `nWords` words (the samples' register). */
export function groupByFlipMask(h: PauliSum, nWords: number): FlipGroups {
  const groups = new Map<string, PauliTerm[]>();
  const keyOf = (m: Uint32Array): string => Array.from({ length: nWords }, (_, k) => m[k] ?? 0).join(',');
  const zeroKey = keyOf(new Uint32Array(nWords));
  groups.set(zeroKey, []);
  for (const t of h.terms) {
    const k = keyOf(t.x);
    const list = groups.get(k);
    if (list) list.push(t);
    else groups.set(k, [t]);
  }
  if (groups.get(zeroKey)!.length === 0) groups.delete(zeroKey);
  const entries = [...groups.entries()];
  const nTerms = h.terms.length;
  const flipMasks = new Uint32Array(entries.length * nWords);
  const termStart = new Int32Array(entries.length + 1);
  const zMasks = new Uint32Array(nTerms * nWords);
  const phaseRe = new Float64Array(nTerms);
  const phaseIm = new Float64Array(nTerms);
  const weight = new Float64Array(entries.length);
  let complex = false;
  let t = 0;
  entries.forEach(([, terms], g) => {
    termStart[g] = t;
    const x = terms[0]!.x;
    for (let k = 0; k < nWords; k++) flipMasks[g * nWords + k] = x[k] ?? 0;
    for (const term of terms) {
      for (let k = 0; k < nWords; k++) zMasks[t * nWords + k] = term.z[k] ?? 0;
      // i^{#Y}: 1, i, −1, −i
      const ny = countY(term) & 3;
      phaseRe[t] = ny === 0 ? term.coeff : ny === 2 ? -term.coeff : 0;
      phaseIm[t] = ny === 1 ? term.coeff : ny === 3 ? -term.coeff : 0;
      if (ny & 1) complex = true;
      weight[g]! += Math.abs(term.coeff);
      t++;
    }
  });
  termStart[entries.length] = t;
  return { nWords, count: entries.length, flipMasks, termStart, zMasks, phaseRe, phaseIm, weight, constant: h.constant, complex };
}
