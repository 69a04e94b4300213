import { popcount32 } from '../bits/packed.js';
import { applyFullSpace, type FullSpaceOperator } from './fullSpaceOperator.js';
import type { StateVector } from './stateVector.js';

/**
 * The state-vector operations the propagators need. Every operation is a loop over rows or
 * pairs that splits into independent ranges, so an implementation may run them on one thread
 * (`LocalKernels`) or across a worker pool without changing the propagators.
 */
export interface SimKernels {
  /** y ← α·H·x + β·x + γ·y. */
  applyH(x: StateVector, y: StateVector, alpha: number, beta: number, gamma: number): void;
  /** ψ ← (cr + i·ci)·ψ. */
  scaleInPlace(psi: StateVector, cr: number, ci: number): void;
  /** ψ ← ψ + (cr + i·ci)·x. */
  addScaled(psi: StateVector, x: StateVector, cr: number, ci: number): void;
  /** cos_b, sin_b ← cos(τ·H_bb), sin(τ·H_bb). */
  fillPhases(tau: number, cos: Float64Array, sin: Float64Array): void;
  /** ψ_b ← (cos_b − i·sin_b)·ψ_b: a diagonal unitary with precomputed phases. */
  phaseDiagonal(psi: StateVector, cos: Float64Array, sin: Float64Array): void;
  /**
   * ψ ← Π_k e^{−iτ_k c_k P_k} ψ for terms of off-diagonal group g (c_k P_k a term of H), applied in
   * the order of `terms` (indices into the operator's term arrays) for times `taus`.
   */
  rotateGroup(psi: StateVector, g: number, terms: Int32Array, taus: Float64Array): void;
  /** ⟨ψ|H|ψ⟩ and ‖Hψ‖² = ⟨ψ|H²|ψ⟩, without a scratch vector. */
  energyMoments(psi: StateVector): EnergyMoments;
  /** Release threads, if any. */
  close(): void;
}

/** ψ ← (cr + i·ci)·ψ on rows lo..hi. */
export function scaleRange(psi: StateVector, cr: number, ci: number, lo: number, hi: number): void {
  const { re, im } = psi;
  if (ci === 0) {
    for (let b = lo; b < hi; b++) {
      re[b]! *= cr;
      im[b]! *= cr;
    }
    return;
  }
  for (let b = lo; b < hi; b++) {
    const r = re[b]!;
    const i = im[b]!;
    re[b] = cr * r - ci * i;
    im[b] = cr * i + ci * r;
  }
}

/** ψ += (cr + i·ci)·x on rows lo..hi. */
export function addScaledRange(psi: StateVector, x: StateVector, cr: number, ci: number, lo: number, hi: number): void {
  const { re, im } = psi;
  const xr = x.re;
  const xi = x.im;
  if (ci === 0) {
    for (let b = lo; b < hi; b++) {
      re[b]! += cr * xr[b]!;
      im[b]! += cr * xi[b]!;
    }
  } else if (cr === 0) {
    for (let b = lo; b < hi; b++) {
      re[b]! -= ci * xi[b]!;
      im[b]! += ci * xr[b]!;
    }
  } else {
    for (let b = lo; b < hi; b++) {
      re[b]! += cr * xr[b]! - ci * xi[b]!;
      im[b]! += cr * xi[b]! + ci * xr[b]!;
    }
  }
}

/** cos(τ·H_bb) and sin(τ·H_bb) on rows lo..hi. */
export function fillPhasesRange(op: FullSpaceOperator, tau: number, cos: Float64Array, sin: Float64Array, lo: number, hi: number): void {
  const d = op.diagonal;
  for (let b = lo; b < hi; b++) {
    const x = tau * d[b]!;
    cos[b] = Math.cos(x);
    sin[b] = Math.sin(x);
  }
}

/** Diagonal phases on rows lo..hi. */
export function phaseRange(psi: StateVector, cos: Float64Array, sin: Float64Array, lo: number, hi: number): void {
  const { re, im } = psi;
  for (let b = lo; b < hi; b++) {
    const c = cos[b]!;
    const s = sin[b]!;
    const r = re[b]!;
    const i = im[b]!;
    re[b] = c * r + s * i;
    im[b] = c * i - s * r;
  }
}

/**
 * The rotations e^{−iτ_k c_k P_k} of group g on pairs p0..p1. Pair p is (b, b ⊕ f) with b = p with a zero bit
 * inserted at the highest flipped qubit, so every pair is visited once. On a pair, e^{−iθP} is
 * [[cos θ, −w̄], [w, cos θ]] with w = −i·sin θ·ν·(−1)^{popcount(b & z)} and ν = i^{#Y}.
 */
