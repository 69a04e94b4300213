import { describe, expect, it } from 'vitest';
import { enumerateSector } from '../../src/sectors/enumerateSector.js';
import { weightIndices } from '../reference.js';

describe('enumerateSector', () => {
  it('enumerateSector lists exactly the configurations of weight, register and parity sectors', () => {
    // Sizes are binomial coefficients (common practice): C(10,5) = 252, C(4,2)·C(4,2) = 36.
    const w = enumerateSector({ weights: [{ lo: 0, hi: -1, weight: 5 }] }, 10, 1000);
    expect(Array.from(w.states)).toEqual(weightIndices(10, 5));
    const two = enumerateSector({ weights: [{ lo: 0, hi: 3, weight: 2 }, { lo: 4, hi: 7, weight: 2 }] }, 8, 1000);
    expect(two.dim).toBe(36);
    const even = enumerateSector({ weights: [], parity: 'even' }, 6, 1000);
    expect(even.dim).toBe(32);
    // A narrow register inside a wide one: prunes instead of walking 2^40 leaves.
    const wide = enumerateSector({ weights: [{ lo: 0, hi: 39, weight: 1 }] }, 40, 1000);
    expect(wide.dim).toBe(40);
  });

  it('enumerateSector throws too-large beyond the cap', () => {
    try {
      enumerateSector({ weights: [] }, 24, 1000);
      expect.unreachable();
    } catch (e) {
      expect((e as { code: string }).code).toBe('too-large');
    }
  });
});
