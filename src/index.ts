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
export { csvCell, csvRow } from './io/csvCell.js';
export { resolveInside } from './io/safePath.js';

export { parseWeightSpec, compileSector, inSector, describeSector, type Sector, type WeightConstraint, type CompiledSector } from './sectors/sector.js';
export { selectSubspace, type SubspaceReport, type SampleAccount, type GroupAccount, type SelectOptions } from './sectors/selectSubspace.js';

export { PauliSumBuilder, groupByFlipMask, isComplexHamiltonian, formatPauliOps, type PauliSum, type PauliTerm, type FlipGroups } from './operators/pauliSum.js';

export { buildProjectedHamiltonian, buildUpperRows, assembleHermitian, sectorFlipTest, type UpperPiece, type SectorFlipTest } from './build/projectedHamiltonian.js';
export { csrApplyRows, joinRowPieces, nonzeros, toDense, type SparseMatrix, type SparseMatrixPiece } from './build/sparseMatrix.js';

export { lanczos, LANCZOS_DEFAULTS, type LanczosOptions, type LanczosResult, type LinearOperator } from './solvers/lanczos.js';
export { symmetricEigen } from './solvers/symmetricEigen.js';

export { solve, projectAndSolve, checkRegister, sectorReport, matrixOperator, topConfigurations, type SolverSettings, type Projection, type SolveOptions, type SolveReport, type SolveOutcome } from './pipeline/solve.js';
export { seededUniform } from './util/random.js';
