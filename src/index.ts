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
export { parseJsonWithLines, type JsonWithLines, type JsonPath } from './io/jsonWithLines.js';
export { formatCsv, csvCell, csvRow, type CsvCell } from './io/formatCsv.js';
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

export type { CommandCatalog, CommandSpec, OptionSpec } from './batch/commandSpec.js';
export { parseManifest, readManifest, isSafeJobName, MAX_JOBS, type Manifest, type BatchJob, type ManifestValue, type ManifestScalar } from './batch/manifest.js';
export { jobHash, sha256File, type InputDigest, type DigestCache } from './batch/jobHash.js';
export {
  runJob,
  jobFiles,
  isUpToDate,
  reportedError,
  ERROR_FORMAT_ENV,
  META_DIR,
  type RunJobOptions,
  type JobOutcome,
  type JobFiles,
  type JobMeta,
  type JobErrorRecord,
  type JobExecutor,
  type ExecResult,
} from './batch/runJob.js';
export { runAll, type RunAllOptions } from './batch/runAll.js';
export { jobPlan, writeJobPlan, readJobPlan, planFile, type JobPlan, type PlannedJob } from './batch/jobPlan.js';
export { collect, type Collected, type CollectRow, type CollectError } from './batch/collect.js';
export { collectTable, type Table } from './batch/collectTable.js';
export { taskFromEnv, sbatchScript, shellQuote, jobNameFor, ARRAY_VARIABLES, type ArrayVariable, type TaskFromEnv, type SbatchSettings } from './batch/schedulers.js';
export { formatHamiltonianText } from './io/hamiltonianTextWriter.js';
export { buildModel, type ModelSpec } from './operators/models/buildModel.js';
export { heisenbergModel, type HeisenbergParams } from './operators/models/heisenberg.js';
export { isingModel, type IsingParams } from './operators/models/ising.js';
export { hubbardModel, hubbardNeel, type HubbardParams } from './operators/models/hubbard.js';
export { buildLattice, parseLatticeSize, siteQubit, describeLattice, type Lattice, type LatticeSpec, type LatticeKind, type Boundary } from './operators/models/lattice.js';
export type { ModelHamiltonian } from './operators/models/modelHamiltonian.js';
export { enumerateSector, sectorDimension } from './sectors/enumerateSector.js';

export { createState, copyState, normSquared, innerProduct, checkStateFits, MAX_SIM_QUBITS, type StateVector } from './sim/stateVector.js';
export { fullSpaceOperator, applyFullSpace, type FullSpaceOperator } from './sim/fullSpaceOperator.js';
export { gershgorinBounds } from './sim/spectralBounds.js';
export { LocalKernels, type SimKernels, type EnergyMoments } from './sim/simKernels.js';
export { WorkerKernels } from './sim/workerKernels.js';
export { ChebyshevPropagator } from './sim/chebyshevPropagator.js';
export { TrotterPropagator } from './sim/trotterPropagator.js';
export { besselJSequence } from './sim/besselJ.js';
export { evolveStates, evolutionArrays, type EvolutionMethod, type EvolutionOptions, type EvolvedState } from './sim/evolveStates.js';
export { initialConfiguration, NAMED_STATES } from './sim/initialState.js';
export { sampleDump, sampleShots, corruptShots, countShots, timeSeed, NO_NOISE, type ShotNoise, type Dump } from './sim/sampleDump.js';

export { simulate, dumpCsv, noisyMatricesPath, type SimulateOptions, type SimulateReport } from './pipeline/simulate.js';
export { KrylovMatrixRecorder, type SimulatedKrylovMatrices } from './sim/krylovMatrixRecorder.js';
export { hadamardTestNoise, type HadamardTestNoiseOptions, type NoisyKrylovMatrices } from './sim/hadamardTestNoise.js';
export { krylovMatricesJson, type KrylovMatricesDocument } from './io/krylovMatricesJson.js';
export { binomial } from './util/binomial.js';
export { exact, exactMemoryEstimate, type ExactOptions, type ExactReport, type ExactOutcome, type EnumeratedSamples } from './pipeline/exact.js';
export { runDemo, readDemoManifest, type DemoOptions, type DemoReport, type DemoRow, type DemoManifest } from './pipeline/demo.js';
export { DEMO_SCENARIO, type DemoScenario } from './pipeline/demoScenario.js';
export { complexMatrix, hermitianPart, leadingBlock, type ComplexMatrix } from './solvers/complexMatrix.js';
export { hermitianEigen, type HermitianEigen } from './solvers/hermitianEigen.js';
export { thresholdedGeneralizedEigen, type ThresholdedOptions, type ThresholdedSolution } from './solvers/thresholdedGeneralizedEigen.js';
export { readKrylovMatrices, MAX_KRYLOV_DIMENSION, type KrylovSource, type KrylovMatrices, type MatrixOrigin } from './io/krylovMatrices.js';
export { checkKrylovMatrices, CHECK_SIGMAS, CHECK_RELATIVE_TOLERANCE, type CheckedKrylovMatrices, type MatrixChecks } from './io/checkKrylovMatrices.js';
export { lineChartSvg, type LineChart, type LineSeries } from './io/plotSvg.js';
export { svgToPng } from './io/svgToPng.js';
export { scanCsv } from './io/scanCsv.js';
export { thresholdScanChart } from './io/thresholdScanChart.js';
export { thresholdScan, SCAN_DEFAULTS, type ScanPoint, type ThresholdScanOptions } from './analysis/thresholdScan.js';
export { findPlateau, defaultPlateauTolerance, type Plateau } from './analysis/plateau.js';
export { overlapNoiseFloor } from './analysis/noiseFloor.js';
export { firstOrderEnergyError } from './analysis/energyError.js';
export { bootstrapEnergy, type BootstrapSummary } from './analysis/bootstrapEnergy.js';
export { dimensionScan, type DimensionScanPoint } from './analysis/dimensionScan.js';
export { krylov, type KrylovOptions, type KrylovReport, type KrylovSolutionReport, type KrylovOutcome } from './pipeline/krylov.js';
export { seededNormal, type NormalSource } from './util/normal.js';