export function rotatePairs(op: FullSpaceOperator, psi: StateVector, g: number, terms: Int32Array, taus: Float64Array, p0: number, p1: number): void {
  const { re, im } = psi;
  const f = op.flips[g]!;
  const pivot = 31 - Math.clz32(f);
  const low = (1 << pivot) - 1;
  const nt = terms.length;
  // Per term: z mask, cos θ, and sin θ times (Im ν, −Re ν).
  const z = new Int32Array(nt);
  const c = new Float64Array(nt);
  const wr = new Float64Array(nt);
  const wi = new Float64Array(nt);
  for (let k = 0; k < nt; k++) {
    const t = terms[k]!;
    z[k] = op.zMasks[t]!;
    const ny = popcount32(f & z[k]!) & 3;
    // phase = coeff·ν; recover coeff from the one nonzero part.
    const coeff = ny === 0 ? op.phaseRe[t]! : ny === 1 ? op.phaseIm[t]! : ny === 2 ? -op.phaseRe[t]! : -op.phaseIm[t]!;
    const theta = taus[k]! * coeff;
    const s = Math.sin(theta);
    c[k] = Math.cos(theta);
    const nuRe = ny === 0 ? 1 : ny === 2 ? -1 : 0;
    const nuIm = ny === 1 ? 1 : ny === 3 ? -1 : 0;
    wr[k] = s * nuIm;
    wi[k] = -s * nuRe;
  }
  for (let p = p0; p < p1; p++) {
    const b = ((p >>> pivot) << (pivot + 1)) | (p & low);
    const b2 = b ^ f;
    let ar = re[b]!;
    let ai = im[b]!;
    let br = re[b2]!;
    let bi = im[b2]!;
    for (let k = 0; k < nt; k++) {
      const sg = popcount32(b & z[k]!) & 1 ? -1 : 1;
      const xr = sg * wr[k]!;
      const xi = sg * wi[k]!;
      const ck = c[k]!;
      const nbr = ck * br + xr * ar - xi * ai;
      const nbi = ck * bi + xr * ai + xi * ar;
      const nar = ck * ar - xr * br - xi * bi;
      const nai = ck * ai - xr * bi + xi * br;
      ar = nar;
      ai = nai;
      br = nbr;
      bi = nbi;
    }
    re[b] = ar;
    im[b] = ai;
    re[b2] = br;
    im[b2] = bi;
  }
}

/** ⟨ψ|H|ψ⟩ (real: H is Hermitian) and ⟨ψ|H²|ψ⟩. */
export interface EnergyMoments {
  first: number;
  second: number;
}

/** Partial sums of Σ_b conj(ψ_b)(Hψ)_b and Σ_b |(Hψ)_b|² over rows lo..hi, gathering each row. */
export function energyMomentsRange(op: FullSpaceOperator, psi: StateVector, lo: number, hi: number): EnergyMoments {
  const { re, im } = psi;
  const { diagonal, flips, termStart, signedStart, baseRe, baseIm, zMasks, phaseRe, phaseIm } = op;
  let first = 0;
  let second = 0;
  for (let b = lo; b < hi; b++) {
    const r = re[b]!;
    const i = im[b]!;
    let hr = diagonal[b]! * r;
    let hi2 = diagonal[b]! * i;
    for (let g = 0; g < flips.length; g++) {
      const col = b ^ flips[g]!;
      let ar = baseRe[g]!;
      let ai = baseIm[g]!;
      for (let t = signedStart[g]!; t < termStart[g + 1]!; t++) {
        if (popcount32(col & zMasks[t]!) & 1) {
          ar -= phaseRe[t]!;
          ai -= phaseIm[t]!;
        } else {
          ar += phaseRe[t]!;
          ai += phaseIm[t]!;
        }
      }
      const vr = re[col]!;
      const vi = im[col]!;
      hr += ar * vr - ai * vi;
      hi2 += ar * vi + ai * vr;
    }
    first += r * hr + i * hi2;
    second += hr * hr + hi2 * hi2;
  }
  return { first, second };
}

/** The kernels on the calling thread. */
export class LocalKernels implements SimKernels {
  constructor(private readonly op: FullSpaceOperator) {}

  applyH(x: StateVector, y: StateVector, alpha: number, beta: number, gamma: number): void {
    applyFullSpace(this.op, x.re, x.im, y.re, y.im, alpha, beta, gamma);
  }
  scaleInPlace(psi: StateVector, cr: number, ci: number): void {
    scaleRange(psi, cr, ci, 0, psi.dim);
  }
  addScaled(psi: StateVector, x: StateVector, cr: number, ci: number): void {
    addScaledRange(psi, x, cr, ci, 0, psi.dim);
  }
  fillPhases(tau: number, cos: Float64Array, sin: Float64Array): void {
    fillPhasesRange(this.op, tau, cos, sin, 0, this.op.dim);
  }
  phaseDiagonal(psi: StateVector, cos: Float64Array, sin: Float64Array): void {
    phaseRange(psi, cos, sin, 0, psi.dim);
  }
  rotateGroup(psi: StateVector, g: number, terms: Int32Array, taus: Float64Array): void {
    rotatePairs(this.op, psi, g, terms, taus, 0, psi.dim / 2);
  }
  energyMoments(psi: StateVector): EnergyMoments {
    return energyMomentsRange(this.op, psi, 0, psi.dim);
  }
  close(): void {}
}
