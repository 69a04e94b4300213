import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { makeBasis } from '../../src/bits/basis.js';
import { wordsFor } from '../../src/bits/packed.js';
import { buildProjectedHamiltonian } from '../../src/build/projectedHamiltonian.js';
import { toDense } from '../../src/build/sparseMatrix.js';
import { groupByFlipMask, PauliSumBuilder } from '../../src/operators/pauliSum.js';
import { compileSector } from '../../src/sectors/sector.js';
import { lanczos } from '../../src/solvers/lanczos.js';
import { matrixOperator } from '../../src/pipeline/solve.js';
import { densePauliSum, hermitianEigenvalues, project } from '../reference.js';
import { closeTo } from '../helpers.js';

type Op = 'X' | 'Y' | 'Z';
interface Term {
  coeff: number;
  ops: Array<[Op, number]>;
}

/** Random Pauli sums on n qubits; `realOnly` keeps an even number of Y per term. */
function termsArb(n: number, realOnly: boolean): fc.Arbitrary<Term[]> {
  const term = fc
    .tuple(fc.double({ min: -2, max: 2, noNaN: true }), fc.array(fc.constantFrom<'I' | Op>('I', 'X', 'Y', 'Z'), { minLength: n, maxLength: n }))
    .map(([coeff, letters]) => ({ coeff, ops: letters.flatMap((l, q) => (l === 'I' ? [] : [[l, q] as [Op, number]])) }))
    .filter((t) => !realOnly || t.ops.filter(([o]) => o === 'Y').length % 2 === 0);
  return fc.array(term, { minLength: 1, maxLength: 12 });
}

function libraryMatrix(n: number, terms: Term[], subset: number[]) {
  const b = new PauliSumBuilder(n);
  for (const t of terms) b.add(t.coeff, t.ops);
  const h = b.finish(true);
  const nWords = wordsFor(n);
  const states = new Uint32Array(subset.length * nWords);
  subset.forEach((s, i) => (states[i * nWords] = s));
  const basis = makeBasis(n, nWords, states, subset.length);
  const m = buildProjectedHamiltonian(basis, groupByFlipMask(h, nWords), compileSector({ weights: [] }, n, nWords));
  // Basis is sorted ascending, so map back to the sorted subset order.
  return { m, sorted: Array.from(basis.states.filter((_, i) => i % nWords === 0)) };
}

describe('buildProjectedHamiltonian', () => {
  for (const realOnly of [true, false]) {
    it(`buildProjectedHamiltonian matches the dense Kronecker-product projection (${realOnly ? 'real' : 'complex'})`, () => {
      // Reference: dense 2^n matrix from Kronecker products of the textbook Pauli matrices, projected by index.
      fc.assert(
        fc.property(
          fc.integer({ min: 1, max: 5 }).chain((n) =>
            fc.tuple(fc.constant(n), termsArb(n, realOnly), fc.uniqueArray(fc.integer({ min: 0, max: 2 ** n - 1 }), { minLength: 1, maxLength: 2 ** n })),
          ),
          ([n, terms, subset]) => {
            const { m, sorted } = libraryMatrix(n, terms, subset);
            const ref = project(densePauliSum(n, terms), sorted);
            const dense = toDense(m);
            for (let i = 0; i < ref.n * ref.n; i++) {
              closeTo(dense.re[i]!, ref.re[i]!, 1e-12, `re[${i}]`);
              closeTo(dense.im[i]!, ref.im[i]!, 1e-12, `im[${i}]`);
            }
          },
        ),
        { seed: 20261202, numRuns: 150 },
      );
    });
  }

  it('buildProjectedHamiltonian gives a Hermitian matrix (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 6 }).chain((n) => fc.tuple(fc.constant(n), termsArb(n, false), fc.uniqueArray(fc.integer({ min: 0, max: 2 ** n - 1 }), { minLength: 1, maxLength: 40 }))),
        ([n, terms, subset]) => {
          const { m } = libraryMatrix(n, terms, subset);
          const d = toDense(m);
          const k = m.dim;
          for (let i = 0; i < k; i++)
            for (let j = 0; j < k; j++) {
              expect(d.re[i * k + j]).toBe(d.re[j * k + i]);
              expect(d.im[i * k + j]).toBe(-d.im[j * k + i]! + 0);
            }
        },
      ),
      { seed: 7, numRuns: 100 },
    );
  });

  it('lanczos on the projected matrix matches ml-matrix dense eigenvalues (real and complex)', () => {
    // Reference: ml-matrix EigenvalueDecomposition of the independently built dense projection.
    fc.assert(
      fc.property(
        fc.boolean().chain((realOnly) =>
          fc.integer({ min: 3, max: 6 }).chain((n) => fc.tuple(fc.constant(n), termsArb(n, realOnly), fc.uniqueArray(fc.integer({ min: 0, max: 2 ** n - 1 }), { minLength: 4, maxLength: 2 ** n }))),
        ),
        ([n, terms, subset]) => {
          const { m, sorted } = libraryMatrix(n, terms, subset);
          const ref = hermitianEigenvalues(project(densePauliSum(n, terms), sorted));
          const k = Math.min(3, m.dim);
          const r = lanczos(matrixOperator(m), { eigs: k, tol: 1e-10, seed: 3 });
          const scale = Math.max(1, ...ref.map(Math.abs));
          for (let i = 0; i < k; i++) closeTo(r.values[i]!, ref[i]!, 1e-8 * scale, `eigenvalue ${i}`);
          for (let i = 0; i < k; i++) expect(r.residuals[i]!).toBeLessThan(1e-7 * scale);
        },
      ),
      { seed: 11, numRuns: 80 },
    );
  });
});
