import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Matrix } from 'ml-matrix';
import { makeBasis } from '../../src/bits/basis.js';
import { groupByFlipMask, PauliSumBuilder, type PauliSum } from '../../src/operators/pauliSum.js';
import { matrixOperator } from '../../src/pipeline/solve.js';
import { compileSector } from '../../src/sectors/sector.js';
import { varianceAndPt2 } from '../../src/analysis/varianceAndPt2.js';
import { densePauliSum, hermitianEigenvalues, weightIndices } from '../reference.js';
import { closeTo, projectAndSolveSync } from '../helpers.js';

type Op = 'X' | 'Y' | 'Z';
type Term = { coeff: number; ops: Array<[Op, number]> };

/** Random Pauli terms on `n` qubits from a fast-check seed (each qubit at most once per term). */
const termsArb = (n: number, allowY: boolean): fc.Arbitrary<Term[]> =>
  fc.array(
    fc.record({
      coeff: fc.double({ min: -1, max: 1, noNaN: true }),
      ops: fc.uniqueArray(fc.tuple(fc.constantFrom<Op>(...(allowY ? (['X', 'Y', 'Z'] as Op[]) : (['X', 'Z'] as Op[]))), fc.integer({ min: 0, max: n - 1 })), {
        minLength: 1,
        maxLength: 3,
        selector: (t) => t[1],
      }),
    }),
    { minLength: 2, maxLength: 10 },
  );

function pauliSum(n: number, terms: Term[]): PauliSum {
  const b = new PauliSumBuilder(n);
  for (const t of terms) b.add(t.coeff, t.ops);
  return b.finish(true);
}

/** Subspace solution of `terms` on the configurations `idx` (integers = bitstrings, qubit 0 lowest). */
function solveOn(n: number, h: PauliSum, idx: number[]) {
  const basis = makeBasis(n, 1, Uint32Array.from(idx), idx.length);
  const p = projectAndSolveSync(h, basis, { weights: [] }, { tol: 1e-12, eigs: Math.min(2, idx.length) });
  return { basis, p };
}

/**
 * Independent reference: the full 2^n matrix from Kronecker products (tests/reference.ts) and
 * ml-matrix products; variance = ‖Hψ‖² − (ψ†Hψ)², PT2 = Σ_{a∉S} |(Hψ)_a|² / (E − H_aa).
 */
function denseReference(n: number, terms: Term[], states: Uint32Array, psi: Float64Array, complex: boolean) {
  const full = densePauliSum(n, terms);
  const N = full.n;
  const toM = (a: Float64Array) => new Matrix(Array.from({ length: N }, (_, i) => Array.from(a.subarray(i * N, (i + 1) * N))));
  const Hr = toM(full.re);
  const Hi = toM(full.im);
  const pr = Matrix.zeros(N, 1);
  const pi = Matrix.zeros(N, 1);
  const inS = new Set<number>();
  // Normalise: the estimate is defined for the unit vector along ψ.
  const norm = Math.hypot(...psi);
  states.forEach((s, i) => {
    inS.add(s);
    pr.set(s, 0, (complex ? psi[2 * i]! : psi[i]!) / norm);
    pi.set(s, 0, (complex ? psi[2 * i + 1]! : 0) / norm);
  });
  const wr = Hr.mmul(pr).sub(Hi.mmul(pi));
  const wi = Hr.mmul(pi).add(Hi.mmul(pr));
  let h2 = 0;
  let e = 0;
  for (let a = 0; a < N; a++) {
    h2 += wr.get(a, 0) ** 2 + wi.get(a, 0) ** 2;
    e += pr.get(a, 0) * wr.get(a, 0) + pi.get(a, 0) * wi.get(a, 0);
  }
  // Vanishing denominators (E = H_aa, e.g. a Hamiltonian with no diagonal part and E ≈ 0) are
  // counted apart, as the estimate does; nearly vanishing ones make the case ill-posed.
  let pt2 = 0;
  let singular = 0;
  let illPosed = false;
  for (let a = 0; a < N; a++) {
    if (inS.has(a)) continue;
    const w = wr.get(a, 0) ** 2 + wi.get(a, 0) ** 2;
    const d = e - full.re[a * N + a]!;
    if (Math.abs(d) <= 1e-12) {
      if (w > 0) singular++;
    } else if (Math.abs(d) < 1e-6 && w > 0) illPosed = true;
    else pt2 += w / d;
  }
  return { energy: e, variance: h2 - e * e, pt2, singular, illPosed, spectrum: hermitianEigenvalues(full) };
}

