import type { ScanPoint } from './thresholdScan.js';

/** The stable stretch of a threshold scan and the threshold chosen from it. */
export interface Plateau {
  /** Chosen threshold (absolute): the smallest threshold of the plateau. */
  threshold: number;
  relativeThreshold: number;
  /** Lowest energy at the chosen threshold. */
  energy: number;
  keptDimension: number;
  /** Threshold range of the plateau (absolute) and its number of scan points. */
  from: number;
  to: number;
  points: number;
  /** Largest spread of the lowest energy allowed within the plateau. */
  tolerance: number;
  /** Thresholds below this were not considered. */
  floor: number;
  /** Whether the run reached the required length (else it is just the longest run found). */
  long: boolean;
}

/**
 * The plateau of a scan (ascending thresholds). Only points at or above `floor` that keep at least
 * one direction count. From each such point a run extends upward while the lowest energies of its
 * points stay within `tolerance` of each other (max − min). The plateau is the first run, going up
 * from the floor, of at least `minPoints` points; if none is that long, the longest run (ties: the
 * smaller thresholds). The chosen threshold is the run's smallest. Why not simply the longest: a
 * Krylov estimate can stall over a stretch of thresholds before improving again, and a stall far
 * above the noise floor is not converged; the energy is variational in the kept directions, so the
 * stable run nearest the noise floor is the most converged one. Null when no point is eligible.
 */
export function findPlateau(scan: ScanPoint[], tolerance: number, floor: number, minPoints = 1): Plateau | null {
  const ok = (p: ScanPoint): boolean => p.threshold >= floor && p.energies.length > 0;
  let bestStart = -1;
  let bestLength = 0;
  for (let i = 0; i < scan.length; i++) {
    if (!ok(scan[i]!)) continue;
    let lo = scan[i]!.energies[0]!;
    let hi = lo;
    let j = i + 1;
    for (; j < scan.length && ok(scan[j]!); j++) {
      const e = scan[j]!.energies[0]!;
      const nlo = Math.min(lo, e);
      const nhi = Math.max(hi, e);
      if (nhi - nlo > tolerance) break;
      lo = nlo;
      hi = nhi;
    }
    if (j - i >= minPoints) {
      bestLength = j - i;
      bestStart = i;
      break;
    }
    if (j - i > bestLength) {
      bestLength = j - i;
      bestStart = i;
    }
  }
  if (bestStart < 0) return null;
  const first = scan[bestStart]!;
  return {
    threshold: first.threshold,
    relativeThreshold: first.relativeThreshold,
    energy: first.energies[0]!,
    keptDimension: first.keptDimension,
    from: first.threshold,
    to: scan[bestStart + bestLength - 1]!.threshold,
    points: bestLength,
    tolerance,
    floor,
    long: bestLength >= minPoints,
  };
}

/**
 * Default plateau tolerance: twice the median first-order energy error of the eligible points when
 * element errors are known, else 1e-6·max(1, |E|) (enough for noise-free matrices).
 */
export function defaultPlateauTolerance(scan: ScanPoint[], floor: number): number {
  const eligible = scan.filter((p) => p.threshold >= floor && p.energies.length > 0);
  const errors = eligible.map((p) => p.energyError).filter((e): e is number => e !== null && Number.isFinite(e)).sort((a, b) => a - b);
  if (errors.length > 0) {
    const mid = errors.length >> 1;
    const median = errors.length % 2 ? errors[mid]! : 0.5 * (errors[mid - 1]! + errors[mid]!);
    if (median > 0) return 2 * median;
  }
  const scale = eligible.reduce((m, p) => Math.max(m, Math.abs(p.energies[0]!)), 1);
  return 1e-6 * scale;
}
