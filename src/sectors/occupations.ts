/**
 * Mean occupation of every qubit over weighted configurations: n_q = Σ_i w_i bit_q(i) / Σ_i w_i.
 * With shot counts as weights it is the sampled estimate; with |ψ_i|² it is the state's orbital
 * occupation ⟨n_q⟩. Returns zeros when the weights sum to zero.
 */
export function occupations(states: Uint32Array, nWords: number, qubits: number, weights: ArrayLike<number>, count: number): Float64Array {
  const occ = new Float64Array(qubits);
  let total = 0;
  for (let i = 0; i < count; i++) {
    const w = weights[i]!;
    if (w === 0) continue;
    total += w;
    for (let k = 0; k < nWords; k++) {
      let x = states[i * nWords + k]!;
      while (x) {
        const low = x & -x;
        occ[k * 32 + 31 - Math.clz32(low)]! += w;
        x = (x ^ low) >>> 0;
      }
    }
  }
  if (total > 0) for (let q = 0; q < qubits; q++) occ[q]! /= total;
  return occ;
}

/** Probabilities |v_i|² of a (real or interleaved complex) state vector. */
export function probabilities(v: Float64Array, complex: boolean, dim: number): Float64Array {
  const p = new Float64Array(dim);
  for (let i = 0; i < dim; i++) p[i] = complex ? v[2 * i]! ** 2 + v[2 * i + 1]! ** 2 : v[i]! ** 2;
  return p;
}
