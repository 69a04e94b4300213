import { BitspanError } from '../errors.js';
import { makeBasis, type Basis } from '../bits/basis.js';
import { depositBits } from '../bits/bitRange.js';
import { lookupConfig } from '../bits/hashIndex.js';
import { wordsFor } from '../bits/packed.js';
import { makeSpinStrings, splitSpinStrings, type SpinStrings } from '../build/spinStrings.js';

/** Sizes of a spin-up × spin-down closure, known before it is built. */
export interface ProductSpacePlan {
  alphaStrings: number;
  betaStrings: number;
  dimension: number;
  /** Whether both registers use the union of the sampled spin-up and spin-down strings. */
  symmetric: boolean;
  /** Bytes of the basis itself (packed states, hash slots, counts). */
  basisBytes: number;
  alpha: SpinStrings;
  beta: SpinStrings;
}

/**
 * Plan the closure of a determinant basis: every sampled spin-up string with every sampled
 * spin-down string. When both spins hold equally many electrons, both registers take the union of
 * the two string sets, so exchanging spin-up and spin-down maps the space onto itself (common
 * practice in sample-based diagonalisation, which keeps singlet states expressible).
 */
export function planProductSpace(basis: Basis, orbitals: number): ProductSpacePlan {
  const split = splitSpinStrings(basis, orbitals);
  let { alpha, beta } = split;
  const symmetric = alpha.electrons === beta.electrons;
  if (symmetric) {
    const w = alpha.nWords;
    const both = new Uint32Array((alpha.count + beta.count) * w);
    both.set(alpha.states.subarray(0, alpha.count * w));
    both.set(beta.states.subarray(0, beta.count * w), alpha.count * w);
    alpha = makeSpinStrings(both, alpha.count + beta.count, w, orbitals);
    beta = alpha;
  }
  const dimension = alpha.count * beta.count;
  const nWords = wordsFor(2 * orbitals);
  const basisBytes = dimension * (nWords * 4 * 2 + 8 + 2 * 4 * 2);
  return { alphaStrings: alpha.count, betaStrings: beta.count, dimension, symmetric, basisBytes, alpha, beta };
}

/**
 * Build the planned product basis; configurations of `sampled` keep their counts, the added ones
 * have count zero. Throws `too-large` when the dimension does not fit in a 32-bit index.
 */
export function buildProductSpace(plan: ProductSpacePlan, sampled: Basis): Basis {
  const { alpha, beta, dimension } = plan;
  if (dimension > 2 ** 31 - 1) {
    throw new BitspanError('too-large', `the spin-up × spin-down closure has ${dimension} determinants`, 'drop --product-space or reduce the samples (--min-count, --max-dim)');
  }
  const m = alpha.orbitals;
  const nWords = sampled.nWords;
  const states = new Uint32Array(Math.max(1, dimension * nWords));
  const counts = new Float64Array(dimension);
  let r = 0;
  for (let ib = 0; ib < beta.count; ib++) {
    for (let ia = 0; ia < alpha.count; ia++, r++) {
      depositBits(alpha.states, ia * alpha.nWords, m, states, r * nWords, 0);
      depositBits(beta.states, ib * beta.nWords, m, states, r * nWords, m);
      const at = lookupConfig(sampled.states, sampled.slots, nWords, states, r * nWords);
      if (at >= 0) counts[r] = sampled.counts[at]!;
    }
  }
  return makeBasis(sampled.qubits, nWords, states, dimension, counts);
}
