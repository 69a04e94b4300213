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

/** Rows per block of a fused replay: the block's H v stays in L1 between the product and the update. */
export const REPLAY_BLOCK = 256;

/**
 * The replayed step fused with its product, over rows [r0, r1) of `width` doubles each (2 when
 * complex): `rowsInto(y, rb, re)` writes (H v) of rows rb..re into y from index 0, then
 * x += yj·v and vPrev ← (H v − a·v − b·vPrev)·inv there, with the arithmetic of `replayRange`.
 * vPrev is overwritten in place (a row's update reads only its own entries of it, and products
 * gather only from v), so the step holds no w. `scratch`: REPLAY_BLOCK·width doubles.
 */
export function replayFusedRange(
  rowsInto: (y: Float64Array, rb: number, re: number) => void,
  width: number,
  v: Float64Array,
  vPrev: Float64Array,
  x: Float64Array,
  a: number,
  b: number,
  inv: number,
  yj: number,
  r0: number,
  r1: number,
  scratch: Float64Array,
): void {
  for (let rb = r0; rb < r1; rb += REPLAY_BLOCK) {
    const re = Math.min(r1, rb + REPLAY_BLOCK);
    rowsInto(scratch, rb, re);
    const i0 = width * rb;
    for (let i = i0, end = width * re; i < end; i++) {
      const vi = v[i]!;
      x[i]! += yj * vi;
      vPrev[i] = (scratch[i - i0]! - a * vi - b * vPrev[i]!) * inv;
    }
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
