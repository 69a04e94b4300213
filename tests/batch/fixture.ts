// A tiny deterministic batch scenario: an 8-site periodic Heisenberg ring and seeded samples.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { seededUniform } from '../../src/util/random.js';

export const RING_SITES = 8;

/** Text Hamiltonian of the 8-site ring, sum over bonds of X X + Y Y + Z Z (Pauli convention). */
export function ringHamiltonian(): string {
  const lines = [`qubits ${RING_SITES}`];
  for (let i = 0; i < RING_SITES; i++) {
    const j = (i + 1) % RING_SITES;
    for (const p of ['X', 'Y', 'Z']) lines.push(`1 ${p}${i} ${p}${j}`);
  }
  return lines.join('\n') + '\n';
}

/** `shots` seeded bitstrings of the 8-qubit register as a CSV dump (every weight occurs). */
export function ringSamples(seed: number, shots: number): string {
  const rng = seededUniform(seed);
  const rows = ['bitstring'];
  for (let s = 0; s < shots; s++) {
    let b = '';
    for (let q = 0; q < RING_SITES; q++) b += rng.next() < 0.5 ? '1' : '0';
    rows.push(b);
  }
  return rows.join('\n') + '\n';
}

/** Write ring.txt, t0.csv and t1.csv into `dir`. */
export function writeRingFixture(dir: string): { hamiltonian: string; samples: string[] } {
  const hamiltonian = join(dir, 'ring.txt');
  writeFileSync(hamiltonian, ringHamiltonian());
  const samples = [join(dir, 't0.csv'), join(dir, 't1.csv')];
  writeFileSync(samples[0]!, ringSamples(11, 2000));
  writeFileSync(samples[1]!, ringSamples(12, 2000));
  return { hamiltonian, samples };
}

/** A manifest over the ring fixture: 2 listed jobs and a grid of 4 (6 jobs), relative paths. */
export function ringManifest(output = 'out'): Record<string, unknown> {
  return {
    output,
    defaults: { command: 'solve', hamiltonian: 'ring.txt', samples: ['t0.csv', 't1.csv'], weight: [4] },
    jobs: [
      { name: 'full', eigs: 2 },
      { name: 'even', weight: ['0-3=2', '4-7=2'] },
    ],
    grids: [{ name: 'dim-{maxDim}', vary: { maxDim: [10, 20, 40, 60] } }],
  };
}
