import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { makeBasis } from '../../src/bits/basis.js';
import { groupByFlipMask, PauliSumBuilder } from '../../src/operators/pauliSum.js';
import { matrixOperator } from '../../src/pipeline/solve.js';
import { energyBounds } from '../../src/analysis/energyBounds.js';
import { varianceAndPt2 } from '../../src/analysis/varianceAndPt2.js';
import { densePauliSum, hermitianEigenvalues } from '../reference.js';
import { closeTo, projectAndSolveSync } from '../helpers.js';

type Op = 'X' | 'Y' | 'Z';
type Term = { coeff: number; ops: Array<[Op, number]> };

const n = 4;
const termsArb = fc.array(
  fc.record({
    coeff: fc.double({ min: -1, max: 1, noNaN: true }),
    ops: fc.uniqueArray(fc.tuple(fc.constantFrom<Op>('X', 'Y', 'Z'), fc.integer({ min: 0, max: n - 1 })), { minLength: 1, maxLength: 3, selector: (t) => t[1] }),
  }),
  { minLength: 3, maxLength: 10 },
);
const subsetArb = fc.uniqueArray(fc.integer({ min: 0, max: 2 ** n - 1 }), { minLength: 2, maxLength: 14 });

describe('energyBounds', () => {
  it('energyBounds: Weinstein and Kato–Temple intervals contain the exact energy on small systems', () => {
    // References: exact spectra by dense diagonalisation with ml-matrix (tests/reference.ts).
    // Weinstein (PNAS 20 (1934) 529): some eigenvalue lies in [E − σ, E + σ]. Kato–Temple (Temple
    // 1928, Kato 1949): with a gap Δ ≤ E1 − E0 and E below E0 + Δ/2, E0 lies in the returned interval.
    let withKatoTemple = 0;
    fc.assert(
      fc.property(termsArb, subsetArb, (terms: Term[], idx) => {
        const b = new PauliSumBuilder(n);
        for (const t of terms) b.add(t.coeff, t.ops);
        const h = b.finish(true);
        fc.pre(h.terms.length > 0);
        const spectrum = hermitianEigenvalues(densePauliSum(n, terms));
        const e0 = spectrum[0]!;
        const e1 = spectrum.find((v) => v > e0 + 1e-9);
        const basis = makeBasis(n, 1, Uint32Array.from(idx), idx.length);
        const p = projectAndSolveSync(h, basis, { weights: [] }, { tol: 1e-12 });
        const est = varianceAndPt2(basis, groupByFlipMask(h, 1), matrixOperator(p.matrix), p.eigen.vectors[0]!);
        const energy = p.eigen.values[0]!;
        const gap = e1 !== undefined ? e1 - e0 : undefined;
        const bounds = energyBounds(energy, est.variance, { gap });
        const slack = 1e-9;
        // Variational bound (Rayleigh–Ritz): E ≥ E0.
        expect(bounds.upper).toBeGreaterThanOrEqual(e0 - slack);
        const [lo, hi] = bounds.weinstein;
        expect(spectrum.some((v) => v >= lo - slack && v <= hi + slack)).toBe(true);
        if (bounds.katoTemple && gap !== undefined && energy - e0 < gap / 2) {
          withKatoTemple++;
          expect(e0).toBeGreaterThanOrEqual(bounds.katoTemple[0] - slack);
          expect(e0).toBeLessThanOrEqual(bounds.katoTemple[1] + slack);
          // Tighter than Weinstein's lower end when it applies (σ²/(Δ−x) ≤ σ for σ ≤ Δ/2).
          expect(bounds.katoTemple[0]).toBeGreaterThanOrEqual(lo - slack);
        }
      }),
      { numRuns: 150, seed: 424242 },
    );
    // The property must actually have exercised Kato–Temple, not only Weinstein.
    expect(withKatoTemple).toBeGreaterThan(10);
  });

  it('energyBounds gives Kato–Temple from the second Ritz value only as a labelled estimate', () => {
    const b = energyBounds(-1, 0.04, { secondRitz: 0 });
    expect(b.betaFrom).toBe('ritz');
    closeTo(b.katoTemple![0], -1 - 0.04 / 1, 1e-15, 'E − σ²/(θ1 − E)');
    const none = energyBounds(-1, 0.04, {});
    expect(none.katoTemple).toBeUndefined();
    const tooSmallGap = energyBounds(-1, 0.04, { gap: 0.3 });
    expect(tooSmallGap.katoTemple).toBeUndefined();
    expect(tooSmallGap.katoTempleNote).toMatch(/gap/);
    closeTo(tooSmallGap.weinstein[0], -1.2, 1e-15, 'E − σ');
  });
});
