/**
 * Writes fixtures/molecules/: a Hubbard ring and a hydrogen chain as FCIDUMP files, and noisy
 * sample dumps drawn from their exact ground states (see fixtures/molecules/README.md).
 * Deterministic: the same code gives byte-identical files.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { formatFcidump } from '../src/io/formatFcidump.js';
import type { Integrals } from '../src/operators/integrals.js';
import { projectDeterminants } from '../src/pipeline/projectDeterminants.js';
import { fullSector } from './molecules/fullSector.js';
import { hubbardRingIntegrals } from './molecules/hubbard.js';
import { hydrogenChain } from './molecules/hydrogenChain.js';
import { noisySamples, samplesCsv } from './molecules/noisySamples.js';

const dir = process.argv[2] ?? join('fixtures', 'molecules');
mkdirSync(dir, { recursive: true });

function write(name: string, ints: Integrals, electrons: number, shots: number, flip: number, seed: number): void {
  const m = ints.orbitals;
  writeFileSync(join(dir, `${name}.fcidump`), formatFcidump(ints, { electrons }));
  const basis = fullSector(m, electrons / 2, electrons / 2);
  const exact = projectDeterminants(ints, basis, { tol: 1e-12 });
  const table = noisySamples(basis, exact.eigen.vectors[0]!, shots, flip, seed);
  writeFileSync(join(dir, `${name}-noisy.csv`), samplesCsv(table, 2 * m));
  console.log(`${name}: ${m} orbitals, full-CI dimension ${basis.dim}, E0 = ${exact.eigen.values[0]} (residual ${exact.eigen.residuals[0]!.toExponential(2)})`);
}

write('hubbard-ring6', hubbardRingIntegrals(6, 1, 4), 6, 4000, 0.03, 11);
write('h6-chain', hydrogenChain(6, 1.8).integrals, 6, 3000, 0.02, 12);
