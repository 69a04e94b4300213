/**
 * Deterministic benchmark inputs: a periodic L×L Heisenberg antiferromagnet and a sample dump
 * clustered around the Néel state, the way a short time evolution from Néel would look.
 * Only node built-ins; the same seed gives byte-identical files.
 */
import { closeSync, mkdirSync, openSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';

export interface BenchCaseOptions {
  /** Lattice side L (qubits = L*L). Ignored when `qubits` is given. */
  side: number;
  /** Exact number of distinct in-sector configurations to write. */
  distinct: number;
  seed: number;
  /** Square number of qubits, e.g. 100 for a 10×10 lattice; overrides `side`. */
  qubits?: number;
}

export interface BenchCase {
  hamiltonian: string;
  samples: string;
  qubits: number;
  /** Hamming weight of the in-sector configurations (N/2, rounded down for odd N). */
  weight: number;
}

/** splitmix32: tiny, fast, and good enough for sampling; fixed so files never drift. */
class Rng {
  private s: number;
  constructor(seed: number) {
    this.s = seed >>> 0;
  }
  u32(): number {
    this.s = (this.s + 0x9e3779b9) >>> 0;
    let z = this.s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return (z ^ (z >>> 16)) >>> 0;
  }
  /** Uniform in [0, 1). */
  float(): number {
    return this.u32() / 4294967296;
  }
  /** Uniform integer in [0, n). */
  int(n: number): number {
    return Math.floor(this.float() * n);
  }
  /** Geometric number of failures before success, success probability p. */
  geom(p: number): number {
    let k = 0;
    while (this.float() >= p && k < 1000) k++;
    return k;
  }
}

/** Nearest-neighbour bonds of the periodic L×L lattice, each once; site (r, c) is r*L + c. */
export function periodicSquareBonds(side: number): Array<[number, number]> {
  const seen = new Set<number>();
  const bonds: Array<[number, number]> = [];
  const n = side * side;
  for (let r = 0; r < side; r++) {
    for (let c = 0; c < side; c++) {
      const a = r * side + c;
      for (const b of [r * side + ((c + 1) % side), ((r + 1) % side) * side + c]) {
        if (a === b) continue; // L = 1
        const lo = Math.min(a, b);
        const hi = Math.max(a, b);
        const key = lo * n + hi; // L = 2 wraps onto the same bond twice
        if (seen.has(key)) continue;
        seen.add(key);
        bonds.push([lo, hi]);
      }
    }
  }
  return bonds;
}

/** Heisenberg Hamiltonian text: `1 X_a X_b`, `1 Y_a Y_b`, `1 Z_a Z_b` per bond. */
export function heisenbergText(side: number): string {
  const n = side * side;
  const lines = [`qubits ${n}`, `# periodic ${side}x${side} Heisenberg antiferromagnet, J = 1, Pauli convention (sigma.sigma)`];
  for (const [a, b] of periodicSquareBonds(side)) {
    lines.push(`1 X${a} X${b}`, `1 Y${a} Y${b}`, `1 Z${a} Z${b}`);
  }
  return lines.join('\n') + '\n';
}

/** log of binomial(n, k), to refuse requests for more distinct states than exist. */
function logBinomial(n: number, k: number): number {
  let s = 0;
  for (let i = 1; i <= k; i++) s += Math.log(n - k + i) - Math.log(i);
  return s;
}

export function writeBenchCase(dir: string, opts: BenchCaseOptions): BenchCase {
  let side = opts.side;
  if (opts.qubits !== undefined) {
    side = Math.round(Math.sqrt(opts.qubits));
    if (side * side !== opts.qubits) throw new Error(`qubits must be a square number, got ${opts.qubits}`);
  }
  if (!Number.isInteger(side) || side < 2) throw new Error(`side must be an integer >= 2, got ${side}`);
  const distinct = opts.distinct;
  if (!Number.isInteger(distinct) || distinct < 1) throw new Error(`distinct must be a positive integer, got ${distinct}`);
  const n = side * side;
  const words = Math.ceil(n / 32);
  const rng = new Rng(opts.seed);

  // Néel checkerboard: site (r, c) is up when r + c is odd.
  const neel = new Uint32Array(words);
  let weight = 0;
  for (let r = 0; r < side; r++) {
    for (let c = 0; c < side; c++) {
      if ((r + c) & 1) {
        const q = r * side + c;
        neel[q >>> 5]! |= 1 << (q & 31);
        weight++;
      }
    }
  }
  if (Math.log(distinct) > logBinomial(n, weight) + 1e-9) {
    throw new Error(`only C(${n}, ${weight}) in-sector configurations exist; ${distinct} requested`);
  }

  const bonds = periodicSquareBonds(side);
  const bondA = Int32Array.from(bonds, (b) => b[0]);
  const bondB = Int32Array.from(bonds, (b) => b[1]);
  const nb = bonds.length;

  // Distinct states packed as `words` Uint32 each, in an open-addressing table (load <= 1/2).
  const states = new Uint32Array(distinct * words);
  const counts = new Uint32Array(distinct);
  let tableBits = 1;
  while (1 << tableBits < 2 * distinct) tableBits++;
  const table = new Int32Array(1 << tableBits); // index + 1, 0 = empty
  const mask = (1 << tableBits) - 1;
  const scratch = new Uint32Array(words);

  const hash = (s: Uint32Array, off: number): number => {
    let h = 0x811c9dc5;
    for (let w = 0; w < words; w++) {
      h = Math.imul(h ^ s[off + w]!, 0x9e3779b1);
      h ^= h >>> 15;
    }
    h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
    h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
    return (h ^ (h >>> 16)) & mask;
  };
  /** Adds scratch if new; returns whether it was added. */
  let size = 0;
  const insert = (): boolean => {
    let slot = hash(scratch, 0);
    for (;;) {
      const e = table[slot]!;
      if (e === 0) break;
      const off = (e - 1) * words;
      let same = true;
      for (let w = 0; w < words; w++) {
        if (states[off + w] !== scratch[w]) {
          same = false;
          break;
        }
      }
      if (same) return false;
      slot = (slot + 1) & mask;
    }
    states.set(scratch, size * words);
    table[slot] = size + 1;
    size++;
    return true;
  };

  // The Néel state itself dominates a short evolution from it.
  scratch.set(neel);
  insert();
  counts[0] = 50 + rng.int(50);

  // Random walks of 1..maxSwaps swaps; deepen when new states get rare (small lattices).
  let maxSwaps = 6;
  let windowTries = 0;
  let windowNew = 0;
  let tries = 0;
  const maxTries = 400 * distinct + 1_000_000;
  while (size < distinct) {
    if (++tries > maxTries) throw new Error(`gave up after ${maxTries} walks with ${size} distinct states`);
    scratch.set(neel);
    const k = 1 + rng.int(maxSwaps);
    for (let t = 0; t < k; t++) {
      // Pick a bond whose two bits differ; swapping them keeps the weight.
      for (let guard = 0; guard < 256; guard++) {
        const j = rng.int(nb);
        const a = bondA[j]!;
        const b = bondB[j]!;
        const ba = (scratch[a >>> 5]! >>> (a & 31)) & 1;
        const bb = (scratch[b >>> 5]! >>> (b & 31)) & 1;
        if (ba !== bb) {
          scratch[a >>> 5]! ^= 1 << (a & 31);
          scratch[b >>> 5]! ^= 1 << (b & 31);
          break;
        }
      }
    }
    const idx = size;
    windowTries++;
    if (insert()) {
      windowNew++;
      // Fewer swaps from Néel = more weight, so near states get larger counts.
      let c = 1 + rng.geom(0.5);
      if (k <= 2) c += 2 * rng.geom(0.3);
      counts[idx] = c;
    }
    if (windowTries === 4096) {
      if (windowNew < 82 && maxSwaps < 4 * n) maxSwaps += 2;
      windowTries = 0;
      windowNew = 0;
    }
  }

  // Some configurations are spread over 2-3 rows; readers must add them up.
  const parts = new Uint8Array(distinct);
  let inRows = 0;
  for (let i = 0; i < distinct; i++) {
    const c = counts[i]!;
    const u = rng.float();
    const p = c >= 3 && u < 0.08 ? 3 : c >= 2 && u < 0.3 ? 2 : 1;
    parts[i] = p;
    inRows += p;
  }
  const offRows = Math.round(0.2 * inRows);
  const totalRows = inRows + offRows;
  const rowId = new Uint32Array(totalRows); // < distinct: in-sector state; else off-sector state
  const rowCount = new Uint32Array(totalRows);
  let r = 0;
  for (let i = 0; i < distinct; i++) {
    let left = counts[i]!;
    for (let p = parts[i]!; p > 1; p--) {
      const take = 1 + rng.int(left - p + 1); // leave at least 1 for each remaining row
      rowId[r] = i;
      rowCount[r++] = take;
      left -= take;
    }
    rowId[r] = i;
    rowCount[r++] = left;
  }
  // Off-sector rows: one bit of a sampled configuration flipped (readout error).
  const offStates = new Uint32Array(offRows * words);
  for (let j = 0; j < offRows; j++) {
    const src = rng.int(distinct) * words;
    const off = j * words;
    for (let w = 0; w < words; w++) offStates[off + w] = states[src + w]!;
    const q = rng.int(n);
    offStates[off + (q >>> 5)]! ^= 1 << (q & 31);
    rowId[r] = distinct + j;
    rowCount[r++] = 1 + rng.geom(0.6);
  }
  // Fisher-Yates over the rows.
  for (let i = totalRows - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    const ti = rowId[i]!;
    rowId[i] = rowId[j]!;
    rowId[j] = ti;
    const tc = rowCount[i]!;
    rowCount[i] = rowCount[j]!;
    rowCount[j] = tc;
  }

  mkdirSync(dir, { recursive: true });
  const hamiltonian = join(dir, 'heisenberg.txt');
  writeFileSync(hamiltonian, heisenbergText(side));
  const samples = join(dir, 'samples.csv');
  writeSamples(samples, n, words, totalRows, rowId, rowCount, distinct, states, offStates);
  return { hamiltonian, samples, qubits: n, weight };
}

/** Streams rows through a 1 MiB buffer; qubit 0 is the rightmost character. */
function writeSamples(
  path: string,
  n: number,
  words: number,
  totalRows: number,
  rowId: Uint32Array,
  rowCount: Uint32Array,
  distinct: number,
  states: Uint32Array,
  offStates: Uint32Array,
): void {
  // 8 characters for each byte value, most significant bit first.
  const chars = new Uint8Array(256 * 8);
  for (let b = 0; b < 256; b++) for (let j = 0; j < 8; j++) chars[b * 8 + j] = (b >> (7 - j)) & 1 ? 49 : 48;
  const fullBytes = n >>> 3;
  const cap = 1 << 20;
  const buf = Buffer.allocUnsafe(cap);
  const maxRow = n + 16;
  const fd = openSync(path, 'w');
  try {
    let pos = buf.write('bitstring,count\n', 0, 'latin1');
    const digits = new Uint8Array(12);
    for (let i = 0; i < totalRows; i++) {
      if (pos + maxRow > cap) {
        writeSync(fd, buf, 0, pos);
        pos = 0;
      }
      const id = rowId[i]!;
      const src = id < distinct ? states : offStates;
      const off = (id < distinct ? id : id - distinct) * words;
      for (let q = n - 1; q >= fullBytes * 8; q--) buf[pos++] = (src[off + (q >>> 5)]! >>> (q & 31)) & 1 ? 49 : 48;
      for (let B = fullBytes - 1; B >= 0; B--) {
        const byte = (src[off + (B >>> 2)]! >>> ((B & 3) * 8)) & 255;
        const t = byte * 8;
        buf[pos] = chars[t]!;
        buf[pos + 1] = chars[t + 1]!;
        buf[pos + 2] = chars[t + 2]!;
        buf[pos + 3] = chars[t + 3]!;
        buf[pos + 4] = chars[t + 4]!;
        buf[pos + 5] = chars[t + 5]!;
        buf[pos + 6] = chars[t + 6]!;
        buf[pos + 7] = chars[t + 7]!;
        pos += 8;
      }
      buf[pos++] = 44; // ','
      let c = rowCount[i]!;
      let d = 0;
      do {
        digits[d++] = 48 + (c % 10);
        c = Math.floor(c / 10);
      } while (c > 0);
      while (d > 0) buf[pos++] = digits[--d]!;
      buf[pos++] = 10;
    }
    if (pos > 0) writeSync(fd, buf, 0, pos);
  } finally {
    closeSync(fd);
  }
}
