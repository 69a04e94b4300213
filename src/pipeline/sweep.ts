import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { readHamiltonian } from '../io/readHamiltonian.js';
import type { SampleSet } from '../io/readSamples.js';
import type { PauliSum } from '../operators/pauliSum.js';
import { selectSubspace } from '../sectors/selectSubspace.js';
import { LANCZOS_DEFAULTS } from '../solvers/lanczos.js';
import { extrapolate, type LinearExtrapolation } from '../analysis/extrapolate.js';
import { stateObservables } from '../analysis/observables.js';
import { sampleDiagnostics, type SampleDiagnostics } from '../analysis/sampleDiagnostics.js';
import { firstShots, randomShots } from '../analysis/subsample.js';
import { energyError, type AnalysisOptions, type EnergyError, type ReferenceEnergy } from './analyze.js';
import { expandOnce, expandsByImportance, type ExpandOptions, type ExpansionReport } from './expand.js';
import { checkRegister, resolveAnalysis, solveBasis, solveSamples, readRunSamples, type SampledRunOptions, type SolveOutcome, type SolveReport, type SubspaceSolveOptions } from './solve.js';

/** What a sweep varies: cumulative dumps, shot budget, top-K configurations, expansion steps. */
export type SweepAxis = 'groups' | 'shots' | 'top' | 'expand';

/** How the shots axis draws its budgets. */
export type SubsampleMode = 'first' | 'random';

/** Which estimate the energies are extrapolated against. */
export type ExtrapolateAgainst = 'variance' | 'pt2';

/** The estimates asked for at every point (the `--estimate` family of flags). */
export interface PointEstimates {
  gap?: number;
  reference?: number;
  exact?: boolean;
  exactMaxDim?: number;
  /** Pauli strings evaluated at every point (file path). */
  observables?: string;
  /** Per-qubit ⟨Z⟩ and correlations at every point. */
  observe?: boolean;
}

/** Everything `sweep` needs; files are read once, here. */
export interface SweepOptions extends SampledRunOptions, PointEstimates {
  hamiltonian: string;
  axis: SweepAxis;
  /** Axis values (defaults depend on the axis); sorted ascending, duplicates dropped. */
  values?: number[];
  /** Shots axis: `first` N shots (values are shot counts) or nested `random` subsamples (values are fractions). */
  subsample?: SubsampleMode;
  /** Expansion applied at every point (other axes), or the selection used along the expand axis. */
  expand?: ExpandOptions;
  /** Which fit `extrapolation` reports (default `pt2`; both are in `extrapolations`). */
  extrapolate?: ExtrapolateAgainst;
  /** Called after each point (progress). */
  onPoint?: (point: SweepPoint, index: number, total: number) => void;
}

/** One point of a sweep: a full solve report with its estimates, plus the axis value. */
export interface SweepPoint extends SolveReport {
  axis: SweepAxis;
  /** The axis value: groups used, shots (or fraction), K, or expansion steps. */
  value: number;
}

/** The extrapolated energy (`energy`, `uncertainty` null when fewer than two usable points). */
export interface SweepExtrapolation {
  energy: number | null;
  uncertainty: number | null;
  against: ExtrapolateAgainst;
  slope: number | null;
  points: number;
  /** Weighted RMS residual of the fit. */
  rms: number | null;
  weighting: 'inverse-square';
  error?: EnergyError;
}

/** The JSON `sweep --json` prints. */
export interface SweepReport {
  command: 'sweep';
  axis: SweepAxis;
  subsample: SubsampleMode | null;
  values: number[];
  points: SweepPoint[];
  /** Points that could not be solved (e.g. nothing left in the sector), with why. */
  skipped: Array<{ value: number; reason: string }>;
  extrapolation: SweepExtrapolation;
  /** Both fits, whichever was chosen. */
  extrapolations: { variance: SweepExtrapolation; pt2: SweepExtrapolation };
  /** The lowest variational energy of the sweep and where it came from. */
  best: { value: number; energy: number; residual: number; dimension: number } | null;
  reference: ReferenceEnergy | null;
  sampling: SampleDiagnostics;
  /** Per-qubit ⟨Z⟩ of the lowest state at the last point (for the profile plot). */
  profile: { value: number; dimension: number; z: number[] } | null;
  qubits: number;
  timings: Record<string, number>;
}

/** Default axis values. */
export function defaultValues(axis: SweepAxis, ctx: { groups: number; shots: number; sectorDim: number; subsample: SubsampleMode }): number[] {
  switch (axis) {
    case 'groups':
      return Array.from({ length: ctx.groups }, (_, i) => i + 1);
    case 'shots':
      return ctx.subsample === 'random' ? [0.125, 0.25, 0.5, 0.75, 1] : [0.125, 0.25, 0.5, 0.75, 1].map((f) => Math.max(1, Math.round(f * ctx.shots)));
    case 'top': {
      const out: number[] = [];
      for (let d = 5; d >= 0; d--) out.push(Math.max(1, Math.round(ctx.sectorDim / 2 ** d)));
      return out;
    }
    case 'expand':
      return [0, 1, 2];
  }
}

