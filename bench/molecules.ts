/**
 * Determinant-path benchmark: build and apply rates of the Slater–Condon builder on full-CI spaces
 * of hydrogen chains, the stored (CSR) against the matrix-free form, and the determinant builder
 * against the qubit path's Pauli builder on the same Hubbard ring. Ratios come from the same run.
 * Usage: node dist/bench/molecules.js [atoms=10]
 */
import { buildDeterminantRows, pieceMatrix, prepareDeterminants } from '../src/build/determinantHamiltonian.js';
import { applyDeterminantRows } from '../src/build/determinantOperator.js';
import { buildProjectedHamiltonian } from '../src/build/projectedHamiltonian.js';
import { csrApplyRows } from '../src/build/sparseMatrix.js';
import { groupByFlipMask } from '../src/operators/pauliSum.js';
import { electronSector } from '../src/sectors/electronSector.js';
import { compileSector } from '../src/sectors/sector.js';
import { fullSector } from './molecules/fullSector.js';
import { hubbardRingIntegrals, hubbardRingPauli } from './molecules/hubbard.js';
import { hydrogenChain } from './molecules/hydrogenChain.js';

const cpu = (): number => process.cpuUsage().user / 1e6;
const atoms = Number(process.argv[2] ?? 10);

// 1. Hydrogen chain, full CI: prepare, CSR build, CSR apply vs matrix-free apply.
const mol = hydrogenChain(atoms, 1.8);
const basis = fullSector(atoms, atoms / 2, atoms / 2);
let t = cpu();
const ctx = prepareDeterminants(basis, mol.integrals);
const prepare = cpu() - t;
t = cpu();
const matrix = pieceMatrix(basis.dim, buildDeterminantRows(ctx, 0, basis.dim));
const build = cpu() - t;
const x = new Float64Array(basis.dim).map((_, i) => Math.sin(i));
const y = new Float64Array(basis.dim);
const reps = 3;
t = cpu();
for (let k = 0; k < reps; k++) csrApplyRows(matrix, x, y);
const csrApply = (cpu() - t) / reps;
t = cpu();
for (let k = 0; k < reps; k++) applyDeterminantRows(ctx, x, y, 0, basis.dim);
const freeApply = (cpu() - t) / reps;
const nnz = matrix.cols.length;
console.log(`H${atoms} STO-3G full CI: ${basis.dim} determinants, ${nnz} nonzeros (${(nnz / basis.dim).toFixed(0)} per row)`);
console.log(`  prepare (strings + connections) ${prepare.toFixed(3)} s; CSR build ${build.toFixed(3)} s = ${((nnz / build) / 1e6).toFixed(1)} M entries/s`);
console.log(`  apply: CSR ${(csrApply * 1e3).toFixed(1)} ms, matrix-free ${(freeApply * 1e3).toFixed(1)} ms (ratio ${(freeApply / csrApply).toFixed(2)})`);

// 2. Same Hubbard ring through both builders.
const sites = 10;
const ring = fullSector(sites, sites / 2, sites / 2);
t = cpu();
const det = pieceMatrix(ring.dim, buildDeterminantRows(prepareDeterminants(ring, hubbardRingIntegrals(sites, 1, 4)), 0, ring.dim));
const detTime = cpu() - t;
const pauli = hubbardRingPauli(sites, 1, 4);
t = cpu();
const jw = buildProjectedHamiltonian(ring, groupByFlipMask(pauli, ring.nWords), compileSector(electronSector(sites, sites / 2, sites / 2), ring.qubits, ring.nWords));
const jwTime = cpu() - t;
console.log(`Hubbard ring L=${sites}, half filling: ${ring.dim} determinants, ${det.cols.length} nonzeros (JW path ${jw.cols.length})`);
console.log(`  build: determinant ${detTime.toFixed(3)} s, Pauli ${jwTime.toFixed(3)} s (ratio ${(detTime / jwTime).toFixed(2)})`);
