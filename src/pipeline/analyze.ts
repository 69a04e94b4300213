import type { Basis } from '../bits/basis.js';
import type { SampleSet } from '../io/readSamples.js';
import { groupByFlipMask, type PauliSum } from '../operators/pauliSum.js';
import { compileSector, type Sector } from '../sectors/sector.js';
import type { LanczosResult, LinearOperator } from '../solvers/lanczos.js';
import { resampleBatches } from '../analysis/batchResampling.js';
import { energyBounds, type EnergyBounds } from '../analysis/energyBounds.js';
import { stateObservables, type PauliObservable, type StateObservables } from '../analysis/observables.js';
import { sampleDiagnostics, type SampleDiagnostics } from '../analysis/sampleDiagnostics.js';
import { varianceAndPt2 } from '../analysis/varianceAndPt2.js';

/** A known energy to compare with: given by the user, or computed exactly over the whole sector. */
export interface ReferenceEnergy {
  energy: number;
  source: 'given' | 'exact';
  /** Dimension of the sector diagonalised (exact only). */
  dimension?: number;
}

/** What to compute about the lowest state after a solve (solve --estimate and every sweep point). */
export interface AnalysisOptions {
  /** Variance, PT2 and bounds of the lowest state. */
  estimate?: boolean;
  /** Lower bound on E₁ − E₀ for the Kato–Temple bound. */
  gap?: number;
  reference?: ReferenceEnergy;
  /** Per-qubit ⟨Z⟩, occupations and (for ≤ 64 qubits) ⟨Z_i Z_j⟩. */
  observe?: boolean;
  /** Pauli strings to evaluate (implies `observe`). */
  observables?: PauliObservable[];
  /** Per-dump novelty, duplicates and Good–Turing unseen mass. */
  sampling?: boolean;
  /** Batch resampling: `count` batches of `size` configurations, seeded. */
  batches?: { count: number; size: number; seed: number };
  /** Hash partitions for the variance (bounds memory; default 1). */
  parts?: number;
}

/** Error of an energy against the reference. */
export interface EnergyError {
  absolute: number;
  relative: number;
}

/** The estimate details behind `variance` and `pt2`. */
export interface EstimateDetails {
  /** ⟨ψ|H|ψ⟩ recomputed for the estimate. */
  energy: number;
  /** E + PT2. */
  energyPt2: number;
  /** σ = √variance. */
  sigma: number;
  internalVariance: number;
  externalWeight: number;
  /** Distinct external configurations H reaches from ψ. */
  external: number;
  /** External configurations left out of PT2 for a vanishing denominator. */
  singular: number;
  /** External weight outside the sector (nonzero only when H breaks the sector). */
  outsideSector: number;
}

/** Batch-resampling spread of the lowest energy. */
export interface BatchReport {
  count: number;
  size: number;
  seed: number;
  dimensions: number[];
  energies: number[];
  residuals: number[];
  mean: number;
  std: number;
  min: number;
  max: number;
}

/** Keys added to a solve report by the analysis (all optional: present when asked for). */
export interface AnalysisReport {
  variance: number;
  pt2: number;
  bounds: EnergyBounds;
  estimate: EstimateDetails;
  reference: ReferenceEnergy;
  error: EnergyError & { pt2Corrected?: EnergyError };
  observables: StateObservables & { caveat: string };
  sampling: SampleDiagnostics;
  batches: BatchReport;
}

/** The caveat printed with every observable report. */
export const OBSERVABLE_CAVEAT =
  'observables are evaluated in the subspace state; off-diagonal ones (X/Y strings) only see configurations inside the subspace';

/** What `analyzeLowest` reads: the solved subspace and, for batches and diagnostics, the samples. */
export interface AnalysisInput {
  hamiltonian: PauliSum;
  basis: Basis;
  sector: Sector;
  eigen: LanczosResult;
  /** The projected operator (for the internal part of the variance). */
  operator: LinearOperator;
  /** The sampled basis before expansion (batches draw from it). */
  sampledBasis?: Basis;
  samples?: SampleSet;
  /** Solve another basis the same way as the main solve (batches). */
  solveOn?: (b: Basis) => Promise<{ energy: number; residual: number }>;
}

/** Error of `energy` against `reference`. */
export function energyError(energy: number, reference: number): EnergyError {
  return { absolute: energy - reference, relative: (energy - reference) / Math.abs(reference || 1) };
}

/** Compute the requested analysis of the lowest state; returns the report keys and their timings. */
export async function analyzeLowest(input: AnalysisInput, opts: AnalysisOptions): Promise<{ keys: Partial<AnalysisReport>; timings: Record<string, number> }> {
  const keys: Partial<AnalysisReport> = {};
  const timings: Record<string, number> = {};
  const { basis, eigen, operator } = input;
  const psi = eigen.vectors[0]!;
  const energy = eigen.values[0]!;
  if (opts.estimate) {
    const t0 = performance.now();
    const est = varianceAndPt2(basis, groupByFlipMask(input.hamiltonian, basis.nWords), operator, psi, {
      sector: compileSector(input.sector, basis.qubits, basis.nWords),
      parts: opts.parts,
    });
    timings.estimate = (performance.now() - t0) / 1000;
    keys.variance = est.variance;
    keys.pt2 = est.pt2;
    keys.bounds = energyBounds(energy, est.variance, { gap: opts.gap, secondRitz: eigen.values.length > 1 ? eigen.values[1] : undefined });
    keys.estimate = {
      energy: est.energy,
      energyPt2: energy + est.pt2,
      sigma: Math.sqrt(Math.max(0, est.variance)),
      internalVariance: est.internalVariance,
      externalWeight: est.externalWeight,
      external: est.external,
      singular: est.singular,
      outsideSector: est.outsideSector,
    };
  }
  if (opts.reference) {
    keys.reference = opts.reference;
    keys.error = energyError(energy, opts.reference.energy);
    if (keys.pt2 !== undefined) keys.error.pt2Corrected = energyError(energy + keys.pt2, opts.reference.energy);
  }
  if (opts.observe || opts.observables) {
    const t0 = performance.now();
    keys.observables = { ...stateObservables(basis, psi, operator.complex, { pauli: opts.observables }), caveat: OBSERVABLE_CAVEAT };
    timings.observables = (performance.now() - t0) / 1000;
  }
  if (opts.sampling && input.samples) keys.sampling = sampleDiagnostics(input.samples);
  if (opts.batches && input.solveOn) {
    const t0 = performance.now();
    const { count, size, seed } = opts.batches;
    const bases = resampleBatches(input.sampledBasis ?? basis, count, size, seed);
    const solved: Array<{ energy: number; residual: number }> = [];
    for (const b of bases) solved.push(await input.solveOn(b));
    const energies = solved.map((s) => s.energy);
    const mean = energies.reduce((a, b) => a + b, 0) / energies.length;
    const std = energies.length > 1 ? Math.sqrt(energies.reduce((a, e) => a + (e - mean) ** 2, 0) / (energies.length - 1)) : 0;
    keys.batches = {
      count,
      size,
      seed,
      dimensions: bases.map((b) => b.dim),
      energies,
      residuals: solved.map((s) => s.residual),
      mean,
      std,
      min: Math.min(...energies),
      max: Math.max(...energies),
    };
    timings.batches = (performance.now() - t0) / 1000;
  }
  return { keys, timings };
}
