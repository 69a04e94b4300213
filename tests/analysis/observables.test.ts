import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Matrix } from 'ml-matrix';
import { makeBasis } from '../../src/bits/basis.js';
import { PauliSumBuilder } from '../../src/operators/pauliSum.js';
import { stateObservables } from '../../src/analysis/observables.js';
import { densePauliSum } from '../reference.js';
import { closeTo, projectAndSolveSync } from '../helpers.js';

type Op = 'X' | 'Y' | 'Z';
const n = 4;
const opsArb = fc.uniqueArray(fc.tuple(fc.constantFrom<Op>('X', 'Y', 'Z'), fc.integer({ min: 0, max: n - 1 })), { minLength: 1, maxLength: 3, selector: (t) => t[1] });

/** ⟨ψ|P|ψ⟩ with the dense Kronecker-product matrix of P (tests/reference.ts) and ml-matrix. */
function denseExpectation(ops: Array<[Op, number]>, states: Uint32Array, psi: Float64Array, complex: boolean): number {
  const m = densePauliSum(n, [{ coeff: 1, ops }]);
  const N = m.n;
  const toM = (a: Float64Array) => new Matrix(Array.from({ length: N }, (_, i) => Array.from(a.subarray(i * N, (i + 1) * N))));
  const pr = Matrix.zeros(N, 1);
  const pi = Matrix.zeros(N, 1);
  let norm = 0;
  states.forEach((s, i) => {
    pr.set(s, 0, complex ? psi[2 * i]! : psi[i]!);
    pi.set(s, 0, complex ? psi[2 * i + 1]! : 0);
    norm += complex ? psi[2 * i]! ** 2 + psi[2 * i + 1]! ** 2 : psi[i]! ** 2;
  });
  const wr = toM(m.re).mmul(pr).sub(toM(m.im).mmul(pi));
  const wi = toM(m.re).mmul(pi).add(toM(m.im).mmul(pr));
  let re = 0;
  for (let a = 0; a < N; a++) re += pr.get(a, 0) * wr.get(a, 0) + pi.get(a, 0) * wi.get(a, 0);
  return re / norm;
}

describe('stateObservables', () => {
  it('stateObservables matches dense expectations of Z, ZZ and random Pauli strings (ml-matrix)', () => {
    fc.assert(
      fc.property(fc.array(fc.record({ coeff: fc.double({ min: -1, max: 1, noNaN: true }), ops: opsArb }), { minLength: 2, maxLength: 8 }), opsArb, (terms, obs) => {
        const b = new PauliSumBuilder(n);
        for (const t of terms) b.add(t.coeff, t.ops);
        const h = b.finish(true);
        fc.pre(h.terms.length > 0);
        const idx = [0, 3, 5, 6, 9, 10, 12, 15, 1, 14];
        const basis = makeBasis(n, 1, Uint32Array.from(idx), idx.length);
        const p = projectAndSolveSync(h, basis, { weights: [] }, { tol: 1e-12 });
        const psi = p.eigen.vectors[0]!;
        const x = new Uint32Array(1);
        const z = new Uint32Array(1);
        for (const [o, q] of obs) {
          if (o !== 'Z') x[0]! |= 1 << q;
          if (o !== 'X') z[0]! |= 1 << q;
        }
        const r = stateObservables(basis, psi, p.matrix.complex, { correlations: true, pauli: [{ ops: 'obs', coeff: 2, x, z }] });
        for (let q = 0; q < n; q++) closeTo(r.z[q]!, denseExpectation([['Z', q]], basis.states, psi, p.matrix.complex), 1e-12, `<Z${q}>`);
        closeTo(r.zz![0]![2]!, denseExpectation([['Z', 0], ['Z', 2]], basis.states, psi, p.matrix.complex), 1e-12, '<Z0 Z2>');
        closeTo(r.zz![3]![1]!, r.zz![1]![3]!, 0, 'ZZ symmetric');
        closeTo(r.pauli![0]!.value, 2 * denseExpectation(obs, basis.states, psi, p.matrix.complex), 1e-12, 'Pauli string');
        expect(r.pauli![0]!.diagonal).toBe(obs.every(([o]) => o === 'Z'));
        r.occupation.forEach((o, q) => closeTo(o, (1 - r.z[q]!) / 2, 1e-15, 'occupation'));
      }),
      { numRuns: 30, seed: 99 },
    );
  });
});
