import { PauliSumBuilder } from '../pauliSum.js';
import { buildLattice, describeLattice, type LatticeSpec } from './lattice.js';
import type { ModelHamiltonian } from './modelHamiltonian.js';

/** Couplings of the transverse-field Ising model. */
export interface IsingParams {
  lattice: LatticeSpec;
  /** Nearest-neighbour ZZ coupling (ferromagnetic when positive). */
  j: number;
  /** Transverse field along x. */
  field: number;
  /** Next-nearest-neighbour ZZ coupling. */
  j2?: number;
  /** Longitudinal field along z. */
  hz?: number;
}

/**
 * H = −J Σ_⟨ij⟩ ZᵢZⱼ − J2 Σ_⟨⟨ij⟩⟩ ZᵢZⱼ − h Σᵢ Xᵢ − hz Σᵢ Zᵢ in Pauli matrices (the chain is critical
 * at h = J).
 */
export function isingModel(p: IsingParams): ModelHamiltonian {
  const lattice = buildLattice(p.lattice);
  const j2 = p.j2 ?? 0;
  const hz = p.hz ?? 0;
  const b = new PauliSumBuilder(lattice.sites);
  if (p.j !== 0) for (const [i, k] of lattice.nearest) b.add(-p.j, [['Z', i], ['Z', k]]);
  if (j2 !== 0) for (const [i, k] of lattice.nextNearest) b.add(-j2, [['Z', i], ['Z', k]]);
  for (let i = 0; i < lattice.sites; i++) {
    if (p.field !== 0) b.add(-p.field, [['X', i]]);
    if (hz !== 0) b.add(-hz, [['Z', i]]);
  }
  return {
    hamiltonian: b.finish(true),
    header: [
      `transverse-field Ising model on a ${describeLattice(lattice)}`,
      'H = -J sum_<ij> Z Z - J2 sum_<<ij>> Z Z - h sum_i X - hz sum_i Z, with Pauli matrices',
      `J = ${p.j}, h = ${p.field}, J2 = ${j2}, hz = ${hz}`,
    ],
    lattice,
  };
}
