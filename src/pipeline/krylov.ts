import { bootstrapEnergy, type BootstrapSummary } from '../analysis/bootstrapEnergy.js';
import { dimensionScan, type DimensionScanPoint } from '../analysis/dimensionScan.js';
import { overlapNoiseFloor } from '../analysis/noiseFloor.js';
import { defaultPlateauTolerance, findPlateau, type Plateau } from '../analysis/plateau.js';
import { SCAN_DEFAULTS, thresholdScan, type ScanPoint } from '../analysis/thresholdScan.js';
import { BitspanError } from '../errors.js';
import { checkKrylovMatrices, type CheckedKrylovMatrices, type MatrixChecks } from '../io/checkKrylovMatrices.js';
import { readKrylovMatrices, type KrylovSource } from '../io/krylovMatrices.js';
import { thresholdedGeneralizedEigen, type ThresholdedSolution } from '../solvers/thresholdedGeneralizedEigen.js';

/** Everything `krylov` needs; files are read here, at the edge. */
export interface KrylovOptions {
  source: KrylovSource;
  /** Threshold on the eigenvalues of S; absent: chosen from the plateau of the scan. */
  threshold?: number;
  /** Whether `threshold` is relative to the largest eigenvalue of S. */
  relative?: boolean;
  eigs?: number;
  /** Scan range relative to λ_max(S) and points per decade. */
  scanFrom?: number;
  scanTo?: number;
  scanSteps?: number;
  /** Energy spread allowed within a plateau (absolute); default from the element errors. */
  plateauTolerance?: number;
  /** Decades of threshold a plateau must span to be taken before longer ones higher up (default 0.5). */
  plateauDecades?: number;
  /** Bootstrap resamples (0: none) and their seed. */
  bootstrap?: number;
  seed?: number;
  /** Absolute tolerance of the Hermiticity/PSD checks on top of the element errors. */
  checkTolerance?: number;
}

/** Energies at one threshold with the subspace they came from. */
export interface KrylovSolutionReport {
  energies: number[];
  residuals: number[];
  keptDimension: number;
  condition: number | null;
}

/** The JSON `krylov --json` prints. */
export interface KrylovReport extends KrylovSolutionReport {
  command: 'krylov';
  input: { matrices?: string; h?: string; s?: string; hErr?: string | null; sErr?: string | null; errors: { h: boolean; s: boolean } };
  /** Krylov dimension r (H̃ and S are r×r). */
  dimension: number;
  /** Absolute threshold used for `energies`, and over λ_max(S). */
  threshold: number;
  relativeThreshold: number;
  thresholdSource: 'given' | 'plateau' | 'noise-floor';
  /** Eigenvalues of S, ascending. */
  overlapEigenvalues: number[];
  /** Thresholds below this are indistinguishable from noise (see `overlapNoiseFloor`). */
  noiseFloor: number;
  /** Keeping every positive eigenvalue of S: what a plain generalized eigensolver would give. */
  unregularised: KrylovSolutionReport;
  plateau: Plateau | null;
  scan?: ScanPoint[];
  bootstrap: BootstrapSummary | null;
  dimensionScan: DimensionScanPoint[];
  checks: MatrixChecks;
}

/** The report plus what scripts may want beyond it. */
export interface KrylovOutcome {
  report: KrylovReport;
  matrices: CheckedKrylovMatrices;
  scan: ScanPoint[];
  solution: ThresholdedSolution;
}

/**
 * Read H̃ and S, check them, scan thresholds, pick the plateau (or use the given threshold), solve
 * there, and add the unregularised solve, the Krylov dimension scan and, if asked, a bootstrap.
 */
export async function krylov(options: KrylovOptions): Promise<KrylovOutcome> {
  const raw = await readKrylovMatrices(options.source);
  const m = checkKrylovMatrices(raw, options.checkTolerance);
  const { h, s, overlap } = m;
  const r = s.n;
  const eigs = options.eigs ?? 1;
  const lambdaMax = overlap.values[r - 1]!;
  const where = 'matrices' in options.source ? options.source.matrices : options.source.s;
  if (!(lambdaMax > 0)) throw new BitspanError('bad-matrices', 'S has no positive eigenvalue', 'S_jj = ⟨ψ_j|ψ_j⟩ must be positive', { file: where });

  const steps = options.scanSteps ?? SCAN_DEFAULTS.stepsPerDecade;
  const scan = thresholdScan(h, s, { from: options.scanFrom, to: options.scanTo, stepsPerDecade: steps, eigs, overlap, hErr: raw.hErr, sErr: raw.sErr });
  const floor = overlapNoiseFloor(overlap.values, raw.sErr);
  const tolerance = options.plateauTolerance ?? defaultPlateauTolerance(scan, floor);
  const minPoints = Math.max(1, Math.round((options.plateauDecades ?? 0.5) * steps) + 1);
  const plateau = findPlateau(scan, tolerance, floor, minPoints);

  let threshold: number;
  let source: KrylovReport['thresholdSource'];
  if (options.threshold !== undefined) {
    threshold = options.relative ? options.threshold * lambdaMax : options.threshold;
    source = 'given';
  } else if (plateau) {
    threshold = plateau.threshold;
    source = 'plateau';
  } else {
    threshold = floor;
    source = 'noise-floor';
  }
  const solution = thresholdedGeneralizedEigen(h, s, { threshold, eigs, overlap });
  if (solution.keptDimension === 0) {
    throw new BitspanError('bad-argument', `threshold ${threshold} keeps no direction of S (its largest eigenvalue is ${lambdaMax})`, 'use a smaller --threshold, or --relative with a value below 1');
  }
  const unregularised = thresholdedGeneralizedEigen(h, s, { threshold: 0, eigs, overlap });

  let bootstrap: BootstrapSummary | null = null;
  if ((options.bootstrap ?? 0) > 0) {
    if (!raw.hErr && !raw.sErr) throw new BitspanError('bad-argument', '--bootstrap needs element errors', 'give "hErr"/"sErr" in the JSON, or --h-err/--s-err', { file: where });
    bootstrap = bootstrapEnergy(h, s, raw.hErr, raw.sErr, { samples: options.bootstrap!, seed: options.seed ?? 1, threshold });
  }

  const src = options.source;
  const report: KrylovReport = {
    command: 'krylov',
    input: 'matrices' in src ? { matrices: src.matrices, errors: { h: raw.hErr !== null, s: raw.sErr !== null } } : { h: src.h, s: src.s, hErr: src.hErr ?? null, sErr: src.sErr ?? null, errors: { h: raw.hErr !== null, s: raw.sErr !== null } },
    dimension: r,
    ...solutionReport(solution),
    threshold,
    relativeThreshold: threshold / lambdaMax,
    thresholdSource: source,
    overlapEigenvalues: Array.from(overlap.values),
    noiseFloor: floor,
    unregularised: solutionReport(unregularised),
    plateau,
    bootstrap,
    dimensionScan: dimensionScan(h, s, threshold, eigs),
    checks: m.checks,
  };
  return { report, matrices: m, scan, solution };
}

function solutionReport(sol: ThresholdedSolution): KrylovSolutionReport {
  return {
    energies: Array.from(sol.energies),
    residuals: Array.from(sol.residuals),
    keptDimension: sol.keptDimension,
    condition: Number.isFinite(sol.condition) ? sol.condition : null,
  };
}
