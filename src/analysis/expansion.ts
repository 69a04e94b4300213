import { makeBasis, type Basis } from '../bits/basis.js';
import { compareConfigs } from '../bits/packed.js';
import { externalConfig, type ExternalAmplitudes, type ExternalPlan } from './externalAmplitudes.js';

/** Which external configurations an expansion step adds. */
export interface ExpansionSelection {
  /** Keep configurations with first-order amplitude |⟨a|H|ψ⟩ / (E − H_aa)| at least this. */
  threshold?: number;
  /** Keep at most this many per step, the largest amplitudes first (ties: smaller bitstring). */
  max?: number;
}

/**
 * Choose configurations from `ext` (external to `basis`): all of them in `connect` mode, or by the
 * first-order perturbative amplitude |⟨a|H|ψ⟩ / (E − H_aa)| (needs H_aa kept) against a threshold
 * and/or a count. Returns them packed, in no particular order.
 */
export function selectExpansion(ext: ExternalAmplitudes, basis: Basis, plan: ExternalPlan, selection: ExpansionSelection, energy?: number): { states: Uint32Array; count: number } {
  const nWords = basis.nWords;
  const byImportance = energy !== undefined && (selection.threshold !== undefined || selection.max !== undefined);
  const picked: number[] = [];
  let importance: Float64Array | undefined;
  if (byImportance) {
    importance = new Float64Array(ext.size);
    const v = ext.values;
    const tiny = 1e-12 * Math.max(1, Math.abs(energy));
    for (let i = 0; i < ext.size; i++) {
      const amp = ext.complex ? Math.hypot(v[2 * i]!, v[2 * i + 1]!) : Math.abs(v[i]!);
      // A vanishing denominator means first order diverges: the configuration matters most.
      importance[i] = amp / Math.max(Math.abs(energy - ext.diagonal[i]!), tiny);
      if (selection.threshold === undefined || importance[i]! >= selection.threshold) picked.push(i);
    }
  } else for (let i = 0; i < ext.size; i++) picked.push(i);
  let chosen = picked;
  if (byImportance && selection.max !== undefined && picked.length > selection.max) {
    const imp = importance!;
    const a = new Uint32Array(nWords);
    const b = new Uint32Array(nWords);
    chosen = picked
      .sort((p, q) => {
        const d = imp[q]! - imp[p]!;
        if (d !== 0) return d;
        externalConfig(ext, basis, plan, p, a);
        externalConfig(ext, basis, plan, q, b);
        return compareConfigs(a, 0, b, 0, nWords);
      })
      .slice(0, selection.max);
  }
  const states = new Uint32Array(chosen.length * nWords);
  chosen.forEach((i, k) => externalConfig(ext, basis, plan, i, states, k * nWords));
  return { states, count: chosen.length };
}

/** The basis with `count` new configurations (not already in it) added, with zero sampled count. */
export function extendBasis(basis: Basis, states: Uint32Array, count: number): Basis {
  const nWords = basis.nWords;
  const all = new Uint32Array((basis.dim + count) * nWords);
  all.set(basis.states.subarray(0, basis.dim * nWords));
  all.set(states.subarray(0, count * nWords), basis.dim * nWords);
  const counts = new Float64Array(basis.dim + count);
  counts.set(basis.counts);
  return makeBasis(basis.qubits, nWords, all, basis.dim + count, counts);
}
