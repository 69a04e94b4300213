// Runs inside a worker thread: builds one row range of the projected Hamiltonian's upper triangle
// from a basis that lives on SharedArrayBuffers (read without copying).
import type { Basis } from '../src/bits/basis.js';
import { buildUpperRows, type UpperPiece } from '../src/build/projectedHamiltonian.js';
import type { RowScanPlan } from '../src/build/rowScan.js';

export interface BuildRowsTask {
  basis: Basis;
  plan: RowScanPlan;
  r0: number;
  r1: number;
  upperPerRow: number;
  shared: boolean;
}

export default function buildRowsTask(task: BuildRowsTask): UpperPiece {
  return buildUpperRows(task.basis, task.plan, task.r0, task.r1, { upperPerRow: task.upperPerRow, shared: task.shared });
}
