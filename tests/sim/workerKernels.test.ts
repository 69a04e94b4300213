import { describe, expect, it } from 'vitest';
import { fullSpaceOperator } from '../../src/sim/fullSpaceOperator.js';
import { LocalKernels } from '../../src/sim/simKernels.js';
import { WorkerKernels, memberRange } from '../../src/sim/workerKernels.js';
import { ChebyshevPropagator } from '../../src/sim/chebyshevPropagator.js';
import { TrotterPropagator } from '../../src/sim/trotterPropagator.js';
import { gershgorinBounds } from '../../src/sim/spectralBounds.js';
import { createState, type StateVector } from '../../src/sim/stateVector.js';
import { randomPauliSum, randomState } from './simHelpers.js';

function sharedCopy(s: StateVector): StateVector {
  const c = createState(s.qubits, true);
  c.re.set(s.re);
  c.im.set(s.im);
  return c;
}

describe('WorkerKernels', () => {
  it('WorkerKernels on three threads give bit-identical states and moments to LocalKernels', async () => {
    const n = 14;
    const h = randomPauliSum(n, 30, 77, true);
    const local = new LocalKernels(fullSpaceOperator(h, n));
    const op = fullSpaceOperator(h, n, true);
    const pool = await WorkerKernels.start(op, 3);
    try {
      const a = randomState(n, 1);
      const b = sharedCopy(a);
      const bounds = gershgorinBounds(op);
      new ChebyshevPropagator(op, local, bounds).step(a, 0.3);
      new ChebyshevPropagator(op, pool, bounds, true).step(b, 0.3);
      expect(Array.from(b.re)).toEqual(Array.from(a.re));
      expect(Array.from(b.im)).toEqual(Array.from(a.im));
      new TrotterPropagator(op, local, 2, 0.1).step(a, 2);
      new TrotterPropagator(op, pool, 2, 0.1, true).step(b, 2);
      expect(Array.from(b.re)).toEqual(Array.from(a.re));
      expect(Array.from(b.im)).toEqual(Array.from(a.im));
      const ml = local.energyMoments(a);
      const mp = pool.energyMoments(b);
      expect(Math.abs(mp.first - ml.first)).toBeLessThan(1e-12);
      expect(Math.abs(mp.second - ml.second)).toBeLessThan(1e-11);
    } finally {
      pool.close();
    }
  });

  it('memberRange splits rows into aligned, disjoint, covering ranges', () => {
    for (const [n, members] of [[2 ** 14, 3], [2 ** 20, 2], [4096, 4], [100, 2]] as const) {
      let next = 0;
      for (let m = 0; m < members; m++) {
        const [lo, hi] = memberRange(n, members, m);
        expect(lo).toBe(next);
        expect(lo % 4096 === 0 || lo === n).toBe(true);
        next = hi;
      }
      expect(next).toBe(n);
    }
  });
});
