import { makeBasis, type Basis } from '../bits/basis.js';
import { seededUniform } from '../util/random.js';

/**
 * `count` batches of `size` configurations drawn from the sampled configurations of `basis`
 * without replacement, with probability proportional to their counts (Efraimidis & Spirakis,
 * Inf. Process. Lett. 97 (2006) 181: keep the `size` largest keys u^{1/w}). Configurations with
 * zero count (added by expansion) are never drawn. Seeded: the same seed gives the same batches.
 */
export function resampleBatches(basis: Basis, count: number, size: number, seed: number): Basis[] {
  const rng = seededUniform(seed);
  const { dim, nWords } = basis;
  const candidates: number[] = [];
  for (let i = 0; i < dim; i++) if (basis.counts[i]! > 0) candidates.push(i);
  const take = Math.min(size, candidates.length);
  const keys = new Float64Array(candidates.length);
  const out: Basis[] = [];
  for (let b = 0; b < count; b++) {
    // log(u)/w orders like u^{1/w} without underflow for large weights.
    for (let c = 0; c < candidates.length; c++) keys[c] = Math.log(Math.max(rng.next(), 1e-300)) / basis.counts[candidates[c]!]!;
    const order = Array.from(candidates.keys()).sort((p, q) => keys[q]! - keys[p]! || p - q);
    const states = new Uint32Array(take * nWords);
    const counts = new Float64Array(take);
    for (let k = 0; k < take; k++) {
      const i = candidates[order[k]!]!;
      states.set(basis.states.subarray(i * nWords, (i + 1) * nWords), k * nWords);
      counts[k] = basis.counts[i]!;
    }
    out.push(makeBasis(basis.qubits, nWords, states, take, counts));
  }
  return out;
}
