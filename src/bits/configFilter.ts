import { fmix32 } from './hashIndex.js';

/**
 * A blocked Bloom filter over configurations, keyed by a hash that is linear over GF(2):
 * h(a ⊕ m) = h(a) ⊕ h(m). The builder hashes each row once and each flip mask once, so testing
 * "is a ⊕ m sampled?" costs two XORs and one cache line instead of hashing every candidate.
 * A random linear map is a universal hash family (Carter and Wegman), so distinct configurations
 * collide with probability 2^-32 per 32-bit output whatever their structure, provided the map has
 * full rank (checked when the tables are made).
 *
 * Each configuration sets three bits of one 32-bit word (a register-blocked Bloom filter): the word
 * comes from h1, the bits from a non-linear mix of h2 and h1, so a probe is one load, and
 * configurations whose hashes agree on the word's index bits still get unrelated bits.
 */

/** Filter bits per configuration: with three bits per entry in one word, about 1% false positives. */
const BITS_PER_ENTRY = 16;

const tablesByWords = new Map<number, Uint32Array>();

/**
 * Byte tables of the two 32-bit linear hashes for `nWords`-word configurations: entry
 * ((chunk·256 + byte)·2 + j) is hash j of that byte value at that byte position. Fixed seed, so every
 * thread and every run builds the same tables.
 */
export function linearHashTables(nWords: number): Uint32Array {
  let t = tablesByWords.get(nWords);
  if (t) return t;
  const chunks = nWords * 4;
  t = new Uint32Array(chunks * 256 * 2);
  // One random 32-bit image per qubit and output: a counter through the murmur finaliser, which is
  // not linear over GF(2) (an xorshift generator is, and gave images of rank 53 of 64 at 64 qubits,
  // so whole classes of configurations collided). The first 64 qubits' images are kept independent.
  let counter = 0x243f6a88;
  const next = (): number => fmix32((counter = (counter + 0x9e3779b9) | 0));
  const independent = new Gf2Span();
  const bitImage = new Uint32Array(16);
  for (let c = 0; c < chunks; c++) {
    for (let i = 0; i < 8; i++) {
      do {
        bitImage[2 * i] = next();
        bitImage[2 * i + 1] = next();
      } while (c * 8 + i < 64 && !independent.add(bitImage[2 * i]!, bitImage[2 * i + 1]!));
    }
    for (let v = 1; v < 256; v++) {
      const low = 31 - Math.clz32(v & -v);
      const prev = v & (v - 1);
      const at = (c * 256 + v) * 2;
      const from = (c * 256 + prev) * 2;
      t[at] = t[from]! ^ bitImage[2 * low]!;
      t[at + 1] = t[from + 1]! ^ bitImage[2 * low + 1]!;
    }
  }
  tablesByWords.set(nWords, t);
  return t;
}

/** Write the two linear hashes of the configuration at `words[offset..offset+nWords)` to out[0], out[1]. */
export function linearHash(tables: Uint32Array, words: Uint32Array, offset: number, nWords: number, out: Uint32Array): void {
  let h1 = 0;
  let h2 = 0;
  for (let k = 0; k < nWords; k++) {
    const w = words[offset + k]!;
    const base = k << 11;
    const i0 = base | ((w & 0xff) << 1);
    const i1 = base | 512 | (((w >>> 8) & 0xff) << 1);
    const i2 = base | 1024 | (((w >>> 16) & 0xff) << 1);
    const i3 = base | 1536 | ((w >>> 24) << 1);
    h1 ^= tables[i0]! ^ tables[i1]! ^ tables[i2]! ^ tables[i3]!;
    h2 ^= tables[i0 + 1]! ^ tables[i1 + 1]! ^ tables[i2 + 1]! ^ tables[i3 + 1]!;
  }
  out[0] = h1;
  out[1] = h2;
}

/** A span of 64-bit vectors over GF(2) (as two 32-bit halves), kept in echelon form by leading bit. */
class Gf2Span {
  private readonly lo = new Uint32Array(64);
  private readonly hi = new Uint32Array(64);
  private readonly used = new Uint8Array(64);

  /** Add (lo, hi) if it is independent of the span so far; false (and no change) when it is not. */
  add(lo: number, hi: number): boolean {
    for (;;) {
      if (lo === 0 && hi === 0) return false;
      const lead = hi !== 0 ? 63 - Math.clz32(hi) : 31 - Math.clz32(lo);
      if (!this.used[lead]) {
        this.used[lead] = 1;
        this.lo[lead] = lo;
        this.hi[lead] = hi;
        return true;
      }
      lo = (lo ^ this.lo[lead]!) >>> 0;
      hi = (hi ^ this.hi[lead]!) >>> 0;
    }
  }
}

/** Words of filter storage for `count` entries (a power of two). */
export function filterWordsFor(count: number): number {
  let words = 16;
  while (words * 32 < count * BITS_PER_ENTRY) words *= 2;
  return words;
}

/** The three bits of a configuration with linear hashes (h1, h2) within its filter word. */
export function filterBits(h1: number, h2: number): number {
  let m = Math.imul(h2 ^ (h1 >>> 16), 0x85ebca6b);
  m ^= m >>> 15;
  return ((1 << (m & 31)) | (1 << ((m >>> 5) & 31)) | (1 << ((m >>> 10) & 31))) >>> 0;
}

/** Build the filter of `count` configurations stored back to back in `states`. */
export function buildConfigFilter(states: Uint32Array, count: number, nWords: number, filter?: Uint32Array): Uint32Array {
  const f = filter ?? new Uint32Array(filterWordsFor(count));
  f.fill(0);
  const tables = linearHashTables(nWords);
  const wordMask = f.length - 1;
  const h = new Uint32Array(2);
  for (let i = 0; i < count; i++) {
    linearHash(tables, states, i * nWords, nWords, h);
    f[h[0]! & wordMask]! |= filterBits(h[0]!, h[1]!);
  }
  return f;
}

/** False when the configuration with linear hashes (h1, h2) is certainly not in the filter's set. */
export function filterMayContain(f: Uint32Array, h1: number, h2: number): boolean {
  const bits = filterBits(h1, h2);
  return ((f[h1 & (f.length - 1)]! & bits) >>> 0) === bits;
}
