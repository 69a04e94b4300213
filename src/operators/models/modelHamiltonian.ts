import type { PauliSum } from '../pauliSum.js';
import type { Lattice } from './lattice.js';

/** A generated model: its Pauli sum, the lines of its file header, and the lattice it lives on. */
export interface ModelHamiltonian {
  hamiltonian: PauliSum;
  /** Parameter lines for the `#` header of the written file (without the `#`). */
  header: string[];
  lattice: Lattice;
}
