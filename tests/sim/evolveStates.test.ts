import { describe, expect, it } from 'vitest';
import { evolveStates } from '../../src/sim/evolveStates.js';
import { createState, normSquared } from '../../src/sim/stateVector.js';
import { denseFromPauliSum } from '../helpers.js';
import { expmEvolve } from './expmReference.js';
import { cloneState, distance, randomPauliSum, randomState } from './simHelpers.js';
import type { EvolutionMethod } from '../../src/sim/evolveStates.js';
import type { PauliSum } from '../../src/operators/pauliSum.js';

/** States at times k·dt, copied out of the generator. */
function trajectory(h: PauliSum, psi0: ReturnType<typeof randomState>, method: EvolutionMethod, dt: number, steps: number, trotterSteps = 1) {
  const out = [];
  for (const s of evolveStates(h, cloneState(psi0), { method, dt, steps, trotterSteps, energy: true })) out.push({ ...s, state: cloneState(s.state) });
  return out;
}

describe('evolveStates', () => {
  it('evolveStates exact matches mathjs expm of the dense Hamiltonian (real and complex, to 1e-10)', () => {
    for (const [n, complex, seed] of [[4, false, 1], [5, true, 2], [3, true, 3]] as const) {
      const h = randomPauliSum(n, 10, seed, complex);
      const psi0 = randomState(n, seed + 100);
      const dense = denseFromPauliSum(h, n);
      for (const s of trajectory(h, psi0, 'exact', 0.7, 4)) {
        // Outside reference: mathjs expm.
        const ref = expmEvolve(dense, psi0, s.time);
        expect(distance(s.state, ref), `n=${n} t=${s.time}`).toBeLessThan(1e-10);
      }
    }
  });

  it('evolveStates exact keeps the norm and ⟨H⟩ (unitary, energy-conserving) over long times', () => {
    const h = randomPauliSum(6, 14, 7, true);
    const traj = trajectory(h, randomState(6, 8), 'exact', 2.5, 5);
    for (const s of traj) {
      expect(Math.abs(normSquared(s.state) - 1)).toBeLessThan(1e-11);
      expect(Math.abs(s.energy!.mean - traj[0]!.energy!.mean)).toBeLessThan(1e-10);
      expect(Math.abs(s.energy!.spread - traj[0]!.energy!.spread)).toBeLessThan(1e-9);
    }
  });

  it('evolveStates trotter1 and trotter2 one-step errors shrink as h² and h³ (common practice, local error)', () => {
    const n = 4;
    const h = randomPauliSum(n, 9, 11, true);
    const psi0 = randomState(n, 12);
    const dense = denseFromPauliSum(h, n);
    const oneStep = (method: EvolutionMethod, step: number): number => {
      const [, s] = trajectory(h, psi0, method, step, 2);
      return distance(s!.state, expmEvolve(dense, psi0, step));
    };
    const r1 = oneStep('trotter1', 0.04) / oneStep('trotter1', 0.02);
    const r2 = oneStep('trotter2', 0.04) / oneStep('trotter2', 0.02);
    expect(r1).toBeGreaterThan(3.6);
    expect(r1).toBeLessThan(4.4);
    expect(r2).toBeGreaterThan(7.2);
    expect(r2).toBeLessThan(8.8);
  });

  it('evolveStates Trotter evolution converges to exact as --trotter-steps grows, second order faster', () => {
    const h = randomPauliSum(5, 10, 21, false);
    const psi0 = randomState(5, 22);
    const exact = trajectory(h, psi0, 'exact', 0.5, 3)[2]!.state;
    const err = (m: EvolutionMethod, steps: number) => distance(trajectory(h, psi0, m, 0.5, 3, steps)[2]!.state, exact);
    const e1 = [err('trotter1', 4), err('trotter1', 16)];
    const e2 = [err('trotter2', 4), err('trotter2', 16)];
    expect(e1[1]!).toBeLessThan(e1[0]! / 3);
    expect(e2[1]!).toBeLessThan(e2[0]! / 12);
    expect(e2[1]!).toBeLessThan(e1[1]!);
  });

  it('evolveStates Trotter circuits are unitary', () => {
    const h = randomPauliSum(6, 12, 31, true);
    for (const m of ['trotter1', 'trotter2'] as const) {
      for (const s of trajectory(h, randomState(6, 32), m, 0.9, 4, 3)) expect(Math.abs(normSquared(s.state) - 1)).toBeLessThan(1e-12);
    }
  });

  it('evolveStates yields k·dt for k = 0..steps−1, starting with the untouched initial state', () => {
    const h = randomPauliSum(3, 4, 41, false);
    const psi = createState(3);
    psi.re[5] = 1;
    const times = [];
    for (const s of evolveStates(h, psi, { method: 'trotter2', dt: 0.1, steps: 4 })) {
      if (s.k === 0) expect(s.state.re[5]).toBe(1);
      times.push(s.time);
    }
    expect(times).toEqual([0, 0.1, 0.2, 0.3]);
  });
});
