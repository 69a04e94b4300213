import { BitspanError } from '../errors.js';
import { popcount32 } from '../bits/packed.js';
import { groupByFlipMask, type PauliSum } from '../operators/pauliSum.js';

/**
 * A Pauli sum compiled for the full 2^n-dimensional space (n ≤ 30, one 32-bit word per
 * configuration): the diagonal as a dense array, and the off-diagonal terms grouped by flip mask.
 * Row b of group g couples to column b ⊕ flips[g] with ⟨b|P_t|b ⊕ f⟩ = phase_t · (−1)^{popcount((b ⊕ f) & z_t)}.
 * All arrays are plain (or shared) typed arrays so worker threads can rebuild the operator cheaply.
 */
export interface FullSpaceOperator {
  qubits: number;
  dim: number;
  /** Whether any term has an odd number of Y factors (complex matrix elements). */
  complex: boolean;
  /** Diagonal of H, constant included. */
  diagonal: Float64Array;
  /** Off-diagonal groups: flip mask of each. */
  flips: Int32Array;
  /** groups + 1 offsets into the term arrays. */
  termStart: Int32Array;
  /**
   * Per group, where its terms with a nonzero z mask begin: the terms before it have a constant
   * sign, and their summed phase is `baseRe/baseIm`, so products skip them.
   */
  signedStart: Int32Array;
  baseRe: Float64Array;
  baseIm: Float64Array;
  zMasks: Int32Array;
  phaseRe: Float64Array;
  phaseIm: Float64Array;
  /** Σ|coeff| over non-constant terms: a bound on ‖H − constant‖. */
  normBound: number;
}

/** Compile `h` for a register of `qubits` qubits; the diagonal is evaluated once here. */
export function fullSpaceOperator(h: PauliSum, qubits: number, shared = false): FullSpaceOperator {
  if (qubits > 30) throw new BitspanError('too-large', `the state-vector simulator handles at most 30 qubits, not ${qubits}`, 'use a smaller model');
  const groups = groupByFlipMask(h, 1);
  const dim = 2 ** qubits;
  const diagonal = shared ? new Float64Array(new SharedArrayBuffer(dim * 8)) : new Float64Array(dim);
  diagonal.fill(h.constant);
  let normBound = 0;
  const flips: number[] = [];
  const termStart: number[] = [];
  const signedStart: number[] = [];
  const baseRe: number[] = [];
  const baseIm: number[] = [];
  const zMasks: number[] = [];
  const phaseRe: number[] = [];
  const phaseIm: number[] = [];
  for (let g = 0; g < groups.count; g++) {
    const f = groups.flipMasks[g]! | 0;
    const t0 = groups.termStart[g]!;
    const t1 = groups.termStart[g + 1]!;
    for (let t = t0; t < t1; t++) normBound += Math.abs(groups.phaseRe[t]!) + Math.abs(groups.phaseIm[t]!);
    if (f === 0) {
      // Z strings: one pass per term over the dense diagonal.
      for (let t = t0; t < t1; t++) addZString(diagonal, groups.zMasks[t]! | 0, groups.phaseRe[t]!);
      continue;
    }
    flips.push(f);
    termStart.push(zMasks.length);
    let br = 0;
    let bi = 0;
    // Constant-sign terms first (stable order otherwise).
    const order: number[] = [];
    for (let t = t0; t < t1; t++) if (groups.zMasks[t] === 0) order.push(t);
    const constant = order.length;
    for (let t = t0; t < t1; t++) if (groups.zMasks[t] !== 0) order.push(t);
    order.forEach((t, i) => {
      zMasks.push(groups.zMasks[t]! | 0);
      phaseRe.push(groups.phaseRe[t]!);
      phaseIm.push(groups.phaseIm[t]!);
      if (i < constant) {
        br += groups.phaseRe[t]!;
        bi += groups.phaseIm[t]!;
      }
    });
    signedStart.push(termStart[termStart.length - 1]! + constant);
    baseRe.push(br);
    baseIm.push(bi);
  }
  termStart.push(zMasks.length);
  return {
    qubits,
    dim,
    complex: groups.complex,
    diagonal,
    flips: Int32Array.from(flips),
    termStart: Int32Array.from(termStart),
    signedStart: Int32Array.from(signedStart),
    baseRe: Float64Array.from(baseRe),
    baseIm: Float64Array.from(baseIm),
    zMasks: Int32Array.from(zMasks),
    phaseRe: Float64Array.from(phaseRe),
    phaseIm: Float64Array.from(phaseIm),
    normBound,
  };
}

function addZString(d: Float64Array, z: number, c: number): void {
  const n = d.length;
  for (let b = 0; b < n; b++) d[b]! += popcount32(b & z) & 1 ? -c : c;
}

// Rows are processed in blocks so that y and the block of x it reads stay in cache while every
// group is applied; a block of 2^12 rows touches 4 arrays × 32 KiB.
const BLOCK = 4096;

/**
 * y ← α·H·x + β·x + γ·y on rows lo..hi (complex vectors as separate re/im arrays; x and y must not
 * alias). Each row gathers from its own columns only, so disjoint row ranges may run in parallel.
 */
export function applyFullSpace(
  op: FullSpaceOperator,
  xr: Float64Array,
  xi: Float64Array,
  yr: Float64Array,
  yi: Float64Array,
  alpha: number,
  beta: number,
  gamma: number,
  lo = 0,
  hi = op.dim,
): void {
  const { diagonal, flips, termStart, signedStart, baseRe, baseIm, zMasks, phaseRe, phaseIm, complex } = op;
  const groups = flips.length;
  for (let b0 = lo; b0 < hi; b0 += BLOCK) {
    const b1 = Math.min(hi, b0 + BLOCK);
    for (let b = b0; b < b1; b++) {
      const d = alpha * diagonal[b]! + beta;
      yr[b] = d * xr[b]! + gamma * yr[b]!;
      yi[b] = d * xi[b]! + gamma * yi[b]!;
    }
    for (let g = 0; g < groups; g++) {
      const f = flips[g]!;
      const t0 = signedStart[g]!;
      const t1 = termStart[g + 1]!;
      const a0 = baseRe[g]!;
      if (!complex) {
        for (let b = b0; b < b1; b++) {
          const c = b ^ f;
          let a = a0;
          for (let t = t0; t < t1; t++) a += popcount32(c & zMasks[t]!) & 1 ? -phaseRe[t]! : phaseRe[t]!;
          if (a === 0) continue;
          a *= alpha;
          yr[b]! += a * xr[c]!;
          yi[b]! += a * xi[c]!;
        }
      } else {
        for (let b = b0; b < b1; b++) {
          const c = b ^ f;
          let ar = a0;
          let ai = baseIm[g]!;
          for (let t = t0; t < t1; t++) {
            if (popcount32(c & zMasks[t]!) & 1) {
              ar -= phaseRe[t]!;
              ai -= phaseIm[t]!;
            } else {
              ar += phaseRe[t]!;
              ai += phaseIm[t]!;
            }
          }
          if (ar === 0 && ai === 0) continue;
          ar *= alpha;
          ai *= alpha;
          const vr = xr[c]!;
          const vi = xi[c]!;
          yr[b]! += ar * vr - ai * vi;
          yi[b]! += ar * vi + ai * vr;
        }
      }
    }
  }
}
