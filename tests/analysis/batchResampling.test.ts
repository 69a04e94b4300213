import { describe, expect, it } from 'vitest';
import { makeBasis } from '../../src/bits/basis.js';
import { resampleBatches } from '../../src/analysis/batchResampling.js';

describe('resampleBatches', () => {
  it('resampleBatches draws distinct configurations by frequency, seeded, never the unsampled ones', () => {
    const dim = 50;
    const states = Uint32Array.from({ length: dim }, (_, i) => i);
    // Configuration 0 carries half the shots; 49 is an expansion configuration with zero count.
    const counts = Float64Array.from({ length: dim }, (_, i) => (i === 0 ? 490 : i === 49 ? 0 : 10));
    const basis = makeBasis(10, 1, states, dim, counts);
    const a = resampleBatches(basis, 60, 5, 3);
    const b = resampleBatches(basis, 60, 5, 3);
    expect(a.map((x) => Array.from(x.states))).toEqual(b.map((x) => Array.from(x.states)));
    let withZero = 0;
    for (const batch of a) {
      expect(batch.dim).toBe(5);
      expect(new Set(batch.states).size).toBe(5);
      expect(Array.from(batch.states)).not.toContain(49);
      if (Array.from(batch.states).includes(0)) withZero++;
    }
    // Weighted sampling without replacement: the heavy configuration is in nearly every batch of 5
    // (its first-draw probability alone is 490/970 ≈ 0.5; over five draws ≈ 0.98).
    expect(withZero / a.length).toBeGreaterThan(0.9);
    expect(resampleBatches(basis, 1, 100, 1)[0]!.dim).toBe(49);
  });
});
