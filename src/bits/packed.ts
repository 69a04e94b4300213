/**
 * Bit-packed computational-basis configurations. Qubit q lives in word q >>> 5, bit q & 31, so a
 * configuration of n qubits takes `wordsFor(n)` 32-bit words; unused high bits are always zero.
 */

/** Number of 32-bit words that hold `qubits` bits. */
export function wordsFor(qubits: number): number {
  return Math.max(1, (qubits + 31) >>> 5);
}

/** Population count of a 32-bit integer (SWAR; branch-free). */
export function popcount32(x: number): number {
  x = x - ((x >>> 1) & 0x55555555);
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  x = (x + (x >>> 4)) & 0x0f0f0f0f;
  return Math.imul(x, 0x01010101) >>> 24;
}

/** Hamming weight of the configuration stored at `words[offset .. offset+nWords)`. */
export function weightAt(words: Uint32Array, offset: number, nWords: number): number {
  let w = 0;
  for (let k = 0; k < nWords; k++) w += popcount32(words[offset + k]!);
  return w;
}

/** Hamming weight of `words & mask` at `offset` (mask has nWords words). */
export function maskedWeightAt(words: Uint32Array, offset: number, mask: Uint32Array, nWords: number): number {
  let w = 0;
  for (let k = 0; k < nWords; k++) w += popcount32(words[offset + k]! & mask[k]!);
  return w;
}

/** Mask with qubits lo..hi (inclusive) set. */
export function rangeMask(lo: number, hi: number, nWords: number): Uint32Array {
  const m = new Uint32Array(nWords);
  for (let q = lo; q <= hi; q++) m[q >>> 5]! |= 1 << (q & 31);
  return m;
}

/** Whether the mask selects any qubit at or above `qubits`. */
export function maskExceeds(mask: Uint32Array, qubits: number): boolean {
  for (let k = 0; k < mask.length; k++) {
    const m = mask[k]!;
    if (m === 0) continue;
    const top = k * 32 + 31 - Math.clz32(m);
    if (top >= qubits) return true;
  }
  return false;
}

/**
 * Render a packed configuration as a bitstring. With `qubit0 = 'right'` (the default convention)
 * qubit 0 is the last character, as when the string is read as a binary number.
 */
export function formatBitstring(words: Uint32Array, offset: number, qubits: number, qubit0: 'right' | 'left' = 'right'): string {
  const chars = new Array<string>(qubits);
  for (let q = 0; q < qubits; q++) {
    const bit = (words[offset + (q >>> 5)]! >>> (q & 31)) & 1;
    chars[qubit0 === 'right' ? qubits - 1 - q : q] = bit ? '1' : '0';
  }
  return chars.join('');
}

/**
 * Pack a 0/1 string into `out[offset..]`. Returns -1 on success or the index of the first character
 * that is not 0 or 1 (the caller owns the error message, because it knows the file and line).
 */
export function packBitstring(
  text: string,
  start: number,
  end: number,
  out: Uint32Array,
  offset: number,
  nWords: number,
  qubit0: 'right' | 'left' = 'right',
): number {
  const qubits = end - start;
  for (let k = 0; k < nWords; k++) out[offset + k] = 0;
  for (let i = 0; i < qubits; i++) {
    const c = text.charCodeAt(start + i);
    if (c === 49 /* '1' */) {
      const q = qubit0 === 'right' ? qubits - 1 - i : i;
      out[offset + (q >>> 5)]! |= 1 << (q & 31);
    } else if (c !== 48 /* '0' */) {
      return start + i;
    }
  }
  return -1;
}

/** Compare two packed configurations as unsigned binary numbers (most significant word first). */
export function compareConfigs(a: Uint32Array, ia: number, b: Uint32Array, ib: number, nWords: number): number {
  for (let k = nWords - 1; k >= 0; k--) {
    const x = a[ia + k]!;
    const y = b[ib + k]!;
    if (x !== y) return x < y ? -1 : 1;
  }
  return 0;
}

/** Reverse the qubit order of a configuration in place (used to hint at the other qubit-0 convention). */
export function reverseQubits(words: Uint32Array, offset: number, qubits: number, nWords: number, scratch: Uint32Array): void {
  for (let k = 0; k < nWords; k++) scratch[k] = 0;
  for (let q = 0; q < qubits; q++) {
    if ((words[offset + (q >>> 5)]! >>> (q & 31)) & 1) {
      const r = qubits - 1 - q;
      scratch[r >>> 5]! |= 1 << (r & 31);
    }
  }
  for (let k = 0; k < nWords; k++) words[offset + k] = scratch[k]!;
}
