import { BitspanError } from '../errors.js';
import type { Basis } from '../bits/basis.js';
import { ConfigTable } from '../bits/configTable.js';
import type { SampleSet } from '../io/readSamples.js';
import type { LanczosResult } from '../solvers/lanczos.js';
import { occupations, probabilities } from '../sectors/occupations.js';
import { buildProductSpace, planProductSpace } from '../sectors/productSpace.js';
import { repairSamples, type RepairAccount } from '../sectors/repair.js';
import { compileSector, sectorViolation, type Sector } from '../sectors/sector.js';
import { selectSubspace, type SubspaceReport } from '../sectors/selectSubspace.js';

/** One solve of the repair loop. */
export interface RepairRound {
  /** Off-sector shots moved into the sector this round. */
  recovered: number;
  /** Lowest energy on this round's subspace. */
  energy: number;
  residual: number;
  /** Distinct off-sector configurations repaired. */
  recoveredConfigs: number;
  /** Subspace dimension of the round. */
  dimension: number;
  /** Configurations of the subspace not among the sampled in-sector ones. */
  newConfigs: number;
}

/** The `repair` entry of a report. */
export interface RepairReport {
  rounds: RepairRound[];
  /** Whether the energy stopped changing before the round limit. */
  converged: boolean;
  /** The round (1-based) whose subspace the report describes: the one of lowest energy. */
  chosenRound: number;
  offSector: { configs: number; shots: number };
  unrecoverable: { configs: number; shots: number };
  /** Where the first round's orbital occupations came from. */
  occupationsFrom: 'in-sector samples' | 'all samples';
  seed: number;
}

/** The `productSpace` entry of a report. */
export interface ProductSpaceReport {
  alphaStrings: number;
  betaStrings: number;
  dimension: number;
  /** Determinants selected from the samples before the closure. */
  sampledDimension: number;
  symmetric: boolean;
}

/** How to turn samples into a subspace. */
export interface SubspaceOptions {
  sector: Sector;
  minCount?: number;
  maxDim?: number;
  /** Repair off-sector samples and iterate (solve → occupations → repair → solve). */
  repair?: { rounds: number; seed: number; tol: number };
  /** Close the subspace under spin-up × spin-down combination (determinants of `orbitals` orbitals). */
  productSpace?: { orbitals: number; memoryBudget: number };
  /** Progress lines, e.g. the product-space dimension before a long build. */
  log?: (line: string) => void;
}

/** What a projection step must return for the loop to go on. */
export interface SolvedProjection {
  eigen: LanczosResult;
  complex?: boolean;
  timings: { build: number; solve: number };
}

/** The final subspace, its projection and what happened on the way. */
export interface SubspaceRun<P extends SolvedProjection> {
  basis: Basis;
  report: SubspaceReport;
  projection: P;
  repair: RepairReport | undefined;
  productSpace: ProductSpaceReport | undefined;
  timings: { filter: number; build: number; solve: number };
}

/**
 * Select the subspace from the samples and solve on it with `project`. With repair, off-sector
 * configurations are moved into the sector guided by orbital occupations — first from the
 * in-sector samples, then from each round's ground state — until the lowest energy changes by
 * less than `tol`·max(1, |E|) or the round limit is reached; the round of lowest energy is returned.
 */
