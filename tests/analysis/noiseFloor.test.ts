import { describe, expect, it } from 'vitest';
import { overlapNoiseFloor } from '../../src/analysis/noiseFloor.js';
import { complexMatrix } from '../../src/solvers/complexMatrix.js';
import { hermitianEigen } from '../../src/solvers/hermitianEigen.js';
import { addHermitianNoise, closeTo, uniformErrors } from '../helpers.js';

describe('overlapNoiseFloor', () => {
  it('overlapNoiseFloor is at rounding level for a clean positive spectrum', () => {
    const floor = overlapNoiseFloor(new Float64Array([1e-9, 0.5, 2]), null);
    expect(floor).toBeLessThan(1e-13);
    expect(floor).toBeGreaterThan(0);
  });

  it('overlapNoiseFloor is at least minus the most negative eigenvalue of S', () => {
    closeTo(overlapNoiseFloor(new Float64Array([-3e-4, 1e-5, 1]), null), 3e-4, 0, 'floor');
  });

  it('overlapNoiseFloor with element errors estimates the spectral norm of the noise (Wigner semicircle edge)', () => {
    // Largest |eigenvalue| of a sampled r×r Hermitian noise matrix with element error σ (re and im)
    // should sit near 2√(r·2σ²), the semicircle edge (common practice); within 20% at r = 40.
    const r = 40;
    const sigma = 1e-3;
    const floor = overlapNoiseFloor(new Float64Array(r).fill(1), uniformErrors(r, sigma));
    for (const seed of [1, 2, 3]) {
      const noise = hermitianEigen(addHermitianNoise(complexMatrix(r), sigma, seed)).values;
      const norm = Math.max(-noise[0]!, noise[r - 1]!);
      expect(Math.abs(norm / floor - 1)).toBeLessThan(0.2);
    }
  });
});
