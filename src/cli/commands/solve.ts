import { Command } from 'commander';
import { BitspanError } from '../../errors.js';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import { renderPlot } from '../../io/plotRender.js';
import { stateObservables } from '../../analysis/observables.js';
import { zProfilePlot } from '../../analysis/plots/zProfilePlot.js';
import type { CliIo } from '../io.js';
import { parseElectrons } from '../../sectors/electronSector.js';
import { positiveInt } from '../parse.js';
import { addEstimateOptions, addExpandOptions, checkEstimateFlags, estimateFromFlags, expandFromFlags, type EstimateFlags, type ExpandFlags } from '../analysisOptions.js';
import { addSampleOptions, addSolverOptions, sampleAndSolverOptions, type SampleFlags, type SolverFlags } from '../sectorOptions.js';
import { solveSummary } from '../summary.js';
import { progressFor } from '../progress.js';

interface SolveFlags extends SampleFlags, SolverFlags, ExpandFlags, EstimateFlags {
  hamiltonian?: string;
  integrals?: string;
  electrons?: [number, number];
  repair?: boolean;
  repairRounds?: number;
  productSpace?: boolean;
  samples: string[];
  eigs: number;
  tol: number;
  seed: number;
  json?: boolean;
  out?: string;
  top: number;
  estimate?: boolean;
  saveState?: string;
  startState?: string;
  batches?: number;
  batchSize?: number;
  plot?: string;
}

/** `bitspan solve`: the lowest energies of the Hamiltonian projected on the sampled configurations. */
export function solveCommand(io: CliIo): Command {
  const cmd = new Command('solve').description('lowest energies of a Pauli Hamiltonian or molecular integrals projected on sampled configurations');
  cmd.option('--hamiltonian <file>', 'Pauli-sum Hamiltonian (text or .json)');
  cmd.option('--integrals <file>', 'molecular integrals (FCIDUMP), solved in the determinant basis instead of a Pauli sum');
  cmd.option('--electrons <A,B>', 'spin-up and spin-down electron counts (with --integrals; default from NELEC and MS2)', parseElectrons);
  cmd.requiredOption('--samples <files...>', 'sample dumps (CSV, JSON counts or text), one group per file');
  addSampleOptions(cmd);
  addSolverOptions(cmd);
  cmd
    .option('--repair', 'repair off-sector configurations (wrong weight in a register) instead of dropping them')
    .option('--repair-rounds <n>', 'at most N rounds of solve, occupations, repair (default 3)', positiveInt('--repair-rounds'))
    .option('--product-space', 'with --integrals: use every sampled spin-up string with every sampled spin-down string')
    .option('--top <n>', 'most probable ground-state configurations to report', positiveInt('--top'), 10)
    .option('--json', 'print one JSON object on stdout')
    .option('--out <file>', 'also write the JSON report to FILE (atomically)')
    .option('--estimate', 'energy variance, PT2 correction, bounds and sampling diagnostics of the lowest state');
  addExpandOptions(cmd, true);
  addEstimateOptions(cmd);
  cmd
    .option('--batches <k>', 'solve K resampled batches of configurations and report the energy spread', positiveInt('--batches'))
    .option('--batch-size <d>', 'configurations per batch, drawn by sampled frequency without replacement', positiveInt('--batch-size'))
    .option('--save-state <file>', 'write the lowest state as CSV (bitstring,re,im,probability)')
    .option('--start-state <file>', 'start Lanczos from a state saved with --save-state')
    .option('--plot <file>', 'plot the per-qubit <Z> profile of the lowest state (.svg or .png)')
    .action(async (f: SolveFlags) => {
      if (f.repairRounds !== undefined && !f.repair) throw new BitspanError('bad-argument', '--repair-rounds without --repair', 'add --repair, or drop --repair-rounds');
      checkEstimateFlags(f);
      if ((f.batches === undefined) !== (f.batchSize === undefined)) {
        throw new BitspanError('bad-argument', '--batches and --batch-size go together', 'e.g. --batches 10 --batch-size 500');
      }
      const plotFormat = f.plot ? plotFormatOf(f.plot) : undefined;
      const wantsAnalysis = f.estimate || f.gap !== undefined || f.reference !== undefined || f.exact || f.observables || f.observe || f.batches !== undefined;
      // The pipeline is loaded here, not at the top, so other commands and --help start without it.
      const { solve } = await import('../../pipeline/solve.js');
      const progress = progressFor(io, Boolean(f.json));
      const { report, basis, eigen } = await solve({
        hamiltonian: f.hamiltonian,
        integrals: f.integrals,
        electrons: f.electrons,
        repair: f.repair,
        repairRounds: f.repairRounds,
        productSpace: f.productSpace,
        log: (line) => io.stderr(`bitspan: ${line}\n`),
        samples: f.samples,
        ...sampleAndSolverOptions(f),
        top: f.top,
        onBuildProgress: (d, t) => progress.build(d, t),
        onSolveProgress: (i) => progress.solve(i),
        expand: expandFromFlags(f),
        startState: f.startState,
        // Only the configurations are read from the basis after a plain solve (--plot computes observables).
        releaseIndex: !f.plot,
        analysis: wantsAnalysis
          ? {
              // --gap only makes sense with the variance, so it implies --estimate.
              estimate: Boolean(f.estimate) || f.gap !== undefined,
              sampling: Boolean(f.estimate),
              ...estimateFromFlags(f),
              batches: f.batches !== undefined ? { count: f.batches, size: f.batchSize!, seed: f.seed } : undefined,
            }
          : undefined,
      }).finally(() => progress.stop());
      const json = JSON.stringify(report, null, 2) + '\n';
      // Render everything before writing anything, so a failure leaves no partial set of outputs.
      const plot = f.plot
        ? await renderPlot(zProfilePlot(`⟨Z⟩ per qubit, lowest state of the ${report.dimension}-configuration subspace`, report.observables?.z ?? stateObservables(basis, eigen.vectors[0]!, report.complex, { correlations: false }).z), plotFormat!)
        : undefined;
      if (f.out) await writeFileAtomic(f.out, json);
      if (f.saveState) {
        const { formatStateCsv } = await import('../../io/stateCsv.js');
        await writeFileAtomic(f.saveState, formatStateCsv(basis, eigen.vectors[0]!, report.complex, f.qubit0));
      }
      if (f.plot && plot !== undefined) await writeFileAtomic(f.plot, plot);
      io.stdout(f.json ? json : solveSummary(report));
    });
  return cmd;
}

/** Plot format from a file name: `.svg` or `.png`. */
export function plotFormatOf(file: string): 'svg' | 'png' {
  const lower = file.toLowerCase();
  if (lower.endsWith('.svg')) return 'svg';
  if (lower.endsWith('.png')) return 'png';
  throw new BitspanError('bad-argument', `--plot '${file}' does not end in .svg or .png`, 'name the plot file plot.svg or plot.png');
}
