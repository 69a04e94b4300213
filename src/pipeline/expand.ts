import type { Basis } from '../bits/basis.js';
import { sectorFlipTest } from '../build/projectedHamiltonian.js';
import { groupByFlipMask, type PauliSum } from '../operators/pauliSum.js';
import { compileSector, type Sector } from '../sectors/sector.js';
import { diagonalEnergies, externalAmplitudes, externalPlan } from '../analysis/externalAmplitudes.js';
import { extendBasis, selectExpansion, type ExpansionSelection } from '../analysis/expansion.js';

/** `--expand N` with optional importance selection. */
export interface ExpandOptions extends ExpansionSelection {
  steps: number;
}

/** What one expansion step did. */
export interface ExpansionStep {
  step: number;
  /** External configurations in the sector connected to the subspace. */
  candidates: number;
  added: number;
  dimension: number;
  /** Lowest energy of the subspace the step started from (importance mode only). */
  energy?: number;
}

/** The expansion part of a report. */
export interface ExpansionReport {
  mode: 'connected' | 'importance';
  threshold: number | null;
  max: number | null;
  sampledDimension: number;
  steps: ExpansionStep[];
}

/** The lowest eigenpair of a subspace, as an expansion step needs it. */
export interface LowestState {
  energy: number;
  psi: Float64Array;
}

/** Whether the options select by first-order importance (needing ψ) rather than by connectivity. */
export function expandsByImportance(opts: ExpansionSelection): boolean {
  return opts.threshold !== undefined || opts.max !== undefined;
}

/**
 * One expansion step within the sector: add the configurations H connects to the subspace (all,
 * or the important ones given the subspace's lowest state `lowest`).
 */
export function expandOnce(hamiltonian: PauliSum, basis: Basis, sector: Sector, selection: ExpansionSelection, lowest?: LowestState): { basis: Basis; candidates: number; added: number } {
  const groups = groupByFlipMask(hamiltonian, basis.nWords);
  const plan = externalPlan(groups, sectorFlipTest(groups, compileSector(sector, basis.qubits, basis.nWords)));
  const importance = expandsByImportance(selection) && lowest !== undefined;
  const { external } = importance
    ? externalAmplitudes(basis, plan, lowest.psi, diagonalEnergies(basis, plan), { energy: lowest.energy, keepDiagonal: true })
    : externalAmplitudes(basis, plan, null, new Float64Array(basis.dim), { mode: 'connect' });
  const picked = selectExpansion(external, basis, plan, selection, importance ? lowest.energy : undefined);
  return { basis: picked.count > 0 ? extendBasis(basis, picked.states, picked.count) : basis, candidates: external.size, added: picked.count };
}

/**
 * `steps` expansion steps from `basis`. In importance mode each step needs the lowest state of
 * the current subspace: `lowestOf` supplies it (the caller's solver, so every solve goes through
 * the same build-and-solve entry).
 */
export async function expandSubspace(
  hamiltonian: PauliSum,
  basis: Basis,
  sector: Sector,
  opts: ExpandOptions,
  lowestOf: (b: Basis) => Promise<LowestState>,
): Promise<{ basis: Basis; report: ExpansionReport }> {
  const importance = expandsByImportance(opts);
  const report: ExpansionReport = {
    mode: importance ? 'importance' : 'connected',
    threshold: opts.threshold ?? null,
    max: opts.max ?? null,
    sampledDimension: basis.dim,
    steps: [],
  };
  let cur = basis;
  for (let step = 1; step <= opts.steps; step++) {
    const lowest = importance ? await lowestOf(cur) : undefined;
    const r = expandOnce(hamiltonian, cur, sector, opts, lowest);
    cur = r.basis;
    report.steps.push({ step, candidates: r.candidates, added: r.added, dimension: cur.dim, ...(lowest ? { energy: lowest.energy } : {}) });
    if (r.added === 0) break;
  }
  return { basis: cur, report };
}
