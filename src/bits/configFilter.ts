/**
 * A blocked Bloom filter over configurations, keyed by a hash that is linear over GF(2):
 * h(a ⊕ m) = h(a) ⊕ h(m). The builder hashes each row once and each flip mask once, so testing
 * "is a ⊕ m sampled?" costs two XORs and one cache line instead of hashing every candidate.
 * A random linear map is a universal hash family (Carter and Wegman), so distinct configurations
 * collide with probability 2^-32 per 32-bit output whatever their structure.
 */

/** Bits of one filter line (one 64-byte cache line). */
const LINE_WORDS = 16;
/** Filter bits per configuration; with three bits per entry this gives about 1% false positives. */
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
  // One random 32-bit image per qubit and output (xorshift128+ style generator, fixed seed).
  let s0 = 0x9e3779b9 | 0;
  let s1 = 0x7f4a7c15 | 0;
  const next = (): number => {
    let x = s0;
    const y = s1;
    s0 = y;
    x ^= x << 23;
    x ^= x >>> 17;
    x ^= y ^ (y >>> 26);
    s1 = x;
    return (s1 + y) >>> 0;
  };
  const bitImage = new Uint32Array(16);
  for (let c = 0; c < chunks; c++) {
    for (let i = 0; i < 16; i++) bitImage[i] = next();
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

/** Words of filter storage for `count` entries (a power-of-two number of 16-word lines). */
export function filterWordsFor(count: number): number {
  let lines = 1;
  while (lines * LINE_WORDS * 32 < count * BITS_PER_ENTRY) lines *= 2;
  return lines * LINE_WORDS;
}

/** Build the filter of `count` configurations stored back to back in `states`. */
export function buildConfigFilter(states: Uint32Array, count: number, nWords: number, filter?: Uint32Array): Uint32Array {
  const f = filter ?? new Uint32Array(filterWordsFor(count));
  f.fill(0);
  const tables = linearHashTables(nWords);
  const lineMask = f.length / LINE_WORDS - 1;
  const h = new Uint32Array(2);
  for (let i = 0; i < count; i++) {
    linearHash(tables, states, i * nWords, nWords, h);
    const line = (h[0]! & lineMask) << 4;
    const h2 = h[1]!;
    f[line + ((h2 >>> 5) & 15)]! |= 1 << (h2 & 31);
    f[line + ((h2 >>> 14) & 15)]! |= 1 << ((h2 >>> 9) & 31);
    f[line + ((h2 >>> 23) & 15)]! |= 1 << ((h2 >>> 18) & 31);
  }
  return f;
}

/** False when the configuration with linear hashes (h1, h2) is certainly not in the filter's set. */
export function filterMayContain(f: Uint32Array, h1: number, h2: number): boolean {
  const line = (h1 & (f.length / LINE_WORDS - 1)) << 4;
  return ((f[line + ((h2 >>> 5) & 15)]! >>> (h2 & 31)) & (f[line + ((h2 >>> 14) & 15)]! >>> ((h2 >>> 9) & 31)) & (f[line + ((h2 >>> 23) & 15)]! >>> ((h2 >>> 18) & 31)) & 1) === 1;
}
