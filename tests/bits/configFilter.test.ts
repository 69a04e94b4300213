import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildConfigFilter, filterMayContain, filterWordsFor, linearHash, linearHashTables } from '../../src/bits/configFilter.js';
import { seededUniform } from '../../src/util/random.js';

function hashOf(tables: Uint32Array, words: Uint32Array, nWords: number): [number, number] {
  const h = new Uint32Array(2);
  linearHash(tables, words, 0, nWords, h);
  return [h[0]!, h[1]!];
}

/** Rank over GF(2) of 64-bit rows, by textbook Gaussian elimination on BigInts (independent of the code under test). */
function gf2Rank(rows: bigint[]): number {
  const m = rows.slice();
  let rank = 0;
  for (let bit = 63; bit >= 0; bit--) {
    const b = 1n << BigInt(bit);
    const pivot = m.findIndex((v, i) => i >= rank && (v & b) !== 0n);
    if (pivot < 0) continue;
    [m[rank], m[pivot]] = [m[pivot]!, m[rank]!];
    for (let i = 0; i < m.length; i++) if (i !== rank && (m[i]! & b) !== 0n) m[i] = m[i]! ^ m[rank]!;
    rank++;
  }
  return rank;
}

/** Néel-like configurations on `n` qubits with a few random neighbour swaps (the shape of time-evolved samples). */
function clusteredConfigs(n: number, count: number, seed: number): Uint32Array[] {
  const rng = seededUniform(seed);
  const nWords = Math.ceil(n / 32);
  const seen = new Set<string>();
  const out: Uint32Array[] = [];
  while (out.length < count) {
    const bits = Array.from({ length: n }, (_, q) => (q + (rng.next() < 0.5 ? 0 : 1)) & 1);
    const swaps = 1 + Math.floor(rng.next() * 6);
    for (let s = 0; s < swaps; s++) {
      const q = Math.floor(rng.next() * (n - 1));
      [bits[q], bits[q + 1]] = [bits[q + 1]!, bits[q]!];
    }
    const key = bits.join('');
    if (seen.has(key)) continue;
    seen.add(key);
    const w = new Uint32Array(nWords);
    bits.forEach((v, q) => v && (w[q >>> 5]! |= 1 << (q & 31)));
    out.push(w);
  }
  return out;
}

describe('linear hash', () => {
  it('is linear over GF(2): h(a ⊕ m) = h(a) ⊕ h(m) (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 4 }).chain((n) => fc.tuple(fc.constant(n), fc.uint32Array({ minLength: n, maxLength: n }), fc.uint32Array({ minLength: n, maxLength: n }))), ([nWords, a, m]) => {
        const t = linearHashTables(nWords);
        const x = Uint32Array.from(a, (v, k) => v ^ m[k]!);
        const [ha1, ha2] = hashOf(t, a, nWords);
        const [hm1, hm2] = hashOf(t, m, nWords);
        const [hx1, hx2] = hashOf(t, x, nWords);
        expect(hx1).toBe((ha1 ^ hm1) >>> 0);
        expect(hx2).toBe((ha2 ^ hm2) >>> 0);
      }),
      { seed: 5, numRuns: 200 },
    );
  });

  it('maps the first 64 qubits with full rank, so no two configurations that differ only there share both hashes', () => {
    // A rank-deficient map sends whole cosets of configurations to one hash, and the filter's
    // false positives then repeat systematically; rank computed independently of the tables' own check.
    for (const nWords of [2, 3, 4]) {
      const t = linearHashTables(nWords);
      const rows: bigint[] = [];
      for (let q = 0; q < 64; q++) {
        const unit = new Uint32Array(nWords);
        unit[q >>> 5] = 1 << (q & 31);
        const [h1, h2] = hashOf(t, unit, nWords);
        rows.push((BigInt(h2) << 32n) | BigInt(h1));
      }
      expect(gf2Rank(rows)).toBe(64);
    }
  });
});

describe('configuration filter', () => {
  it('never rejects a configuration it holds (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 4 }).chain((n) => fc.tuple(fc.constant(n), fc.uint32Array({ minLength: n, maxLength: 300 * n }))), ([nWords, raw]) => {
        const count = Math.floor(raw.length / nWords);
        const states = raw.slice(0, count * nWords);
        const f = buildConfigFilter(states, count, nWords);
        const t = linearHashTables(nWords);
        for (let i = 0; i < count; i++) {
          const [h1, h2] = hashOf(t, states.subarray(i * nWords, (i + 1) * nWords), nWords);
          expect(filterMayContain(f, h1, h2)).toBe(true);
        }
      }),
      { seed: 9, numRuns: 100 },
    );
  });

  it('has a false-positive rate near the blocked-Bloom formula on clustered configurations and their neighbours', () => {
    const n = 64;
    const nWords = 2;
    const configs = clusteredConfigs(n, 20000, 3);
    const states = new Uint32Array(configs.length * nWords);
    configs.forEach((c, i) => states.set(c, i * nWords));
    const f = buildConfigFilter(states, configs.length, nWords);
    const members = new Set(configs.map((c) => c.join(',')));
    const t = linearHashTables(nWords);
    // Probe the configurations a Hamiltonian would reach: every neighbour swap of every member.
    let probes = 0;
    let falsePositives = 0;
    for (const c of configs) {
      for (let q = 0; q < n - 1; q++) {
        const b = c.slice();
        b[q >>> 5]! ^= 1 << (q & 31);
        b[(q + 1) >>> 5]! ^= 1 << ((q + 1) & 31);
        if (members.has(b.join(','))) continue;
        probes++;
        const [h1, h2] = hashOf(t, b, nWords);
        if (filterMayContain(f, h1, h2)) falsePositives++;
      }
    }
    // Expected rate of a filter whose entries each set 3 bits of one 32-bit word (Putze, Sanders and
    // Singler 2007, blocked Bloom filters; formula from memory): Σ_i Poisson(i; λ)·(1 − (1 − 1/32)^{3i})^3
    // with λ entries per word. Verified below against a simulated filter with truly random positions.
    const words = filterWordsFor(configs.length);
    const lambda = configs.length / words;
    let expected = 0;
    let poisson = Math.exp(-lambda);
    for (let i = 0; i < 60; i++) {
      expected += poisson * (1 - (31 / 32) ** (3 * i)) ** 3;
      poisson *= lambda / (i + 1);
    }
    const rng = seededUniform(17);
    const ideal = new Uint32Array(words);
    const randomEntry = (): [number, number] => {
      const w = Math.floor(rng.next() * words);
      let bits = 0;
      for (let k = 0; k < 3; k++) bits |= 1 << Math.floor(rng.next() * 32);
      return [w, bits >>> 0];
    };
    for (let i = 0; i < configs.length; i++) {
      const [w, bits] = randomEntry();
      ideal[w]! |= bits;
    }
    let idealHits = 0;
    const idealProbes = 400000;
    for (let i = 0; i < idealProbes; i++) {
      const [w, bits] = randomEntry();
      if (((ideal[w]! & bits) >>> 0) === bits) idealHits++;
    }
    expect(Math.abs(idealHits / idealProbes - expected)).toBeLessThan(0.2 * expected);
    const rate = falsePositives / probes;
    expect(probes).toBeGreaterThan(500000);
    expect(rate).toBeLessThan(2 * expected);
    expect(rate).toBeGreaterThan(expected / 4);
  });
});
