import { projectAndSolveSync } from '../helpers.js';
import { describe, expect, it } from 'vitest';
import { makeBasis } from '../../src/bits/basis.js';
import { PauliSumBuilder } from '../../src/operators/pauliSum.js';
import { expandOnce, expandSubspace } from '../../src/pipeline/expand.js';
import { densePauliSum, weightIndices } from '../reference.js';

type Op = 'X' | 'Y' | 'Z';
const n = 6;
// Open XXZ chain plus a Y-Y term: complex-free but with sign structure, conserving the weight.
const terms: Array<{ coeff: number; ops: Array<[Op, number]> }> = [];
for (let i = 0; i + 1 < n; i++) {
  terms.push({ coeff: 0.5, ops: [['X', i], ['X', i + 1]] }, { coeff: 0.5, ops: [['Y', i], ['Y', i + 1]] }, { coeff: 0.8, ops: [['Z', i], ['Z', i + 1]] });
}
function hamiltonian() {
  const b = new PauliSumBuilder(n);
  for (const t of terms) b.add(t.coeff, t.ops);
  return b.finish(true);
}

describe('expandOnce', () => {
  it('expandOnce adds exactly the sector configurations connected by a nonzero dense matrix element', () => {
    // Reference: the nonzero pattern of the dense Kronecker-product matrix (tests/reference.ts).
    const h = hamiltonian();
    const dense = densePauliSum(n, terms);
    const seed = [0b000111, 0b101010];
    const basis = makeBasis(n, 1, Uint32Array.from(seed), seed.length, Float64Array.from([5, 3]));
    const sector = { weights: [{ lo: 0, hi: -1, weight: 3 }] };
    const r = expandOnce(h, basis, sector, {});
    const expected = new Set<number>(seed);
    for (const b of seed) for (let a = 0; a < 2 ** n; a++) if (dense.re[a * dense.n + b] !== 0 || dense.im[a * dense.n + b] !== 0) expected.add(a);
    const got = new Set(Array.from(r.basis.states));
    expect([...got].sort((a, b) => a - b)).toEqual([...expected].sort((a, b) => a - b));
    expect(r.added).toBe(expected.size - seed.length);
    // Added configurations carry zero sampled count; sampled ones keep theirs.
    const counts = new Map(Array.from(r.basis.states).map((s, i) => [s, r.basis.counts[i]!]));
    expect(counts.get(0b000111)).toBe(5);
    expect([...counts.entries()].filter(([s]) => !seed.includes(s)).every(([, c]) => c === 0)).toBe(true);
  });

  it('expandSubspace by importance keeps at most --expand-max per step and never raises the energy (interlacing)', async () => {
    // Cauchy interlacing (common practice): enlarging the subspace cannot raise the lowest Ritz value.
    const h = hamiltonian();
    const sector = { weights: [{ lo: 0, hi: -1, weight: 3 }] };
    const seed = [0b010101];
    let basis = makeBasis(n, 1, Uint32Array.from(seed), 1, Float64Array.of(1));
    const lowestOf = (b: typeof basis) => {
      const p = projectAndSolveSync(h, b, sector, { tol: 1e-12 });
      return { energy: p.eigen.values[0]!, psi: p.eigen.vectors[0]! };
    };
    let prev = lowestOf(basis).energy;
    for (let step = 0; step < 4; step++) {
      const out = await expandSubspace(h, basis, sector, { steps: 1, max: 3 }, async (b) => lowestOf(b));
      expect(out.report.mode).toBe('importance');
      expect(out.basis.dim - basis.dim).toBeLessThanOrEqual(3);
      basis = out.basis;
      const e = lowestOf(basis).energy;
      expect(e).toBeLessThanOrEqual(prev + 1e-10);
      prev = e;
    }
    // The whole weight-3 sector is C(6,3) = 20; repeated connected steps reach all of it.
    const full = await expandSubspace(h, makeBasis(n, 1, Uint32Array.from(seed), 1), sector, { steps: 10 }, async (b) => lowestOf(b));
    expect(full.basis.dim).toBe(weightIndices(n, 3).length);
  });
});
