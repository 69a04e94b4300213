import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { makeBasis } from '../../src/bits/basis.js';
import { wordsFor } from '../../src/bits/packed.js';
import { applyUpperRows, buildProjectedHamiltonian, sectorFlipTest } from '../../src/build/projectedHamiltonian.js';
import { filterOrder, rowScanPlan } from '../../src/build/rowScan.js';
import { toDense } from '../../src/build/sparseMatrix.js';
import { groupByFlipMask, PauliSumBuilder } from '../../src/operators/pauliSum.js';
import { compileSector, type Sector } from '../../src/sectors/sector.js';
import { seededUniform } from '../../src/util/random.js';
import { pauliStringElement } from '../reference.js';

type Op = 'X' | 'Y' | 'Z';

/**
 * Registers of 33–70 qubits, terms on qubits next to word boundaries (31/32, 63/64) and elsewhere,
 * sectors with none, one or two weight constraints, and sampled configurations that respect them:
 * the cases the row scan handles by its shortcuts (pooled two-qubit Z terms, one-word two-qubit
 * flips) and by its general path (flips across words, longer strings).
 */
const caseArb = fc.record({
  n: fc.integer({ min: 33, max: 70 }),
  split: fc.integer({ min: 1, max: 32 }),
  constraints: fc.constantFrom(0, 1, 2),
  seed: fc.integer({ min: 1, max: 1e9 }),
  terms: fc.array(
    fc.record({
      coeff: fc.double({ min: -2, max: 2, noNaN: true }),
      ops: fc.array(fc.tuple(fc.constantFrom<Op>('X', 'Y', 'Z'), fc.constantFrom(0, 1, 2, 30, 31, 32, 33, 40, 62, 63, 64, 65, 69)), { minLength: 1, maxLength: 4 }),
    }),
    { minLength: 1, maxLength: 14 },
  ),
});

function setUp(c: fc.RecordValue<typeof caseArb> extends infer T ? T : never) {
  const { n } = c;
  const nWords = wordsFor(n);
  const rng = seededUniform(c.seed);
  const b = new PauliSumBuilder(n);
  const terms: Array<{ coeff: number; ops: Array<[Op, number]> }> = [];
  for (const t of c.terms) {
    const seen = new Set<number>();
    const ops = t.ops.filter(([, q]) => q < n && !seen.has(q) && (seen.add(q), true));
    if (ops.length === 0) continue;
    b.add(t.coeff, ops);
    terms.push({ coeff: t.coeff, ops });
  }
  // Also a Heisenberg-like bond pattern so same-word pairs occur in every case.
  for (const [i, j] of [[0, 1], [5, 9], [31, 32], [30, 31]] as const) {
    for (const op of ['X', 'Y', 'Z'] as const) {
      b.add(0.75, [[op, i], [op, j]]);
      terms.push({ coeff: 0.75, ops: [[op, i], [op, j]] });
    }
  }
  const h = b.finish(true);
  const split = Math.min(c.split, n - 1);
  const first = Array.from({ length: n }, () => (rng.next() < 0.5 ? 1 : 0));
  const count = (bits: number[], lo: number, hi: number): number => bits.slice(lo, hi + 1).reduce((s, v) => s + v, 0);
  const sector: Sector =
    c.constraints === 0 ? { weights: [] }
    : c.constraints === 1 ? { weights: [{ lo: 0, hi: -1, weight: count(first, 0, n - 1) }] }
    : { weights: [{ lo: 0, hi: split - 1, weight: count(first, 0, split - 1) }, { lo: split, hi: n - 1, weight: count(first, split, n - 1) }] };
  // Swaps inside [0, split) or [split, n) keep every constraint; flips are fine without any.
  const configs = new Map<string, number[]>();
  let cur = first.slice();
  for (let s = 0; s < 400 && configs.size < 48; s++) {
    configs.set(cur.join(''), cur.slice());
    cur = cur.slice();
    if (c.constraints === 0) cur[Math.floor(rng.next() * n)]! ^= 1;
    else {
      const [lo, hi] = rng.next() < 0.5 ? [0, split] : [split, n];
      const p = lo + Math.floor(rng.next() * (hi - lo));
      const q = lo + Math.floor(rng.next() * (hi - lo));
      [cur[p], cur[q]] = [cur[q]!, cur[p]!];
    }
  }
  const list = [...configs.values()];
  const states = new Uint32Array(list.length * nWords);
  list.forEach((bits, i) => bits.forEach((v, q) => v && (states[i * nWords + (q >>> 5)]! |= 1 << (q & 31))));
  const basis = makeBasis(n, nWords, states, list.length);
  const sorted = Array.from({ length: basis.dim }, (_, i) => Array.from({ length: n }, (_, q) => (basis.states[i * nWords + (q >>> 5)]! >>> (q & 31)) & 1));
  const groups = groupByFlipMask(h, nWords);
  const compiled = compileSector(sector, n, nWords);
  return { h, terms, basis, sorted, groups, compiled };
}

describe('rowScan', () => {
  it('buildProjectedHamiltonian equals the textbook matrix elements on multi-word registers and sectors', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const { terms, basis, sorted, groups, compiled } = setUp(c);
        const m = toDense(buildProjectedHamiltonian(basis, groups, compiled));
        const d = basis.dim;
        for (let i = 0; i < d; i++)
          for (let j = 0; j < d; j++) {
            let re = 0;
            let im = 0;
            for (const t of terms) {
              const [r, s] = pauliStringElement(sorted[i]!, sorted[j]!, t.coeff, t.ops);
              re += r;
              im += s;
            }
            // Reference: single-qubit Pauli matrices (textbook definitions, common practice).
            expect(Math.abs(m.re[i * d + j]! - re)).toBeLessThan(1e-12);
            expect(Math.abs(m.im[i * d + j]! - im)).toBeLessThan(1e-12);
          }
      }),
      { numRuns: 60, seed: 4242 },
    );
  });

  it('applyUpperRows (matrix-free) gives the same product as the stored matrix', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const { basis, groups, compiled } = setUp(c);
        const plan = rowScanPlan(groups, sectorFlipTest(groups, compiled));
        const m = toDense(buildProjectedHamiltonian(basis, groups, compiled));
        const d = basis.dim;
        const w = groups.complex ? 2 : 1;
        const rng = seededUniform(c.seed + 1);
        const x = Float64Array.from({ length: w * d }, () => rng.next() - 0.5);
        const y = new Float64Array(w * d);
        // Half the cases scan rows in filter order, the order large matrix-free products use.
        const rows = c.seed % 2 === 0 ? filterOrder(basis) : undefined;
        if (rows) expect(Array.from(rows).sort((a, b) => a - b)).toEqual(Array.from({ length: d }, (_, i) => i));
        applyUpperRows(basis, plan, 0, d, x, y, rows);
        for (let i = 0; i < d; i++) {
          let re = 0;
          let im = 0;
          for (let j = 0; j < d; j++) {
            const xr = x[w * j]!;
            const xi = w === 2 ? x[w * j + 1]! : 0;
            re += m.re[i * d + j]! * xr - m.im[i * d + j]! * xi;
            im += m.re[i * d + j]! * xi + m.im[i * d + j]! * xr;
          }
          expect(Math.abs(y[w * i]! - re)).toBeLessThan(1e-10);
          if (w === 2) expect(Math.abs(y[w * i + 1]! - im)).toBeLessThan(1e-10);
        }
      }),
      { numRuns: 40, seed: 99 },
    );
  });
});
