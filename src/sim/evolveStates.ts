import type { PauliSum } from '../operators/pauliSum.js';
import { ChebyshevPropagator } from './chebyshevPropagator.js';
import { fullSpaceOperator, type FullSpaceOperator } from './fullSpaceOperator.js';
import { LocalKernels, type SimKernels } from './simKernels.js';
import { gershgorinBounds } from './spectralBounds.js';
import { checkStateFits, normSquared, type StateVector } from './stateVector.js';
import { TrotterPropagator } from './trotterPropagator.js';

/** How states are advanced in time: exactly (Chebyshev) or by first/second-order Trotter circuits. */
export type EvolutionMethod = 'exact' | 'trotter1' | 'trotter2';

/** Options of `evolveStates`. */
export interface EvolutionOptions {
  method: EvolutionMethod;
  /** Time between consecutive states. */
  dt: number;
  /** Number of states: times k·dt for k = 0..steps−1. */
  steps: number;
  /** Trotter steps per dt (the state at k·dt has had k·trotterSteps steps of size dt/trotterSteps). */
  trotterSteps?: number;
  /** The compiled operator, when the caller made it (e.g. to start a worker pool on it). */
  operator?: FullSpaceOperator;
  /** Kernels bound to `operator` (a worker pool); the caller closes them. Single-thread otherwise. */
  kernels?: SimKernels;
  /** Allocate on SharedArrayBuffers (required by a worker pool). */
  shared?: boolean;
  /** Also measure ⟨H⟩ and its spread ‖Hψ − ⟨H⟩ψ‖ for every state (one product with H each). */
  energy?: boolean;
  /** Called during a step with the fraction of the step done (for progress bars). */
  onTick?: (k: number, fraction: number) => void;
}

/** One evolved state. `state` is the evolving buffer itself: copy it to keep it past the next step. */
export interface EvolvedState {
  k: number;
  time: number;
  state: StateVector;
  /** Products with H (exact) or Trotter steps spent so far. */
  work: number;
  /** ⟨ψ|H|ψ⟩ and ‖Hψ − ⟨H⟩ψ‖ (the residual of ⟨H⟩ as an eigenvalue estimate), when asked. */
  energy?: { mean: number; spread: number };
}

/** Float64Arrays of 2^n entries each method holds at once (for the memory check). */
export function evolutionArrays(method: EvolutionMethod): number {
  // state (2) + diagonal (1) + Chebyshev's two vectors (4) or the Trotter phases (2)
  return method === 'exact' ? 7 : 5;
}

/**
 * Evolve `initial` (in place) under H and yield it at times k·dt, k = 0..steps−1. Exact evolution
 * is the Chebyshev expansion between Gershgorin bounds; Trotter evolution applies the product
 * formula gate by gate. Throws `too-large` when the arrays will not fit in memory.
 */
export function* evolveStates(h: PauliSum, initial: StateVector, opts: EvolutionOptions): Generator<EvolvedState, void, void> {
  checkStateFits(initial.qubits, evolutionArrays(opts.method), opts.method === 'exact' ? 'exact evolution' : 'Trotter simulation');
  const op = opts.operator ?? fullSpaceOperator(h, initial.qubits, opts.shared);
  const kernels = opts.kernels ?? new LocalKernels(op);
  const at = (k: number, work: number): EvolvedState => {
    // k·dt to 12 digits, so reports read 1.2 rather than 1.2000000000000002.
    const e: EvolvedState = { k, time: Number((k * opts.dt).toPrecision(12)), state: initial, work };
    if (opts.energy) {
      const m = kernels.energyMoments(initial);
      const n2 = normSquared(initial);
      const mean = m.first / n2;
      e.energy = { mean, spread: Math.sqrt(Math.max(0, m.second / n2 - mean * mean)) };
    }
    return e;
  };
  try {
    const psi = initial;
    yield at(0, 0);
    if (opts.steps <= 1) return;
    if (opts.method === 'exact') {
      const g = gershgorinBounds(op);
      const c = h.constant;
      const bounds = { lower: Math.max(g.lower, c - op.normBound), upper: Math.min(g.upper, c + op.normBound) };
      const prop = new ChebyshevPropagator(op, kernels, bounds, opts.shared);
      for (let k = 1; k < opts.steps; k++) {
        prop.step(psi, opts.dt, opts.onTick && ((f: number) => opts.onTick!(k, f)));
        yield at(k, prop.matvecs);
      }
    } else {
      const m = opts.trotterSteps ?? 1;
      const prop = new TrotterPropagator(op, kernels, opts.method === 'trotter1' ? 1 : 2, opts.dt / m, opts.shared);
      for (let k = 1; k < opts.steps; k++) {
        for (let s = 0; s < m; s++) {
          prop.step(psi, 1);
          opts.onTick?.(k, (s + 1) / m);
        }
        yield at(k, k * m);
      }
    }
  } finally {
    if (!opts.kernels) kernels.close();
  }
}
