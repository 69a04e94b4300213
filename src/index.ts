// The library API: an explicit list of what scripts may import. Nothing here imports from src/cli/.
export { BitspanError, exitStatusFor, type BitspanErrorCode, type ErrorPlace } from './errors.js';

export { wordsFor, popcount32, formatBitstring, packBitstring, compareConfigs } from './bits/packed.js';
export { hashConfig, buildHashSlots, lookupConfig } from './bits/hashIndex.js';
export { ConfigTable } from './bits/configTable.js';
export { makeBasis, basisIndexOf, sortOrder, type Basis } from './bits/basis.js';

export { BitstringParser, type Qubit0 } from './io/bitstringParser.js';
export { readSamples, type SampleSet, type SampleGroup, type SampleFormat, type ReadSamplesOptions } from './io/readSamples.js';
export { readHamiltonian } from './io/readHamiltonian.js';
export { parseHamiltonianJson } from './io/hamiltonianJson.js';
export { parseHamiltonianText } from './io/hamiltonianText.js';
export { writeFileAtomic } from './io/atomicWrite.js';
export { readFcidump, type Fcidump } from './io/fcidump.js';
export { formatFcidump, type FcidumpHeader } from './io/formatFcidump.js';

export { parseWeightSpec, compileSector, inSector, describeSector, type Sector, type WeightConstraint, type CompiledSector } from './sectors/sector.js';
export { electronSector, parseElectrons, electronsFromHeader } from './sectors/electronSector.js';
export { occupations, probabilities } from './sectors/occupations.js';
export { repairConfiguration, repairSamples, type RepairAccount } from './sectors/repair.js';
export { planProductSpace, buildProductSpace, type ProductSpacePlan } from './sectors/productSpace.js';
export { selectSubspace, type SubspaceReport, type SampleAccount, type GroupAccount, type SelectOptions } from './sectors/selectSubspace.js';

export { PauliSumBuilder, groupByFlipMask, isComplexHamiltonian, formatPauliOps, type PauliSum, type PauliTerm, type FlipGroups } from './operators/pauliSum.js';
export { makeIntegrals, setOneElectron, setTwoElectron, eriIndex, countNonzeroIntegrals, MAX_ORBITALS, type Integrals } from './operators/integrals.js';

export { buildProjectedHamiltonian, buildRows, sectorFlipTest } from './build/projectedHamiltonian.js';
export { buildDeterminantHamiltonian, buildDeterminantRows, countDeterminantRows, pieceMatrix, prepareDeterminants, determinantRow, determinantDiagonal, determinantNonzeroBound, forEachRow, RowSink, type DeterminantContext } from './build/determinantHamiltonian.js';
export { applyDeterminantRows, determinantOperator } from './build/determinantOperator.js';
export { splitSpinStrings, makeSpinStrings, type SpinStrings, type SpinSplit } from './build/spinStrings.js';
export { stringConnections, type StringConnections } from './build/stringConnections.js';
export { extractBits, depositBits } from './bits/bitRange.js';
export { buildPairSlots, lookupPair } from './bits/pairIndex.js';
export { csrApplyRows, joinRowPieces, nonzeros, toDense, type SparseMatrix, type SparseMatrixPiece } from './build/sparseMatrix.js';

export { lanczos, LANCZOS_DEFAULTS, type LanczosOptions, type LanczosResult, type LinearOperator } from './solvers/lanczos.js';
export { symmetricEigen } from './solvers/symmetricEigen.js';

export { solve, projectAndSolve, checkRegister, sectorReport, matrixOperator, topConfigurations, loadOperator, type SolverSettings, type Projection, type SolveOptions, type SolveReport, type SolveOutcome, type LoadedOperator, type IntegralsReport } from './pipeline/solve.js';
export { projectDeterminants, lanczosVectorBytes, DEFAULT_MEMORY_BUDGET, type DeterminantProjection, type DeterminantSettings, type DeterminantStorage } from './pipeline/projectDeterminants.js';
export { solveSubspace, type SubspaceOptions, type SubspaceRun, type RepairReport, type RepairRound, type ProductSpaceReport, type SolvedProjection } from './pipeline/solveSubspace.js';
export { seededUniform } from './util/random.js';
