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

export { parseWeightSpec, compileSector, inSector, describeSector, type Sector, type WeightConstraint, type CompiledSector } from './sectors/sector.js';
export { enumerateSector } from './sectors/enumerateSector.js';
export { selectSubspace, type SubspaceReport, type SampleAccount, type GroupAccount, type SelectOptions } from './sectors/selectSubspace.js';

export { PauliSumBuilder, groupByFlipMask, isComplexHamiltonian, formatPauliOps, type PauliSum, type PauliTerm, type FlipGroups } from './operators/pauliSum.js';

export { buildProjectedHamiltonian, buildRows, sectorFlipTest } from './build/projectedHamiltonian.js';
export { csrApplyRows, joinRowPieces, nonzeros, toDense, type SparseMatrix, type SparseMatrixPiece } from './build/sparseMatrix.js';

export { lanczos, LANCZOS_DEFAULTS, type LanczosOptions, type LanczosResult, type LinearOperator } from './solvers/lanczos.js';
export { symmetricEigen } from './solvers/symmetricEigen.js';

export { solve, projectAndSolve, checkRegister, sectorReport, matrixOperator, topConfigurations, type SolverSettings, type Projection, type SolveOptions, type SolveReport, type SolveOutcome } from './pipeline/solve.js';
export { solveSamples, solveBasis, exactReference, resolveAnalysis, readStartState, EXACT_MAX_DIM, type SubspaceSolveOptions, type SolveAnalysisOptions } from './pipeline/solve.js';
export { analyzeLowest, energyError, OBSERVABLE_CAVEAT, type AnalysisOptions, type AnalysisReport, type AnalysisInput, type ReferenceEnergy, type EnergyError, type EstimateDetails, type BatchReport } from './pipeline/analyze.js';
export { expandSubspace, expandOnce, expandsByImportance, type ExpandOptions, type ExpansionReport, type ExpansionStep, type LowestState } from './pipeline/expand.js';
export { sweep, defaultValues, checkValues, type SweepOptions, type SweepReport, type SweepPoint, type SweepAxis, type SubsampleMode, type ExtrapolateAgainst, type SweepExtrapolation } from './pipeline/sweep.js';

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
export { seededUniform } from './util/random.js';
