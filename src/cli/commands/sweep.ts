import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { Command } from 'commander';
import { BitspanError } from '../../errors.js';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import { renderSvg, svgToPng } from '../../io/plotRender.js';
import { formatSweepCsv } from '../../io/sweepCsv.js';
import { energyPlot } from '../../analysis/plots/energyPlot.js';
import { errorPlot } from '../../analysis/plots/errorPlot.js';
import { zProfilePlot } from '../../analysis/plots/zProfilePlot.js';
import type { ExtrapolateAgainst, SubsampleMode, SweepAxis, SweepReport } from '../../pipeline/sweep.js';
import type { CliIo } from '../io.js';
import { oneOf, positiveInt } from '../parse.js';
import { addEstimateOptions, addExpandOptions, checkEstimateFlags, estimateFromFlags, expandFromFlags, numberList, type EstimateFlags, type ExpandFlags } from '../analysisOptions.js';
import { addSampleOptions, addSolverOptions, sampleAndSolverOptions, type SampleFlags, type SolverFlags } from '../sectorOptions.js';
import { sweepSummary } from '../sweepSummary.js';

interface SweepFlags extends SampleFlags, SolverFlags, ExpandFlags, EstimateFlags {
  hamiltonian: string;
  samples: string[];
  axis: SweepAxis;
  values?: number[];
  subsample: SubsampleMode;
  extrapolate: ExtrapolateAgainst;
  top: number;
  json?: boolean;
  out?: string;
  csv?: string;
  outDir?: string;
  plotFormat: 'svg' | 'png' | 'both';
}

/** `bitspan sweep`: solve along an axis of growing subspaces and extrapolate the energy. */
export function sweepCommand(io: CliIo): Command {
  const cmd = new Command('sweep').description('solve along an axis (dumps, shots, top-K, expansion steps) with error estimates and an extrapolated energy');
  cmd.requiredOption('--hamiltonian <file>', 'Pauli-sum Hamiltonian (text or .json)');
  cmd.requiredOption('--samples <files...>', 'sample dumps (CSV, JSON counts or text), one group per file');
  cmd.requiredOption('--axis <axis>', 'groups (first 1, 2, ... dumps), shots, top (K most frequent) or expand (steps of H)', oneOf('--axis', ['groups', 'shots', 'top', 'expand'] as const));
  cmd.option('--values <list>', 'axis values, comma-separated (groups: dump counts; shots: shot counts, or fractions with --subsample random; top: K; expand: steps)', numberList('--values'));
  cmd.option('--subsample <mode>', 'shots axis: the first N shots in file order, or nested seeded random subsamples at fractions', oneOf('--subsample', ['first', 'random'] as const), 'first');
  addSampleOptions(cmd);
  addSolverOptions(cmd);
  addExpandOptions(cmd, true);
  addEstimateOptions(cmd);
  cmd
    .option('--extrapolate <against>', 'report the extrapolation of E0 against the PT2 correction or the variance (both are computed)', oneOf('--extrapolate', ['pt2', 'variance'] as const), 'pt2')
    .option('--top <n>', 'most probable ground-state configurations reported per point', positiveInt('--top'), 10)
    .option('--json', 'print one JSON object on stdout')
    .option('--out <file>', 'also write the JSON report to FILE (atomically)')
    .option('--csv <file>', 'also write one CSV row per point to FILE (atomically)')
    .option('--out-dir <dir>', 'write sweep.json, sweep.csv and the plots (energy, error, z-profile) into DIR')
    .option('--plot-format <fmt>', 'plot files in --out-dir: svg, png or both', oneOf('--plot-format', ['svg', 'png', 'both'] as const), 'both')
    .action(async (f: SweepFlags) => {
      checkEstimateFlags(f);
      if (f.subsample === 'random' && f.axis !== 'shots') throw new BitspanError('bad-argument', '--subsample applies to --axis shots only', 'drop --subsample or use --axis shots');
      if (f.axis === 'expand' && f.expand !== undefined) throw new BitspanError('bad-argument', '--expand N and --axis expand both set the expansion steps', 'give the steps with --values, e.g. --axis expand --values 0,1,2');
      const expand = f.axis === 'expand' ? { steps: 0, threshold: f.expandThreshold, max: f.expandMax } : expandFromFlags(f);
      // The pipeline is loaded here, not at the top, so other commands and --help start without it.
      const { sweep } = await import('../../pipeline/sweep.js');
      const { report } = await sweep({
        hamiltonian: f.hamiltonian,
        samples: f.samples,
        axis: f.axis,
        values: f.values,
        subsample: f.subsample,
        ...sampleAndSolverOptions(f),
        top: f.top,
        expand,
        ...estimateFromFlags(f),
        extrapolate: f.extrapolate,
      });
      const json = JSON.stringify(report, null, 2) + '\n';
      const csv = formatSweepCsv(report);
      // Everything is rendered in memory first; each file is then written atomically.
      const files: Array<[string, string | Uint8Array]> = [];
      if (f.out) files.push([f.out, json]);
      if (f.csv) files.push([f.csv, csv]);
      if (f.outDir) {
        files.push([join(f.outDir, 'sweep.json'), json], [join(f.outDir, 'sweep.csv'), csv]);
        for (const [name, svg] of await sweepPlots(report)) {
          if (f.plotFormat !== 'png') files.push([join(f.outDir, `${name}.svg`), svg]);
          if (f.plotFormat !== 'svg') files.push([join(f.outDir, `${name}.png`), svgToPng(svg)]);
        }
        try {
          mkdirSync(f.outDir, { recursive: true });
        } catch (e) {
          throw new BitspanError('output-unwritable', `cannot create the output folder (${(e as NodeJS.ErrnoException).code ?? String(e)})`, 'check the path and permissions', { file: f.outDir });
        }
      }
      for (const [file, data] of files) await writeFileAtomic(file, data);
      io.stdout(f.json ? json : sweepSummary(report, files.map(([file]) => file)));
    });
  return cmd;
}

/** The sweep's plots as SVG: energy against dimension, errors on a log scale, ⟨Z⟩ profile. */
export async function sweepPlots(r: SweepReport): Promise<Array<[string, string]>> {
  const out: Array<[string, string]> = [];
  if (r.points.length === 0) return out;
  const dimension = r.points.map((p) => p.dimension);
  const energy = r.points.map((p) => p.energies[0]!);
  const ex = r.extrapolation.energy !== null ? { energy: r.extrapolation.energy, uncertainty: r.extrapolation.uncertainty ?? 0, against: r.extrapolation.against } : null;
  const ref = r.reference?.energy ?? null;
  const axisName = r.axis === 'shots' && r.subsample === 'random' ? 'random shot fraction' : r.axis;
  out.push([
    'energy',
    await renderSvg(energyPlot({ title: `Lowest energy along the ${axisName} axis`, dimension, energy, energyPt2: r.points.map((p) => p.estimate!.energyPt2), extrapolation: ex, reference: ref })),
  ]);
  out.push([
    'error',
    await renderSvg(errorPlot({ title: ref !== null ? 'Energy error against the reference' : 'Error estimates: variance and PT2', dimension, energy, variance: r.points.map((p) => p.variance!), pt2: r.points.map((p) => p.pt2!), reference: ref })),
  ]);
  if (r.profile) out.push(['z-profile', await renderSvg(zProfilePlot(`⟨Z⟩ per qubit, lowest state at ${r.axis} ${r.profile.value} (D = ${r.profile.dimension})`, r.profile.z))]);
  return out;
}
