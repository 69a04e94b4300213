import { describe, expect, it } from 'vitest';
import { dimensionScan } from '../../src/analysis/dimensionScan.js';
import { closeTo, heisenbergKrylov } from '../helpers.js';

describe('dimensionScan', () => {
  it('dimensionScan: one entry per leading block, E0 non-increasing and exact at the reachable dimension', async () => {
    const fx = await heisenbergKrylov(4, 0.3, 7);
    const scan = dimensionScan(fx.h, fx.s, 1e-10, 2);
    expect(scan.map((p) => p.dimension)).toEqual([1, 2, 3, 4, 5, 6, 7]);
    expect(scan[0]!.energies.length).toBe(1); // one vector, one energy
    // Nested Krylov spaces: E0 never rises (Courant–Fischer) and stays above the exact value.
    for (let i = 1; i < scan.length; i++) expect(scan[i]!.energies[0]!).toBeLessThanOrEqual(scan[i - 1]!.energies[0]! + 1e-9);
    for (const p of scan) expect(p.energies[0]!).toBeGreaterThanOrEqual(fx.exactGround - 1e-9);
    closeTo(scan[4]!.energies[0]!, fx.exactGround, 1e-8, 'E0 at r′ = 5');
    // Beyond the reachable dimension S is singular and the threshold removes the null directions.
    expect(scan[6]!.keptDimension).toBe(5);
  });
});
