import { describe, expect, it } from 'vitest';
import { makeBasis, type Basis } from '../../src/bits/basis.js';
import { BitspanError } from '../../src/errors.js';
import { lanczosVectorBytes, projectDeterminants } from '../../src/pipeline/projectDeterminants.js';
import { seededUniform } from '../../src/util/random.js';
import { fullSector } from '../../bench/molecules/fullSector.js';
import { randomIntegrals } from '../denseFermions.js';
import { closeTo } from '../helpers.js';

function sampled(b: Basis, keep: number, seed: number): Basis {
  const rng = seededUniform(seed);
  const rows: number[] = [];
  for (let i = 0; i < b.dim; i++) if (rng.next() < keep) rows.push(i);
  return makeBasis(b.qubits, b.nWords, Uint32Array.from(rows.map((r) => b.states[r]!)), rows.length);
}

describe('projectDeterminants', () => {
  const ints = randomIntegrals(5, 41);
  const basis = sampled(fullSector(5, 2, 2), 0.5, 2);

  it('projectDeterminants gives the same eigenpairs stored and matrix-free', () => {
    const csr = projectDeterminants(ints, basis, { storage: 'csr', eigs: 2, tol: 1e-12 });
    const free = projectDeterminants(ints, basis, { storage: 'matrix-free', eigs: 2, tol: 1e-12 });
    expect(csr.storage).toBe('csr');
    expect(free.storage).toBe('matrix-free');
    expect(free.matrix).toBeUndefined();
    expect(free.nonzeros).toBe(csr.nonzeros);
    closeTo(free.eigen.values[0]!, csr.eigen.values[0]!, 1e-10, 'E0');
    closeTo(free.eigen.values[1]!, csr.eigen.values[1]!, 1e-10, 'E1');
    // ‖Hv − λv‖ small for the matrix-free pair (residual property, common practice).
    expect(free.eigen.residuals[0]!).toBeLessThan(1e-9);
  });

  it('projectDeterminants goes matrix-free when the matrix does not fit the budget, and refuses when the vectors do not', () => {
    const vectors = lanczosVectorBytes(basis.dim, 1);
    const auto = projectDeterminants(ints, basis, { memoryBudget: vectors + 16 });
    expect(auto.storage).toBe('matrix-free');
    const roomy = projectDeterminants(ints, basis, {});
    expect(roomy.storage).toBe('csr');
    closeTo(auto.eigen.values[0]!, roomy.eigen.values[0]!, 1e-9, 'E0 either way');
    let error: unknown;
    try {
      projectDeterminants(ints, basis, { memoryBudget: vectors / 2 });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(BitspanError);
    expect((error as BitspanError).code).toBe('too-large');
  });
});
