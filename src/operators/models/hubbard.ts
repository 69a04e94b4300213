import { formatBitstring, wordsFor } from '../../bits/packed.js';
import { PauliSumBuilder } from '../pauliSum.js';
import { buildLattice, describeLattice, type LatticeSpec } from './lattice.js';
import type { ModelHamiltonian } from './modelHamiltonian.js';

/** Parameters of the Fermi–Hubbard model. */
export interface HubbardParams {
  lattice: LatticeSpec;
  /** Nearest-neighbour hopping. */
  t: number;
  /** On-site repulsion. */
  u: number;
  /** Chemical potential. */
  mu?: number;
}

/**
 * H = −t Σ_⟨ij⟩σ (c†ᵢσ cⱼσ + h.c.) + U Σᵢ nᵢ↑ nᵢ↓ − μ Σᵢσ nᵢσ under Jordan–Wigner with spin-up of
 * site i on qubit i and spin-down on qubit L + i; an occupied mode is a 1 bit.
 */
export function hubbardModel(p: HubbardParams): ModelHamiltonian {
  const lattice = buildLattice(p.lattice);
  const L = lattice.sites;
  const mu = p.mu ?? 0;
  const b = new PauliSumBuilder(2 * L);
  for (const offset of [0, L]) {
    for (const [i, k] of lattice.nearest) {
      // c†_i c_k + c†_k c_i = ½ (X_i Z_{i+1..k−1} X_k + Y_i Z_{i+1..k−1} Y_k) for i < k: the string
      // runs between the two modes whatever their distance, so a wrap-around bond (0, L−1) carries
      // the parity of every site in between, which is its Jordan–Wigner sign.
      const string: Array<['Z', number]> = [];
      for (let q = i + 1; q < k; q++) string.push(['Z', offset + q]);
      if (p.t !== 0) {
        b.add(-p.t / 2, [['X', offset + i], ...string, ['X', offset + k]]);
        b.add(-p.t / 2, [['Y', offset + i], ...string, ['Y', offset + k]]);
      }
    }
  }
  for (let i = 0; i < L; i++) {
    // n = (1 − Z)/2, so n↑n↓ = ¼ (1 − Z↑ − Z↓ + Z↑Z↓).
    if (p.u !== 0) {
      b.add(p.u / 4, []);
      b.add(-p.u / 4, [['Z', i]]);
      b.add(-p.u / 4, [['Z', L + i]]);
      b.add(p.u / 4, [['Z', i], ['Z', L + i]]);
    }
    if (mu !== 0) {
      for (const q of [i, L + i]) {
        b.add(-mu / 2, []);
        b.add(mu / 2, [['Z', q]]);
      }
    }
  }
  return {
    hamiltonian: b.finish(true),
    header: [
      `Fermi-Hubbard model on a ${describeLattice(lattice)}`,
      'H = -t sum_<ij>,s (c+_is c_js + h.c.) + U sum_i n_iu n_id - mu sum_is n_is, Jordan-Wigner',
      `spin-up of site i on qubit i (0..${L - 1}), spin-down on qubit ${L}+i (${L}..${2 * L - 1}); 1 = occupied`,
      `t = ${p.t}, U = ${p.u}, mu = ${mu}`,
      `half-filled Neel reference (up on even sites, down on odd sites): ${hubbardNeel(L)}`,
      `its sector: --weight 0-${L - 1}=${Math.ceil(L / 2)} --weight ${L}-${2 * L - 1}=${Math.floor(L / 2)}`,
    ],
    lattice,
  };
}

/** Spin-up electrons on even sites and spin-down on odd sites, as a bitstring (qubit 0 rightmost). */
export function hubbardNeel(sites: number): string {
  const n = 2 * sites;
  const words = new Uint32Array(wordsFor(n));
  for (let i = 0; i < sites; i++) {
    const q = i % 2 === 0 ? i : sites + i;
    words[q >>> 5]! |= 1 << (q & 31);
  }
  return formatBitstring(words, 0, n);
}
