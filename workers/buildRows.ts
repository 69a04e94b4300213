// Runs inside a worker thread: builds one row range of the projected Hamiltonian's upper triangle
// from a basis that lives on SharedArrayBuffers (read without copying).
import type { Basis } from '../src/bits/basis.js';
import { buildUpperRows, type SectorFlipTest, type UpperPiece } from '../src/build/projectedHamiltonian.js';
import type { FlipGroups } from '../src/operators/pauliSum.js';

export interface BuildRowsTask {
  basis: Basis;
  groups: FlipGroups;
  test: SectorFlipTest;
  r0: number;
  r1: number;
}

export default function buildRowsTask(task: BuildRowsTask): UpperPiece {
  return buildUpperRows(task.basis, task.groups, task.test, task.r0, task.r1);
}
