import { describe, expect, it } from 'vitest';
import { makeBasis, type Basis } from '../../src/bits/basis.js';
import { buildDeterminantHamiltonian } from '../../src/build/determinantHamiltonian.js';
import { buildProjectedHamiltonian } from '../../src/build/projectedHamiltonian.js';
import { toDense, type SparseMatrix } from '../../src/build/sparseMatrix.js';
import { readFcidump } from '../../src/io/fcidump.js';
import { formatFcidump } from '../../src/io/formatFcidump.js';
import { makeIntegrals, setOneElectron, setTwoElectron } from '../../src/operators/integrals.js';
import { groupByFlipMask } from '../../src/operators/pauliSum.js';
import { electronSector } from '../../src/sectors/electronSector.js';
import { compileSector } from '../../src/sectors/sector.js';
import { lanczos } from '../../src/solvers/lanczos.js';
import { matrixOperator } from '../../src/pipeline/solve.js';
import { seededUniform } from '../../src/util/random.js';
import { fullSector } from '../../bench/molecules/fullSector.js';
import { hubbardRingIntegrals, hubbardRingPauli } from '../../bench/molecules/hubbard.js';
import { randomIntegrals } from '../denseFermions.js';
import { closeTo, tempDir, writeFiles } from '../helpers.js';

function subset(b: Basis, keep: number, seed: number): Basis {
  const rng = seededUniform(seed);
  const rows: number[] = [];
  for (let i = 0; i < b.dim; i++) if (rng.next() < keep) rows.push(i);
  const states = new Uint32Array(rows.length * b.nWords);
  rows.forEach((r, i) => states.set(b.states.subarray(r * b.nWords, (r + 1) * b.nWords), i * b.nWords));
  return makeBasis(b.qubits, b.nWords, states, rows.length);
}

function maxDifference(a: SparseMatrix, b: SparseMatrix): number {
  const x = toDense(a).re;
  const y = toDense(b).re;
  let d = 0;
  for (let i = 0; i < x.length; i++) d = Math.max(d, Math.abs(x[i]! - y[i]!));
  return d;
}

const lowest = (m: SparseMatrix): number => lanczos(matrixOperator(m), { tol: 1e-12, seed: 3 }).values[0]!;

describe('buildDeterminantHamiltonian on a Hubbard ring', () => {
  const dir = tempDir('bitspan-hubbard-');
  const cases: Array<[number, number, number, number]> = [
    [4, 4, 2, 2],
    [5, 2.5, 3, 2],
    [6, 4, 3, 3],
  ];
  for (const [sites, u, up, down] of cases) {
    it(`buildDeterminantHamiltonian from an FCIDUMP of the ${sites}-site ring (U=${u}, ${up}+${down}) equals the Jordan–Wigner qubit Hamiltonian`, async () => {
      // Reference: the ring's JW Pauli sum (written out in bench/molecules/hubbard.ts) through the
      // qubit path's own builder, on the same determinants.
      const file = writeFiles(dir, { [`ring${sites}.fcidump`]: formatFcidump(hubbardRingIntegrals(sites, 1, u), { electrons: up + down, ms2: up - down }) });
      const dump = await readFcidump(file[`ring${sites}.fcidump`]!);
      const pauli = hubbardRingPauli(sites, 1, u);
      const full = fullSector(sites, up, down);
      for (const basis of [full, subset(full, 0.5, sites)]) {
        const det = buildDeterminantHamiltonian(basis, dump.integrals);
        const jw = buildProjectedHamiltonian(basis, groupByFlipMask(pauli, basis.nWords), compileSector(electronSector(sites, up, down), basis.qubits, basis.nWords));
        expect(maxDifference(det, jw)).toBeLessThan(1e-12);
        closeTo(lowest(det), lowest(jw), 1e-10, 'ground energy, determinant vs JW');
      }
    });
  }

  it('buildDeterminantHamiltonian at U = 0 gives the free-fermion ring energy Σ −2t cos(2πk/L) over the filled levels', () => {
    // Tight-binding band of a periodic ring (common practice): ε_k = −2t cos(2πk/L), k = 0..L−1.
    const sites = 6;
    const up = 3;
    const down = 2;
    const levels = Array.from({ length: sites }, (_, k) => -2 * Math.cos((2 * Math.PI * k) / sites)).sort((a, b) => a - b);
    const fill = (n: number): number => levels.slice(0, n).reduce((s, e) => s + e, 0);
    const e = lowest(buildDeterminantHamiltonian(fullSector(sites, up, down), hubbardRingIntegrals(sites, 1, 0)));
    closeTo(e, fill(up) + fill(down), 1e-10, 'free-fermion energy');
  });

  for (const [orbitals, at] of [[20, [0, 9, 13, 19]], [40, [0, 17, 31, 39]]] as const) {
    it(`buildDeterminantHamiltonian is unchanged when the orbitals sit among ${orbitals} (${2 * orbitals} qubits, registers across word boundaries)`, () => {
      // Embedding 4 active orbitals among many empty ones changes no Jordan–Wigner sign (no occupied
      // qubit lies in between that was not there before): the matrices must agree.
      const small = randomIntegrals(4, 31);
      const big = makeIntegrals(orbitals);
      big.core = small.core;
      for (let p = 0; p < 4; p++) {
        for (let q = 0; q < 4; q++) {
          setOneElectron(big, at[p]!, at[q]!, small.h1[p * 4 + q]!);
          for (let r = 0; r < 4; r++) for (let s = 0; s < 4; s++) setTwoElectron(big, at[p]!, at[q]!, at[r]!, at[s]!, small.eri[((p * 4 + q) * 4 + r) * 4 + s]!);
        }
      }
      const basis = subset(fullSector(4, 2, 2), 0.8, 4);
      const nWords = Math.ceil((2 * orbitals) / 32);
      const wide = new Uint32Array(basis.dim * nWords);
      for (let i = 0; i < basis.dim; i++) {
        for (let q = 0; q < 8; q++) {
          if (!((basis.states[i]! >>> q) & 1)) continue;
          const t = q < 4 ? at[q]! : orbitals + at[q - 4]!;
          wide[i * nWords + (t >>> 5)]! |= 1 << (t & 31);
        }
      }
      const wideBasis = makeBasis(2 * orbitals, nWords, wide, basis.dim);
      // Both bases sort the same way (the map is monotone), so rows correspond one to one.
      expect(maxDifference(buildDeterminantHamiltonian(wideBasis, big), buildDeterminantHamiltonian(basis, small))).toBeLessThan(1e-13);
    });
  }
});
