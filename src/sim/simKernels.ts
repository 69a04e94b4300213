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

/** Signed terms up to which a group's rotations are folded into one 2×2 matrix per sign pattern. */
const MAX_TABLE_TERMS = 6;

/**
 * The rotations e^{−iτ_k c_k P_k} of group g on pairs p0..p1. Pair p is (b, b ⊕ f) with b = p with a
 * zero bit inserted at the highest flipped qubit, so every pair is visited once. On a pair,
 * e^{−iθP} is [[cos θ, −w̄], [w, cos θ]] with w = −i·sin θ·ν·(−1)^{popcount(b & z)} and ν = i^{#Y}.
 * The product over the group depends on b only through the signs of its terms with z ≠ 0, so it is
 * tabulated once per sign pattern and each pair costs one 2×2 complex product.
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
  const signed: number[] = [];
  for (let k = 0; k < nt; k++) {
    const t = terms[k]!;
    z[k] = op.zMasks[t]!;
    if (z[k] !== 0) signed.push(z[k]!);
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
  // Distinct signed masks index the pattern (a mask repeated in the group shares one bit).
  const masks = [...new Set(signed)];
  if (masks.length > MAX_TABLE_TERMS) {
    rotatePairsTermwise(psi, f, z, c, wr, wi, p0, p1);
    return;
  }
  // table[pattern] = 2×2 complex matrix (m00, m01, m10, m11 as re, im pairs).
  const patterns = 1 << masks.length;
  const table = new Float64Array(patterns * 8);
  for (let pat = 0; pat < patterns; pat++) {
    let m = [1, 0, 0, 0, 0, 0, 1, 0];
    for (let k = 0; k < nt; k++) {
      const bit = z[k] === 0 ? 0 : (pat >>> masks.indexOf(z[k]!)) & 1;
      const sg = bit ? -1 : 1;
      const xr = sg * wr[k]!;
      const xi = sg * wi[k]!;
      const ck = c[k]!;
      // U = [[c, −w̄], [w, c]], m ← U·m.
      const u = [ck, 0, -xr, xi, xr, xi, ck, 0];
      m = mul2(u, m);
    }
    table.set(m, pat * 8);
  }
  const nm = masks.length;
  const zm = Int32Array.from(masks);
  for (let p = p0; p < p1; p++) {
    const b = ((p >>> pivot) << (pivot + 1)) | (p & low);
    const b2 = b ^ f;
    let pat = 0;
    for (let k = 0; k < nm; k++) pat |= (popcount32(b & zm[k]!) & 1) << k;
    const o = pat * 8;
    const ar = re[b]!;
    const ai = im[b]!;
    const br = re[b2]!;
    const bi = im[b2]!;
    const m00r = table[o]!;
    const m00i = table[o + 1]!;
    const m01r = table[o + 2]!;
    const m01i = table[o + 3]!;
    const m10r = table[o + 4]!;
    const m10i = table[o + 5]!;
    const m11r = table[o + 6]!;
    const m11i = table[o + 7]!;
    re[b] = m00r * ar - m00i * ai + m01r * br - m01i * bi;
    im[b] = m00r * ai + m00i * ar + m01r * bi + m01i * br;
    re[b2] = m10r * ar - m10i * ai + m11r * br - m11i * bi;
    im[b2] = m10r * ai + m10i * ar + m11r * bi + m11i * br;
  }
}

/** 2×2 complex product u·m, both as [m00, m01, m10, m11] (re, im) pairs. */
function mul2(u: number[], m: number[]): number[] {
  const out = new Array<number>(8);
  for (let i = 0; i < 2; i++) {
    for (let j = 0; j < 2; j++) {
      let r = 0;
      let s = 0;
      for (let k = 0; k < 2; k++) {
        const a = (i * 2 + k) * 2;
        const b = (k * 2 + j) * 2;
        r += u[a]! * m[b]! - u[a + 1]! * m[b + 1]!;
        s += u[a]! * m[b + 1]! + u[a + 1]! * m[b]!;
      }
      out[(i * 2 + j) * 2] = r;
      out[(i * 2 + j) * 2 + 1] = s;
    }
  }
  return out;
}

/** The rotations term after term, for groups with too many sign patterns to tabulate. */
function rotatePairsTermwise(psi: StateVector, f: number, z: Int32Array, c: Float64Array, wr: Float64Array, wi: Float64Array, p0: number, p1: number): void {
  const { re, im } = psi;
  const pivot = 31 - Math.clz32(f);
  const low = (1 << pivot) - 1;
  const nt = z.length;
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
