import { basisIndexOf, type Basis } from '../bits/basis.js';

/** A state given on its own list of configurations (e.g. read back from a saved state). */
export interface StateOnConfigs {
  nWords: number;
  count: number;
  states: Uint32Array;
  re: Float64Array;
  im: Float64Array;
}

/**
 * The state restricted to `basis` as a vector (interleaved when complex), or null when it has no
 * weight there. Used to start Lanczos from a saved state or from the previous point of a sweep.
 */
export function stateOnBasis(state: StateOnConfigs, basis: Basis, complex: boolean): Float64Array | null {
  const v = new Float64Array(complex ? 2 * basis.dim : basis.dim);
  let weight = 0;
  for (let i = 0; i < state.count; i++) {
    const j = basisIndexOf(basis, state.states, i * state.nWords);
    if (j < 0) continue;
    if (complex) {
      v[2 * j] = state.re[i]!;
      v[2 * j + 1] = state.im[i]!;
    } else v[j] = state.re[i]!;
    weight += state.re[i]! ** 2 + (complex ? state.im[i]! ** 2 : 0);
  }
  return weight > 0 ? v : null;
}
