// The library API: an explicit list of what scripts may import. Nothing here imports from src/cli/.
export { BitspanError, exitStatusFor, type BitspanErrorCode, type ErrorPlace } from './errors.js';

export { wordsFor, popcount32, formatBitstring, packBitstring, compareConfigs } from './bits/packed.js';
export { hashConfig, buildHashSlots, lookupConfig } from './bits/hashIndex.js';
export { ConfigTable } from './bits/configTable.js';
export { makeBasis, basisIndexOf, sortOrder, type Basis } from './bits/basis.js';

export { BitstringParser, type Qubit0 } from './io/bitstringParser.js';
export { readSamples, type SampleSet, type SampleGroup, type SampleFormat, type ReadSamplesOptions, type RowOrder } from './io/readSamples.js';
export { readObservables } from './io/observablesText.js';
export { formatStateCsv, readStateCsv, type SavedState } from './io/stateCsv.js';
export { formatSweepCsv } from './io/sweepCsv.js';
export { renderSvg, svgToPng, renderPlot } from './io/plotRender.js';
export { readHamiltonian } from './io/readHamiltonian.js';
export { parseHamiltonianJson } from './io/hamiltonianJson.js';
export { parseHamiltonianText } from './io/hamiltonianText.js';
export { writeFileAtomic } from './io/atomicWrite.js';
export { parseJsonWithLines, type JsonWithLines, type JsonPath } from './io/jsonWithLines.js';
export { formatCsv, csvCell, csvRow, type CsvCell } from './io/formatCsv.js';
export { resolveInside } from './io/safePath.js';
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

export { buildProjectedHamiltonian, buildUpperRows, assembleHermitian, sectorFlipTest, type UpperPiece, type SectorFlipTest, type BuildRowsOptions } from './build/projectedHamiltonian.js';
export { rowScanPlan, type RowScanPlan } from './build/rowScan.js';
export { storedFromPieces, applyStoredRows, replayStoredRows, storedNonzeros, storedBytes, toSparseMatrix, reorderForLocality, sortRowsByLength, lengthSorted, LENGTH_WINDOW, localityOrder, inBasisOrder, permuteVector, toBasisOrderInPlace, type StoredHamiltonian, type StorageOrder } from './build/storedHamiltonian.js';
export { buildDeterminantHamiltonian, buildDeterminantRows, countDeterminantRows, pieceMatrix, prepareDeterminants, determinantRow, determinantDiagonal, determinantNonzeroBound, forEachRow, RowSink, type DeterminantContext } from './build/determinantHamiltonian.js';
export { applyDeterminantRows, determinantOperator } from './build/determinantOperator.js';
export { splitSpinStrings, makeSpinStrings, type SpinStrings, type SpinSplit } from './build/spinStrings.js';
export { stringConnections, type StringConnections } from './build/stringConnections.js';
export { extractBits, depositBits } from './bits/bitRange.js';
export { buildPairSlots, lookupPair } from './bits/pairIndex.js';
export { csrApplyRows, joinRowPieces, nonzeros, toDense, type SparseMatrix, type SparseMatrixPiece } from './build/sparseMatrix.js';

export { lanczos, LANCZOS_DEFAULTS, type LanczosOptions, type LanczosResult, type LinearOperator } from './solvers/lanczos.js';
export { symmetricEigen } from './solvers/symmetricEigen.js';

export { solve, projectAndSolve, projectAndSolveSync, type SampledRunOptions, checkRegister, sectorReport, matrixOperator, storedOperator, matrixFreeOperator, topConfigurations, type SolverSettings, type Projection, type SolveOptions, type SolveReport, type SolveOutcome } from './pipeline/solve.js';
export { solveSamples, solveBasis, exactReference, resolveAnalysis, readStartState, EXACT_MAX_DIM, type SubspaceSolveOptions, type SolveAnalysisOptions } from './pipeline/solve.js';
export { analyzeLowest, energyError, OBSERVABLE_CAVEAT, type AnalysisOptions, type AnalysisReport, type AnalysisInput, type ReferenceEnergy, type EnergyError, type EstimateDetails, type BatchReport } from './pipeline/analyze.js';
export { expandSubspace, expandOnce, expandsByImportance, type ExpandOptions, type ExpansionReport, type ExpansionStep, type LowestState } from './pipeline/expand.js';
export { sweep, defaultValues, checkValues, type SweepOptions, type PointEstimates, type SweepReport, type SweepPoint, type SweepAxis, type SubsampleMode, type ExtrapolateAgainst, type SweepExtrapolation } from './pipeline/sweep.js';

export { externalPlan, diagonalEnergies, collectFlips, mergeFlips, externalAmplitudes, externalConfig, allocateFlipRecords, BUCKET_BITS, type ExternalAmplitudes, type ExternalPlan, type FlipRecords, type FlipSource, type MergeTarget, type AccumulateMode, type ExternalOptions } from './analysis/externalAmplitudes.js';
export { varianceAndPt2, type EnergyErrorEstimate, type VarianceOptions } from './analysis/varianceAndPt2.js';
export { energyBounds, type EnergyBounds, type BoundOptions, type GapSource } from './analysis/energyBounds.js';
export { extrapolate, type LinearExtrapolation } from './analysis/extrapolate.js';
export { sampleDiagnostics, type SampleDiagnostics, type GroupDiagnostics } from './analysis/sampleDiagnostics.js';
export { stateObservables, pauliExpectation, type StateObservables, type PauliObservable, type PauliExpectation, type ObservableOptions } from './analysis/observables.js';
export { resampleBatches } from './analysis/batchResampling.js';
export { firstShots, randomShots } from './analysis/subsample.js';
export { selectExpansion, extendBasis, type ExpansionSelection } from './analysis/expansion.js';
export { stateOnBasis, type StateOnConfigs } from './analysis/stateOnBasis.js';
export { energyPlot, type EnergyPlotData } from './analysis/plots/energyPlot.js';
export { errorPlot, type ErrorPlotData } from './analysis/plots/errorPlot.js';
export { zProfilePlot } from './analysis/plots/zProfilePlot.js';
export { solveWithRepair, loadOperator, type LoadedOperator, type IntegralsReport } from './pipeline/solveWithRepair.js';
export { projectDeterminants, lanczosVectorBytes, DEFAULT_MEMORY_BUDGET, type DeterminantProjection, type DeterminantSettings, type DeterminantStorage } from './pipeline/projectDeterminants.js';
export { solveSubspace, type SubspaceOptions, type SubspaceRun, type RepairReport, type RepairRound, type ProductSpaceReport, type SolvedProjection } from './pipeline/solveSubspace.js';
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
