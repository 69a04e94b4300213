/**
 * Copying a run of qubits between packed configurations, e.g. the spin-up register (qubits
 * 0..M−1) and the spin-down register (qubits M..2M−1) of a Jordan–Wigner determinant.
 */

/**
 * Copy qubits lo..lo+count−1 of `src[srcOffset..]` to qubits 0..count−1 of `dst[dstOffset ..
 * dstOffset+dstWords)`; the higher bits of the destination are cleared.
 */
export function extractBits(src: Uint32Array, srcOffset: number, srcWords: number, lo: number, count: number, dst: Uint32Array, dstOffset: number, dstWords: number): void {
  const shift = lo & 31;
  const first = lo >>> 5;
  for (let k = 0; k < dstWords; k++) {
    const w = first + k;
    let v = w < srcWords ? src[srcOffset + w]! >>> shift : 0;
    if (shift !== 0 && w + 1 < srcWords) v |= src[srcOffset + w + 1]! << (32 - shift);
    const left = count - 32 * k;
    if (left <= 0) v = 0;
    else if (left < 32) v &= (1 << left) - 1;
    dst[dstOffset + k] = v >>> 0;
  }
}

/** OR qubits 0..count−1 of `src[srcOffset..]` into qubits lo..lo+count−1 of `dst[dstOffset..]`. */
export function depositBits(src: Uint32Array, srcOffset: number, count: number, dst: Uint32Array, dstOffset: number, lo: number): void {
  for (let q = 0; q < count; q++) {
    if ((src[srcOffset + (q >>> 5)]! >>> (q & 31)) & 1) {
      const t = lo + q;
      dst[dstOffset + (t >>> 5)]! |= 1 << (t & 31);
    }
  }
}
