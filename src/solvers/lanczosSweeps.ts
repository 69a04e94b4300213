/**
 * The vector sweeps of one Lanczos step, over an element range [i0, i1) so a team of threads can
 * split them (complex vectors are interleaved and swept as real arrays: α and β are real for a
 * Hermitian operator). `LanczosSweeps` runs them over whole vectors, on this thread or on a team.
 */

/** Σ v·w into out[at] and Σ v·vPrev into out[at+1] over [i0, i1). */
export function stepDotsRange(v: Float64Array, w: Float64Array, vPrev: Float64Array, i0: number, i1: number, out: Float64Array, at: number): void {
  let vw = 0;
  let vp = 0;
  for (let i = i0; i < i1; i++) {
    const vi = v[i]!;
    vw += vi * w[i]!;
    vp += vi * vPrev[i]!;
  }
  out[at] = vw;
  out[at + 1] = vp;
}

/** w ← w − a·v − b·vPrev over [i0, i1); returns Σ w² there. */
export function stepUpdateRange(v: Float64Array, vPrev: Float64Array, w: Float64Array, a: number, b: number, i0: number, i1: number): number {
  let ss = 0;
  for (let i = i0; i < i1; i++) {
    const wi = w[i]! - a * v[i]! - b * vPrev[i]!;
    w[i] = wi;
    ss += wi * wi;
  }
  return ss;
}

/** w ← s·w over [i0, i1). */
export function scaleRange(w: Float64Array, s: number, i0: number, i1: number): void {
  for (let i = i0; i < i1; i++) w[i]! *= s;
}

/** The replayed step over [i0, i1): x += yj·v, then w ← (w − a·v − b·vPrev)·inv. */
export function replayRange(v: Float64Array, vPrev: Float64Array, w: Float64Array, x: Float64Array, a: number, b: number, inv: number, yj: number, i0: number, i1: number): void {
  for (let i = i0; i < i1; i++) {
    const vi = v[i]!;
    x[i]! += yj * vi;
    w[i] = (w[i]! - a * vi - b * vPrev[i]!) * inv;
  }
}

/** The sweeps of two-pass Lanczos over whole vectors. */
export interface LanczosSweeps {
  /** [Σ v·w, Σ v·vPrev]. */
  dots(v: Float64Array, w: Float64Array, vPrev: Float64Array): [number, number];
  /** w ← w − a·v − b·vPrev; returns ‖w‖². */
  update(v: Float64Array, vPrev: Float64Array, w: Float64Array, a: number, b: number): number;
  scale(w: Float64Array, s: number): void;
  replay(v: Float64Array, vPrev: Float64Array, w: Float64Array, x: Float64Array, a: number, b: number, inv: number, yj: number): void;
}

/** The sweeps on this thread. */
export const localSweeps: LanczosSweeps = {
  dots(v, w, vPrev) {
    const out = new Float64Array(2);
    stepDotsRange(v, w, vPrev, 0, v.length, out, 0);
    return [out[0]!, out[1]!];
  },
  update: (v, vPrev, w, a, b) => stepUpdateRange(v, vPrev, w, a, b, 0, v.length),
  scale: (w, s) => scaleRange(w, s, 0, w.length),
  replay: (v, vPrev, w, x, a, b, inv, yj) => replayRange(v, vPrev, w, x, a, b, inv, yj, 0, v.length),
};
