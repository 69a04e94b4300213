import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { isingModel } from '../../../src/operators/models/ising.js';
import { makeBasis } from '../../../src/bits/basis.js';
import { enumerateSector } from '../../../src/sectors/enumerateSector.js';
import { projectAndSolve } from '../../../src/pipeline/solve.js';
import { closeTo, denseFromPauliSum, hermitianEigenvalues } from '../../helpers.js';

/**
 * Ground energy of the open chain H = −Σ J Z_i Z_{i+1} − Σ h X_i by the free-fermion solution
 * (Lieb, Schultz & Mattis 1961; Pfeuty, Ann. Phys. 57 (1970) 79): after Jordan–Wigner the chain is
 * H = Σ c†A c + ½ Σ (c†B c† + h.c.) + const with A_ii = 2h, A_{i,i±1} = −J, B_{i,i+1} = −B_{i+1,i} = −J;
 * the mode energies Λ_k are the square roots of the eigenvalues of (A − B)(A + B), and E0 = −½ Σ Λ_k.
 */
function freeFermionEnergy(L: number, J: number, h: number): number {
  const A = Matrix.zeros(L, L);
  const B = Matrix.zeros(L, L);
  for (let i = 0; i < L; i++) {
    A.set(i, i, 2 * h);
    if (i + 1 < L) {
      A.set(i, i + 1, -J);
      A.set(i + 1, i, -J);
      B.set(i, i + 1, -J);
      B.set(i + 1, i, J);
    }
  }
  const M = A.clone().sub(B).mmul(A.clone().add(B));
  const lambda2 = new EigenvalueDecomposition(M, { assumeSymmetric: true }).realEigenvalues;
  return -0.5 * lambda2.reduce((s, x) => s + Math.sqrt(Math.max(0, x)), 0);
}

async function groundEnergy(L: number, J: number, h: number): Promise<number> {
  const { hamiltonian } = isingModel({ lattice: { kind: 'chain', lx: L, ly: 1, boundary: 'open' }, j: J, field: h });
  const e = enumerateSector({ weights: [] }, L);
  const basis = makeBasis(L, e.nWords, e.states, e.count);
  return (await projectAndSolve(hamiltonian, basis, { weights: [] }, { tol: 1e-11 })).eigen.values[0]!;
}

describe('isingModel', () => {
  it('isingModel open chain matches the free-fermion ground energy (Pfeuty 1970) across the transition', async () => {
    for (const [L, J, h] of [[10, 1, 0.5], [10, 1, 1], [12, 1, 1.7], [11, 0.8, 1.2]] as const) {
      closeTo(await groundEnergy(L, J, h), freeFermionEnergy(L, J, h), 1e-8, `L=${L} J=${J} h=${h}`);
    }
  });

  it('isingModel free-fermion construction itself agrees with dense diagonalisation for a short chain (ml-matrix)', () => {
    const { hamiltonian } = isingModel({ lattice: { kind: 'chain', lx: 6, ly: 1, boundary: 'open' }, j: 1, field: 0.9 });
    closeTo(hermitianEigenvalues(denseFromPauliSum(hamiltonian, 6))[0]!, freeFermionEnergy(6, 1, 0.9), 1e-10, 'L=6');
  });

  it('isingModel two sites: E0 = −sqrt(J² + 4h²) (hand-derived in the symmetric subspace)', () => {
    const { hamiltonian } = isingModel({ lattice: { kind: 'chain', lx: 2, ly: 1, boundary: 'open' }, j: 0.7, field: 0.4 });
    closeTo(hermitianEigenvalues(denseFromPauliSum(hamiltonian, 2))[0]!, -Math.sqrt(0.49 + 4 * 0.16), 1e-12, 'two-site');
  });

  it('isingModel writes −J ZZ, −h X and −hz Z with one term per bond and site', () => {
    const { hamiltonian, lattice } = isingModel({ lattice: { kind: 'square', lx: 3, ly: 3, boundary: 'periodic' }, j: 1.5, field: 0.25, hz: 0.1 });
    const zz = hamiltonian.terms.filter((t) => t.x[0] === 0 && t.z[0]!.toString(2).split('1').length === 3);
    expect(zz.length).toBe(lattice.nearest.length);
    for (const t of zz) expect(t.coeff).toBe(-1.5);
    expect(hamiltonian.terms.filter((t) => t.z[0] === 0).every((t) => t.coeff === -0.25)).toBe(true);
    expect(hamiltonian.terms.length).toBe(lattice.nearest.length + 2 * 9);
  });
});
