/**
 * Repair against its two alternatives on one noisy dump: dropping the off-sector shots, and adding
 * as many random in-sector determinants as repair added new ones (seeded). Repair has to beat
 * chance, not only add configurations.
 */
import { makeBasis, type Basis } from '../../src/bits/basis.js';
import { ConfigTable } from '../../src/bits/configTable.js';
import type { SampleSet } from '../../src/io/readSamples.js';
import type { Integrals } from '../../src/operators/integrals.js';
import { projectDeterminants } from '../../src/pipeline/projectDeterminants.js';
import { solveSubspace } from '../../src/pipeline/solveSubspace.js';
import { electronSector } from '../../src/sectors/electronSector.js';
import { seededUniform } from '../../src/util/random.js';
import { fullSector } from './fullSector.js';

export interface RepairComparison {
  exact: number;
  drop: { energy: number; dimension: number; keptShots: number };
  repair: { energy: number; dimension: number; recoveredShots: number; offSectorShots: number; rounds: number };
  random: { energy: number; dimension: number };
}

/** Run drop, repair and random-fill on `samples` of a closed-shell molecule with `electrons` electrons. */
export function compareRepair(ints: Integrals, electrons: [number, number], samples: SampleSet, seed: number): RepairComparison {
  const m = ints.orbitals;
  const sector = electronSector(m, electrons[0], electrons[1]);
  const project = (b: Basis) => projectDeterminants(ints, b, { tol: 1e-10 });
  const full = fullSector(m, electrons[0], electrons[1]);
  const exact = project(full).eigen.values[0]!;
  const drop = solveSubspace(samples, { sector }, project);
  const repair = solveSubspace(samples, { sector, repair: { rounds: 4, seed, tol: 1e-10 } }, project);
  // Random fill: the dropped basis plus as many new in-sector determinants as repair contributed.
  const added = repair.basis.dim - drop.basis.dim;
  const have = new ConfigTable(full.nWords);
  for (let i = 0; i < drop.basis.dim; i++) have.add(drop.basis.states, i * full.nWords, 1);
  const pool: number[] = [];
  for (let i = 0; i < full.dim; i++) if (have.indexOf(full.states, i * full.nWords) < 0) pool.push(i);
  const rng = seededUniform(seed);
  for (let k = 0; k < added && pool.length > 0; k++) {
    const pick = pool.splice(Math.floor(rng.next() * pool.length), 1)[0]!;
    have.add(full.states, pick * full.nWords, 1);
  }
  const randomBasis = makeBasis(full.qubits, full.nWords, have.states, have.size);
  const random = project(randomBasis).eigen.values[0]!;
  const acc = repair.repair!;
  return {
    exact,
    drop: { energy: drop.projection.eigen.values[0]!, dimension: drop.basis.dim, keptShots: drop.report.keptShots },
    repair: { energy: repair.projection.eigen.values[0]!, dimension: repair.basis.dim, recoveredShots: acc.rounds[acc.rounds.length - 1]!.recovered, offSectorShots: acc.offSector.shots, rounds: acc.rounds.length },
    random: { energy: random, dimension: randomBasis.dim },
  };
}