/** Check axis values: whole numbers in range (fractions in (0, 1] for random subsamples). */
export function checkValues(axis: SweepAxis, values: number[], ctx: { groups: number; subsample: SubsampleMode }): number[] {
  const bad = (v: number, want: string): BitspanError => new BitspanError('bad-argument', `--values: ${v} is not ${want} for --axis ${axis}`, `e.g. --values ${axis === 'shots' && ctx.subsample === 'random' ? '0.25,0.5,1' : '1,2,4'}`);
  for (const v of values) {
    if (!Number.isFinite(v)) throw bad(v, 'a number');
    if (axis === 'shots' && ctx.subsample === 'random') {
      if (!(v > 0 && v <= 1)) throw bad(v, 'a fraction in (0, 1]');
    } else if (axis === 'expand') {
      if (!Number.isInteger(v) || v < 0) throw bad(v, 'a whole number of steps (0 or more)');
    } else if (!Number.isInteger(v) || v < 1) throw bad(v, 'a positive whole number');
    if (axis === 'groups' && v > ctx.groups) throw bad(v, `at most the ${ctx.groups} dump(s) given`);
  }
  return [...new Set(values)].sort((a, b) => a - b);
}

/**
 * Solve along one axis, each point a full solve with variance, PT2 and bounds, and extrapolate the
 * lowest energy against the variance (or PT2). Cumulative axes give nested subspaces, so energies
 * do not increase along them (Cauchy interlacing), up to the Lanczos tolerance.
 */
export async function sweep(opts: SweepOptions): Promise<{ report: SweepReport; last?: SolveOutcome }> {
  const t0 = performance.now();
  const timings: Record<string, number> = {};
  const hamiltonian = await readHamiltonian(opts.hamiltonian);
  let t = performance.now();
  timings.readHamiltonian = (t - t0) / 1000;
  const subsample: SubsampleMode = opts.subsample ?? 'first';
  const samples = await readRunSamples(opts, { keepOrder: opts.axis === 'shots' && subsample === 'first' });
  timings.readSamples = (performance.now() - t) / 1000;
  checkRegister(hamiltonian, opts.hamiltonian, samples.qubits, opts.samples[0]!);
  const sector = opts.sector ?? { weights: [] };
  const settings = { eigs: opts.eigs, tol: opts.tol ?? LANCZOS_DEFAULTS.tol, seed: opts.seed ?? LANCZOS_DEFAULTS.seed, threads: opts.threads, memoryBytes: opts.memoryBytes, matrixFree: opts.matrixFree };
  const analysis: AnalysisOptions = await resolveAnalysis(
    { estimate: true, gap: opts.gap, reference: opts.reference, exact: opts.exact, exactMaxDim: opts.exactMaxDim, observables: opts.observables, observe: opts.observe },
    hamiltonian,
    samples.qubits,
    sector,
    settings,
    timings,
  );
  const totalShots = samples.groups.reduce((n, g) => n + g.shots, 0);
  const sectorDim = opts.axis === 'top' ? selectSubspace(samples, { sector, minCount: opts.minCount }).basis.dim : 0;
  const ctx = { groups: samples.groups.length, shots: totalShots, sectorDim, subsample };
  const values = checkValues(opts.axis, opts.values ?? defaultValues(opts.axis, ctx), ctx);
  const base: SubspaceSolveOptions = {
    hamiltonianFile: opts.hamiltonian,
    sector,
    minCount: opts.minCount,
    maxDim: opts.maxDim,
    ...settings,
    top: opts.top,
    qubit0: opts.qubit0,
    expand: opts.axis === 'expand' ? undefined : opts.expand,
    analysis,
  };
  const points: SweepPoint[] = [];
  const skipped: Array<{ value: number; reason: string }> = [];
  let last: SolveOutcome | undefined;
  const record = (value: number, outcome: SolveOutcome): void => {
    const point: SweepPoint = { ...outcome.report, axis: opts.axis, value };
    points.push(point);
    last = outcome;
    opts.onPoint?.(point, points.length + skipped.length - 1, values.length);
  };
  const attempt = async (value: number, run: () => Promise<SolveOutcome>): Promise<void> => {
    try {
      record(value, await run());
    } catch (e) {
      if (e instanceof BitspanError && e.code === 'empty-subspace') skipped.push({ value, reason: e.message });
      else throw e;
    }
  };
  t = performance.now();
  switch (opts.axis) {
    case 'groups':
      for (const v of values) await attempt(v, () => solveSamples(hamiltonian, { ...samples, groups: samples.groups.slice(0, v) }, base, {}));
      break;
    case 'shots':
      if (subsample === 'random') {
        const subsets = randomShots(samples, values, settings.seed);
        for (const [i, v] of values.entries()) await attempt(v, () => solveSamples(hamiltonian, nonEmpty(subsets[i]!, v), base, {}));
      } else for (const v of values) await attempt(v, () => solveSamples(hamiltonian, nonEmpty(firstShots(samples, v), v), base, {}));
      break;
    case 'top':
      for (const v of values) await attempt(v, () => solveSamples(hamiltonian, samples, { ...base, maxDim: opts.maxDim !== undefined ? Math.min(v, opts.maxDim) : v }, {}));
      break;
    case 'expand':
      await expandAxis(hamiltonian, samples, base, opts.expand ?? { steps: 0 }, values, record);
      break;
  }
  timings.points = (performance.now() - t) / 1000;
  // Default PT2: far from convergence E is not linear in the variance and that fit overshoots,
  // while E against E_PT2 stays near-linear (common practice in selected CI).
  const against = opts.extrapolate ?? 'pt2';
  const fits = {
    variance: fitAgainst(points, 'variance', analysis.reference),
    pt2: fitAgainst(points, 'pt2', analysis.reference),
  };
  let best: SweepReport['best'] = null;
  for (const p of points) if (!best || p.energies[0]! < best.energy) best = { value: p.value, energy: p.energies[0]!, residual: p.residuals[0]!, dimension: p.dimension };
  const profile = last ? { value: points[points.length - 1]!.value, dimension: last.basis.dim, z: stateObservables(last.basis, last.eigen.vectors[0]!, last.report.complex, { correlations: false }).z } : null;
  timings.total = (performance.now() - t0) / 1000;
  const report: SweepReport = {
    command: 'sweep',
    axis: opts.axis,
    subsample: opts.axis === 'shots' ? subsample : null,
    values,
    points,
    skipped,
    extrapolation: fits[against],
    extrapolations: fits,
    best,
    reference: analysis.reference ?? null,
    sampling: sampleDiagnostics(samples),
    profile,
    qubits: samples.qubits,
    timings,
  };
  return { report, last };
}

