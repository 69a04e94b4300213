import { PauliSumBuilder } from '../pauliSum.js';
import { buildLattice, describeLattice, type LatticeSpec } from './lattice.js';
import type { ModelHamiltonian } from './modelHamiltonian.js';

/** Couplings of the Heisenberg / XXZ model with an optional next-nearest (J1–J2) shell. */
export interface HeisenbergParams {
  lattice: LatticeSpec;
  /** Nearest-neighbour exchange in the xy plane. */
  j: number;
  /** Nearest-neighbour exchange along z (XXZ anisotropy); defaults to `j`. */
  jz?: number;
  /** Next-nearest-neighbour exchange in the xy plane. */
  j2?: number;
  /** Next-nearest-neighbour exchange along z; defaults to `j2`. */
  j2z?: number;
  /** Write σ·σ (Pauli matrices) instead of S·S with S = σ/2. */
  pauli?: boolean;
}

/**
 * H = Σ_⟨ij⟩ [J (SˣSˣ + SʸSʸ) + Jz SᶻSᶻ] + Σ_⟨⟨ij⟩⟩ [J2 (SˣSˣ + SʸSʸ) + J2z SᶻSᶻ] with S = σ/2
 * (or σ itself when `pauli`), as a Pauli sum on one qubit per site.
 */
export function heisenbergModel(p: HeisenbergParams): ModelHamiltonian {
  const lattice = buildLattice(p.lattice);
  const jz = p.jz ?? p.j;
  const j2 = p.j2 ?? 0;
  const j2z = p.j2z ?? j2;
  // S^a S^a = σ^a σ^a / 4.
  const f = p.pauli ? 1 : 0.25;
  const b = new PauliSumBuilder(lattice.sites);
  const bond = (pairs: Array<[number, number]>, jxy: number, jzz: number): void => {
    for (const [i, k] of pairs) {
      if (jxy !== 0) {
        b.add(f * jxy, [['X', i], ['X', k]]);
        b.add(f * jxy, [['Y', i], ['Y', k]]);
      }
      if (jzz !== 0) b.add(f * jzz, [['Z', i], ['Z', k]]);
    }
  };
  bond(lattice.nearest, p.j, jz);
  if (j2 !== 0 || j2z !== 0) bond(lattice.nextNearest, j2, j2z);
  const ops = p.pauli ? 'sigma (Pauli matrices)' : 'S = sigma/2';
  return {
    hamiltonian: b.finish(true),
    header: [
      `Heisenberg/XXZ model on a ${describeLattice(lattice)}`,
      `H = sum_<ij> [J (Sx Sx + Sy Sy) + Jz Sz Sz] + sum_<<ij>> [J2 (Sx Sx + Sy Sy) + J2z Sz Sz], with ${ops}`,
      `J = ${p.j}, Jz = ${jz}, J2 = ${j2}, J2z = ${j2z}`,
      `Neel reference: --initial neel (odd qubits up); its sector: --weight ${Math.floor(lattice.sites / 2)}`,
    ],
    lattice,
  };
}
