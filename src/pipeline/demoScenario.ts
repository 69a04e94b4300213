import type { ModelSpec } from '../operators/models/buildModel.js';
import type { Sector } from '../sectors/sector.js';
import type { ShotNoise } from '../sim/sampleDump.js';
import type { EvolutionMethod } from '../sim/evolveStates.js';

/**
 * The shipped demo, a scenario of our own: the easy-axis XXZ antiferromagnet (Jz = 2J) on a
 * periodic 4×4 square lattice, evolved from the Néel state by second-order Trotter circuits and
 * read out with asymmetric readout error — ten dumps, one per evolution time, like a hardware
 * Krylov run. `npm run make-demo` writes it to fixtures/demo/; `bitspan demo` replays it.
 */
export interface DemoScenario {
  title: string;
  model: ModelSpec;
  initial: string;
  evolution: EvolutionMethod;
  dt: number;
  steps: number;
  trotterSteps: number;
  shots: number;
  noise: ShotNoise;
  seed: number;
  /** The symmetry sector `solve` and `exact` keep (the Néel state's Sz = 0). */
  sector: Sector;
}

export const DEMO_SCENARIO: DemoScenario = {
  title: 'easy-axis XXZ antiferromagnet (J = 1, Jz = 2) on a periodic 4x4 square lattice, Trotterised evolution from Neel with readout error',
  model: { family: 'heisenberg', lattice: { kind: 'square', lx: 4, ly: 4, boundary: 'periodic' }, j: 1, jz: 2 },
  initial: 'neel',
  evolution: 'trotter2',
  dt: 0.4,
  steps: 10,
  trotterSteps: 2,
  shots: 5000,
  noise: { p01: 0.01, p10: 0.02, flip: 0 },
  seed: 2024,
  sector: { weights: [{ lo: 0, hi: -1, weight: 8 }] },
};