/** Expansion steps 0 … max(values), reusing each solved point for the next step. */
async function expandAxis(
  hamiltonian: PauliSum,
  samples: SampleSet,
  base: SubspaceSolveOptions,
  selection: ExpandOptions,
  values: number[],
  record: (v: number, o: SolveOutcome) => void,
): Promise<void> {
  const { basis: sampled, report } = selectSubspace(samples, { sector: base.sector, minCount: base.minCount, maxDim: base.maxDim });
  const importance = expandsByImportance(selection);
  const expansion: ExpansionReport = { mode: importance ? 'importance' : 'connected', threshold: selection.threshold ?? null, max: selection.max ?? null, sampledDimension: sampled.dim, steps: [] };
  const want = new Set(values);
  const top = values[values.length - 1] ?? 0;
  let basis: Basis = sampled;
  for (let step = 0; step <= top; step++) {
    let outcome: SolveOutcome | undefined;
    if (want.has(step) || importance) {
      const ex = { samples, sampledBasis: sampled, expansion: { ...expansion, steps: expansion.steps.slice() } };
      outcome = await solveBasis(hamiltonian, basis, report, want.has(step) ? base : { ...base, analysis: undefined }, ex, {});
      if (want.has(step)) record(step, outcome);
    }
    if (step === top) break;
    const lowest = importance && outcome ? { energy: outcome.eigen.values[0]!, psi: outcome.eigen.vectors[0]! } : undefined;
    const r = expandOnce(hamiltonian, basis, base.sector, selection, lowest);
    basis = r.basis;
    expansion.steps.push({ step: step + 1, candidates: r.candidates, added: r.added, dimension: basis.dim, ...(lowest ? { energy: lowest.energy } : {}) });
  }
}

function nonEmpty(s: SampleSet, value: number): SampleSet {
  if (s.groups.length === 0) throw new BitspanError('empty-subspace', `no shots at ${value}`, 'use a larger value');
  return s;
}

/** Weighted line through (variance or PT2, E₀) over the points, extrapolated to zero. */
function fitAgainst(points: SweepPoint[], against: ExtrapolateAgainst, reference?: ReferenceEnergy): SweepExtrapolation {
  const x = points.map((p) => (against === 'variance' ? p.variance! : p.pt2!));
  const y = points.map((p) => p.energies[0]!);
  const fit: LinearExtrapolation | null = extrapolate(x, y);
  if (!fit) return { energy: null, uncertainty: null, against, slope: null, points: 0, rms: null, weighting: 'inverse-square' };
  return {
    energy: fit.energy,
    uncertainty: fit.uncertainty,
    against,
    slope: fit.slope,
    points: fit.points,
    rms: fit.rms,
    weighting: 'inverse-square',
    ...(reference ? { error: energyError(fit.energy, reference.energy) } : {}),
  };
}
