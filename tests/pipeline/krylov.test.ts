import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { krylov } from '../../src/pipeline/krylov.js';
import type { ComplexMatrix } from '../../src/solvers/complexMatrix.js';
import { addHermitianNoise, closeTo, heisenbergKrylov, tempDir } from '../helpers.js';

const pairs = (a: ComplexMatrix): number[][][] => Array.from({ length: a.n }, (_, j) => Array.from({ length: a.n }, (_, k) => [a.re[j * a.n + k]!, a.im[j * a.n + k]!]));
const constant = (n: number, x: number): number[][] => Array.from({ length: n }, () => new Array<number>(n).fill(x));

describe('krylov', () => {
  it('krylov on noisy matrices of a 6-site chain: plateau energy within the bootstrap spread, unregularised far off', async () => {
    // r = 20 Krylov vectors of a 6-site Heisenberg chain (14 reachable eigenvalues), noise σ_S = 1e-3
    // and σ_H = 15σ_S (Σ|c_P| = 15; common practice for Hadamard-test noise on H̃). Exact energy: ml-matrix.
    const fx = await heisenbergKrylov(6, 0.3, 20);
    const dir = tempDir();
    const sigma = 1e-3;
    let inside = 0;
    let farOff = 0;
    for (let seed = 1; seed <= 5; seed++) {
      const file = join(dir, `k${seed}.json`);
      const h = addHermitianNoise(fx.h, 15 * sigma, seed);
      const s = addHermitianNoise(fx.s, sigma, 100 + seed);
      writeFileSync(file, JSON.stringify({ h: pairs(h), s: pairs(s), hErr: constant(20, 15 * sigma), sErr: constant(20, sigma) }));
      const { report } = await krylov({ source: { matrices: file }, bootstrap: 200, seed: 1 });
      const b = report.bootstrap!;
      expect(report.thresholdSource).toBe('plateau');
      expect(report.plateau!.energy).toBe(report.energies[0]);
      expect(report.plateau!.threshold).toBe(report.threshold);
      expect(report.threshold).toBeGreaterThanOrEqual(report.noiseFloor);
      // Every seed within 4 bootstrap standard deviations; most inside the central 95%.
      closeTo(report.energies[0]!, fx.exactGround, 4 * b.std, `seed ${seed} plateau energy`);
      if (fx.exactGround >= b.low && fx.exactGround <= b.high) inside++;
      if (Math.abs(report.unregularised.energies[0]! - fx.exactGround) > 20 * b.std) farOff++;
      expect(report.dimensionScan.length).toBe(20);
    }
    expect(inside).toBeGreaterThanOrEqual(4);
    expect(farOff).toBeGreaterThanOrEqual(4);
  });

  it('krylov on noise-free matrices picks a plateau at the exact energy and honours a given threshold', async () => {
    const fx = await heisenbergKrylov(4, 0.3, 10);
    const dir = tempDir();
    const file = join(dir, 'k.json');
    writeFileSync(file, JSON.stringify({ h: pairs(fx.h), s: pairs(fx.s) }));
    const { report } = await krylov({ source: { matrices: file }, eigs: 2 });
    expect(report.keptDimension).toBe(5);
    closeTo(report.energies[0]!, fx.exactGround, 1e-8, 'plateau E0');
    expect(report.residuals[0]!).toBeLessThan(1e-6);
    const given = await krylov({ source: { matrices: file }, threshold: 0.5, relative: true });
    expect(given.report.thresholdSource).toBe('given');
    closeTo(given.report.relativeThreshold, 0.5, 1e-15, 'relative threshold');
    expect(given.report.keptDimension).toBeLessThan(5);
    expect(given.report.energies[0]!).toBeGreaterThan(fx.exactGround); // variational
  });
});
