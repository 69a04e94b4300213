import { heisenbergModel, type HeisenbergParams } from './heisenberg.js';
import { hubbardModel, type HubbardParams } from './hubbard.js';
import { isingModel, type IsingParams } from './ising.js';
import type { ModelHamiltonian } from './modelHamiltonian.js';

/** A model family with its parameters, as `bitspan model` receives it. */
export type ModelSpec =
  | ({ family: 'heisenberg' } & HeisenbergParams)
  | ({ family: 'ising' } & IsingParams)
  | ({ family: 'hubbard' } & HubbardParams);

/** Build the Pauli sum and header of any model family. */
export function buildModel(spec: ModelSpec): ModelHamiltonian {
  switch (spec.family) {
    case 'heisenberg':
      return heisenbergModel(spec);
    case 'ising':
      return isingModel(spec);
    case 'hubbard':
      return hubbardModel(spec);
  }
}
