import { describe, expect, it } from 'vitest';
import { defaultPlateauTolerance, findPlateau } from '../../src/analysis/plateau.js';
import type { ScanPoint } from '../../src/analysis/thresholdScan.js';

/** A synthetic scan: thresholds 10^(i/10 − 6), lowest energy from the list, kept dimension given. */
function scanOf(energies: Array<number | null>, errors: number | null = null): ScanPoint[] {
  return energies.map((e, i) => ({
    threshold: 10 ** (i / 10 - 6),
    relativeThreshold: 10 ** (i / 10 - 6),
    keptDimension: e === null ? 0 : energies.length - i,
    condition: 1,
    energies: e === null ? [] : [e],
    residuals: e === null ? [] : [0],
    energyError: e === null ? null : errors,
  }));
}

describe('findPlateau', () => {
  it('findPlateau takes the first long enough stable run above the floor, not a longer stall higher up', () => {
    // Below the floor (first 3 points): garbage. Then a 6-point converged run, a drop, and a
    // 12-point stall at a higher energy.
    const e = [-50, -40, -45, -1.0, -1.0, -1.0, -1.0001, -1.0, -1.0, -0.5, ...Array(12).fill(-0.9), null];
    const scan = scanOf(e);
    const p = findPlateau(scan, 1e-3, scan[3]!.threshold, 5)!;
    expect(p.threshold).toBe(scan[3]!.threshold);
    expect(p.energy).toBe(-1.0);
    expect(p.points).toBe(6);
    expect(p.long).toBe(true);
    expect(p.to).toBe(scan[8]!.threshold);
  });

  it('findPlateau falls back to the longest run when none is long enough, ties to smaller thresholds', () => {
    const scan = scanOf([-1, -2, -2, -3, -3, -4, -4, -4, -5, -5, -5]);
    const p = findPlateau(scan, 1e-9, 0, 10)!;
    expect(p.long).toBe(false);
    expect(p.points).toBe(3);
    expect(p.energy).toBe(-4);
  });

  it('findPlateau ignores points below the floor and points that keep nothing, and is null without any', () => {
    const scan = scanOf([-9, -9, -9, -9, -2, null]);
    const p = findPlateau(scan, 1e-6, scan[4]!.threshold, 1)!;
    expect(p.energy).toBe(-2);
    expect(findPlateau(scanOf([null, null]), 1, 0, 1)).toBeNull();
  });

  it('defaultPlateauTolerance is twice the median first-order error, else 1e-6 of the energy scale', () => {
    expect(defaultPlateauTolerance(scanOf([-1, -1, -1], 0.01), 0)).toBeCloseTo(0.02, 15);
    expect(defaultPlateauTolerance(scanOf([-10, -10], null), 0)).toBeCloseTo(1e-5, 15);
  });
});