describe('varianceAndPt2', () => {
  it('varianceAndPt2 matches a dense full-space computation (ml-matrix) for random real and complex Hamiltonians', () => {
    const n = 5;
    fc.assert(
      fc.property(fc.boolean(), fc.integer({ min: 1, max: 2 ** 31 - 1 }), (allowY, seed) => {
        const terms = fc.sample(termsArb(n, allowY), { seed, numRuns: 1 })[0]!;
        const h = pauliSum(n, terms);
        if (h.terms.length === 0) return;
        // A random subset of 3..20 configurations.
        const idx = fc.sample(fc.uniqueArray(fc.integer({ min: 0, max: 2 ** n - 1 }), { minLength: 3, maxLength: 20 }), { seed: seed + 1, numRuns: 1 })[0]!;
        const { basis, p } = solveOn(n, h, idx);
        const psi = p.eigen.vectors[0]!;
        const est = varianceAndPt2(basis, groupByFlipMask(h, 1), matrixOperator(p.matrix), psi);
        const ref = denseReference(n, terms, basis.states, psi, p.matrix.complex);
        fc.pre(!ref.illPosed);
        const scale = 1 + Math.abs(ref.energy) ** 2;
        closeTo(est.energy, ref.energy, 1e-10, 'energy');
        closeTo(est.variance, ref.variance, 1e-9 * scale, 'variance');
        closeTo(est.pt2, ref.pt2, 1e-9 * scale * (1 + Math.abs(ref.pt2)), 'pt2');
        expect(est.singular).toBe(ref.singular);
        // The variance is a sum of squares split into a residual part and an external part.
        expect(est.variance).toBeGreaterThanOrEqual(-1e-12);
        closeTo(est.internalVariance, (p.eigen.residuals[0]! / Math.hypot(...psi)) ** 2, 1e-9, 'internal variance = residual²');
      }),
      { numRuns: 40, seed: 20240501 },
    );
  });

  it('varianceAndPt2 is zero when the subspace holds an exact eigenvector (full Sz = 0 sector of a Heisenberg ring)', () => {
    // Common practice: the Heisenberg ring conserves total Sz, so its Sz = 0 sector is invariant
    // and the sector ground state is an exact eigenvector of the full H: variance 0, no external weight.
    const n = 8;
    const terms: Term[] = [];
    for (let i = 0; i < n; i++) for (const o of ['X', 'Y', 'Z'] as Op[]) terms.push({ coeff: 0.25, ops: [[o, i], [o, (i + 1) % n]] });
    const h = pauliSum(n, terms);
    const idx = weightIndices(n, n / 2);
    const { basis, p } = solveOn(n, h, idx);
    const est = varianceAndPt2(basis, groupByFlipMask(h, 1), matrixOperator(p.matrix), p.eigen.vectors[0]!, {
      sector: compileSector({ weights: [{ lo: 0, hi: -1, weight: 4 }] }, n, 1),
    });
    expect(est.variance).toBeLessThan(1e-18);
    expect(est.externalWeight).toBe(0);
    expect(est.pt2).toBe(0);
    expect(est.external).toBe(0);
    // Published N = 8 ring energy −3.651093409 (Bethe-ansatz tables, from memory; the dense check
    // in tests/pipeline/solve.test.ts verifies it with ml-matrix).
    closeTo(est.energy, -3.651093409, 1e-8, 'N = 8 Heisenberg ring');
  });

  it('varianceAndPt2 reports the weight that leaves a sector the Hamiltonian does not conserve', () => {
    // A transverse field X0 breaks the weight sector: all external weight from X0 is outside it.
    const n = 4;
    const terms: Term[] = [
      { coeff: 0.5, ops: [['X', 0], ['X', 1]] },
      { coeff: 0.5, ops: [['Y', 0], ['Y', 1]] },
      { coeff: 0.3, ops: [['X', 0]] },
    ];
    const h = pauliSum(n, terms);
    const idx = weightIndices(n, 1);
    const { basis, p } = solveOn(n, h, idx);
    const psi = p.eigen.vectors[0]!;
    const est = varianceAndPt2(basis, groupByFlipMask(h, 1), matrixOperator(p.matrix), psi, {
      sector: compileSector({ weights: [{ lo: 0, hi: -1, weight: 1 }] }, n, 1),
    });
    const ref = denseReference(n, terms, basis.states, psi, false);
    closeTo(est.variance, ref.variance, 1e-12, 'variance');
    closeTo(est.outsideSector, est.externalWeight, 1e-15, 'all external weight is outside the sector');
    expect(est.outsideSector).toBeGreaterThan(0);
  });
});
