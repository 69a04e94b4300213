import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { makeBasis } from '../../src/bits/basis.js';
import { buildDeterminantRows, determinantNonzeroBound, pieceMatrix, prepareDeterminants } from '../../src/build/determinantHamiltonian.js';
import { applyDeterminantRows } from '../../src/build/determinantOperator.js';
import { joinRowPieces, toDense } from '../../src/build/sparseMatrix.js';
import { popcount32 } from '../../src/bits/packed.js';
import { denseHamiltonian, randomIntegrals } from '../denseFermions.js';
import { seededUniform } from '../../src/util/random.js';

/** All 2M-qubit configurations with `na` spin-up and `nb` spin-down electrons. */
function sector(m: number, na: number, nb: number): number[] {
  const out: number[] = [];
  const low = (1 << m) - 1;
  for (let x = 0; x < 1 << (2 * m); x++) if (popcount32(x & low) === na && popcount32(x >>> m) === nb) out.push(x);
  return out;
}

function basisOf(configs: number[], qubits: number) {
  return makeBasis(qubits, 1, Uint32Array.from(configs), configs.length);
}

describe('buildDeterminantHamiltonian', () => {
  // Reference: the dense second-quantised Hamiltonian from JW annihilation operators (ml-matrix),
  // restricted to the same determinants; every Slater–Condon element must agree.
  const cases: Array<[number, number, number, number]> = [
    [3, 1, 1, 11],
    [3, 2, 1, 12],
    [3, 2, 2, 13],
    [3, 1, 2, 14],
    [4, 2, 2, 16],
    [4, 3, 2, 17],
    [3, 3, 1, 15],
  ];
  for (const [m, na, nb, seed] of cases) {
    it(`buildDeterminantHamiltonian matches the dense second-quantised H, M=${m}, ${na}+${nb} electrons, random integrals (seed ${seed})`, () => {
      const ints = randomIntegrals(m, seed);
      const configs = sector(m, na, nb);
      const dense = denseHamiltonian(ints, configs);
      const at = new Map(configs.map((x, i) => [x, i]));
      const rng = seededUniform(seed);
      // A random subset (at least two) exercises the skip-when-absent path; the full sector the product path.
      // The full sector takes the product path; a random subset the sampled path, once walking the
      // rows that share a string and once probing the pair hash.
      const part = configs.filter(() => rng.next() < 0.6);
      for (const [subset, scanFactor] of [[configs, 4], [part, 1e9], [part, 0]] as const) {
        if (subset.length < 1) continue;
        const basis = basisOf(subset, 2 * m);
        const h = pieceMatrix(basis.dim, buildDeterminantRows(prepareDeterminants(basis, ints, { scanFactor }), 0, basis.dim));
        const { re } = toDense(h);
        const n = basis.dim;
        for (let r = 0; r < n; r++) {
          for (let c = 0; c < n; c++) {
            const want = dense.get(at.get(basis.states[r]!)!, at.get(basis.states[c]!)!);
            const got = re[r * n + c]!;
            if (Math.abs(got - want) > 1e-12) throw new Error(`element ${basis.states[r]!.toString(2)},${basis.states[c]!.toString(2)}: ${got} vs ${want}`);
          }
        }
        // Hermiticity (real symmetric) of what we stored.
        for (let r = 0; r < n; r++) for (let c = 0; c < r; c++) expect(Math.abs(re[r * n + c]! - re[c * n + r]!)).toBeLessThan(1e-13);
      }
    });
  }

  it('buildDeterminantHamiltonian: the dense reference itself conserves spin-up and spin-down electron counts', () => {
    // Property of the construction (common practice): H commutes with N_up and N_down.
    const m = 2;
    const dense = denseHamiltonian(randomIntegrals(m, 3));
    expect(dense.rows).toBe(16);
    const low = (1 << m) - 1;
    for (let i = 0; i < 16; i++) {
      for (let j = 0; j < 16; j++) {
        if (dense.get(i, j) === 0) continue;
        expect(popcount32(i & low)).toBe(popcount32(j & low));
        expect(popcount32(i >>> m)).toBe(popcount32(j >>> m));
      }
    }
  });
});

describe('buildDeterminantRows', () => {
  it('buildDeterminantRows: any split into row ranges joins to the same matrix; the matrix-free apply agrees', () => {
    const m = 4;
    const ints = randomIntegrals(m, 21);
    const configs = sector(m, 2, 2);
    const rng = seededUniform(5);
    const subset = configs.filter(() => rng.next() < 0.7);
    const basis = basisOf(subset, 2 * m);
    const ctx = prepareDeterminants(basis, ints, { scanFactor: 1 });
    const whole = joinRowPieces(basis.dim, false, [buildDeterminantRows(ctx, 0, basis.dim)]);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: basis.dim - 1 }), { maxLength: 4 }), (cutsRaw) => {
        const cuts = [0, ...new Set(cutsRaw)].sort((a, b) => a - b);
        cuts.push(basis.dim);
        const pieces = cuts.slice(0, -1).map((c, i) => buildDeterminantRows(ctx, c, cuts[i + 1]!));
        const joined = joinRowPieces(basis.dim, false, pieces);
        expect(Array.from(joined.rowPtr)).toEqual(Array.from(whole.rowPtr));
        expect(Array.from(joined.cols)).toEqual(Array.from(whole.cols));
        expect(Array.from(joined.values)).toEqual(Array.from(whole.values));
      }),
      { seed: 7, numRuns: 20 },
    );
    const x = new Float64Array(basis.dim).map(() => rng.next() - 0.5);
    const y = new Float64Array(basis.dim);
    applyDeterminantRows(ctx, x, y, 0, basis.dim);
    const { re } = toDense(whole);
    for (let r = 0; r < basis.dim; r++) {
      let s = 0;
      for (let c = 0; c < basis.dim; c++) s += re[r * basis.dim + c]! * x[c]!;
      expect(Math.abs(s - y[r]!)).toBeLessThan(1e-12);
    }
    // The nonzero bound holds, and is exact on the full product (no random zeros in these integrals).
    expect(determinantNonzeroBound(ctx)).toBeGreaterThanOrEqual(whole.cols.length);
    const full = prepareDeterminants(basisOf(configs, 2 * m), ints);
    expect(full.split.product).toBe(true);
    expect(determinantNonzeroBound(full)).toBe(buildDeterminantRows(full, 0, full.dim).cols.length);
  });
});
