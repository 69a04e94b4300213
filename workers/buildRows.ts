// Runs inside a worker thread: takes row chunks of the projected Hamiltonian's upper triangle from
// a shared counter until none are left, reading the basis from SharedArrayBuffers without copying.
import { buildTakenChunks, type SharedChunks } from '../src/build/parallelBuild.js';
import type { UpperPiece } from '../src/build/projectedHamiltonian.js';

export default function buildRowsTask(work: SharedChunks): UpperPiece[] {
  return buildTakenChunks(work);
}