export function solveSubspace<P extends SolvedProjection>(samples: SampleSet, opts: SubspaceOptions, project: (basis: Basis) => P): SubspaceRun<P> {
  const timings = { filter: 0, build: 0, solve: 0 };
  let productSpace: ProductSpaceReport | undefined;
  const once = (set: SampleSet): { basis: Basis; report: SubspaceReport; projection: P } => {
    const t0 = performance.now();
    let selected: ReturnType<typeof selectSubspace>;
    try {
      selected = selectSubspace(set, { sector: opts.sector, minCount: opts.minCount, maxDim: opts.maxDim });
    } catch (e) {
      // Everything off-sector is exactly what repair is for: say so.
      if (e instanceof BitspanError && e.code === 'empty-subspace' && !opts.repair && opts.sector.weights.length > 0) {
        throw new BitspanError(e.code, e.message, `${e.hint}; or pass --repair to move off-sector shots into the sector`, { file: e.file, line: e.line });
      }
      throw e;
    }
    let basis = selected.basis;
    if (opts.productSpace) {
      const plan = planProductSpace(basis, opts.productSpace.orbitals);
      opts.log?.(`product space: ${plan.alphaStrings} spin-up × ${plan.betaStrings} spin-down strings = ${plan.dimension} determinants (from ${basis.dim} sampled)`);
      if (plan.basisBytes > opts.productSpace.memoryBudget) {
        throw new BitspanError(
          'too-large',
          `the spin-up × spin-down closure has ${plan.dimension} determinants (${plan.alphaStrings} × ${plan.betaStrings}); its basis alone needs ${(plan.basisBytes / 2 ** 30).toFixed(2)} GiB, over the ${(opts.productSpace.memoryBudget / 2 ** 30).toFixed(2)} GiB budget`,
          'drop --product-space, thin the samples (--min-count, --max-dim), or raise --memory',
        );
      }
      productSpace = { alphaStrings: plan.alphaStrings, betaStrings: plan.betaStrings, dimension: plan.dimension, sampledDimension: basis.dim, symmetric: plan.symmetric };
      basis = buildProductSpace(plan, basis);
    }
    timings.filter += (performance.now() - t0) / 1000;
    const projection = project(basis);
    timings.build += projection.timings.build;
    timings.solve += projection.timings.solve;
    return { basis, report: selected.report, projection };
  };

  if (!opts.repair) return { ...once(samples), repair: undefined, productSpace, timings };

  const { rounds: maxRounds, seed, tol } = opts.repair;
  const sector = compileSector(opts.sector, samples.qubits, samples.nWords);
  const inSector = inSectorConfigs(samples, sector);
  let occupationsFrom: RepairReport['occupationsFrom'] = 'in-sector samples';
  let occ = occupations(inSector.states, samples.nWords, samples.qubits, inSector.counts, inSector.size);
  if (inSector.size === 0) {
    occupationsFrom = 'all samples';
    const all = mergedConfigs(samples);
    occ = occupations(all.states, samples.nWords, samples.qubits, all.counts, all.size);
  }
  const rounds: RepairRound[] = [];
  let converged = false;
  let last: { basis: Basis; report: SubspaceReport; projection: P } | undefined;
  // Every round's energy is a variational upper bound, so the lowest one is kept.
  let best: { basis: Basis; report: SubspaceReport; projection: P } | undefined;
  let chosenRound = 0;
  let account: RepairAccount | undefined;
  for (let round = 1; round <= maxRounds; round++) {
    const t0 = performance.now();
    const repaired = repairSamples(samples, sector, occ, seed + round);
    timings.filter += (performance.now() - t0) / 1000;
    account = repaired.account;
    last = once(repaired.samples);
    const { eigen } = last.projection;
    const energy = eigen.values[0]!;
    let fresh = 0;
    for (let i = 0; i < last.basis.dim; i++) if (inSector.indexOf(last.basis.states, i * last.basis.nWords) < 0) fresh++;
    if (!best || energy < best.projection.eigen.values[0]!) {
      best = last;
      chosenRound = round;
    }
    rounds.push({ recovered: account.recovered.shots, energy, residual: eigen.residuals[0]!, recoveredConfigs: account.recovered.configs, dimension: last.basis.dim, newConfigs: fresh });
    const previous = rounds.length > 1 ? rounds[rounds.length - 2]!.energy : undefined;
    if (previous !== undefined && Math.abs(energy - previous) <= tol * Math.max(1, Math.abs(energy))) {
      converged = true;
      break;
    }
    const b = last.basis;
    occ = occupations(b.states, b.nWords, b.qubits, probabilities(eigen.vectors[0]!, last.projection.complex ?? false, b.dim), b.dim);
  }
  return {
    ...best!,
    repair: { rounds, converged, chosenRound, offSector: account!.offSector, unrecoverable: account!.unrecoverable, occupationsFrom, seed },
    productSpace,
    timings,
  };
}

function inSectorConfigs(samples: SampleSet, sector: ReturnType<typeof compileSector>): ConfigTable {
  const table = new ConfigTable(samples.nWords);
  for (const g of samples.groups) {
    for (let i = 0; i < g.table.size; i++) if (sectorViolation(sector, g.table.states, i * samples.nWords) < 0) table.add(g.table.states, i * samples.nWords, g.table.counts[i]!);
  }
  return table;
}

function mergedConfigs(samples: SampleSet): ConfigTable {
  const table = new ConfigTable(samples.nWords);
  for (const g of samples.groups) for (let i = 0; i < g.table.size; i++) table.add(g.table.states, i * samples.nWords, g.table.counts[i]!);
  return table;
}
