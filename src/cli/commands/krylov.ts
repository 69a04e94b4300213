import { Command } from 'commander';
import { extname } from 'node:path';
import { SCAN_DEFAULTS } from '../../analysis/thresholdScan.js';
import { BitspanError } from '../../errors.js';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import type { KrylovSource } from '../../io/krylovMatrices.js';
import { lineChartSvg } from '../../io/plotSvg.js';
import { scanCsv } from '../../io/scanCsv.js';
import { svgToPng } from '../../io/plotRender.js';
import { thresholdScanChart } from '../../io/thresholdScanChart.js';
import type { CliIo } from '../io.js';
import { krylovSummary } from '../krylovSummary.js';
import { nonNegativeInt, nonNegativeNumber, positiveInt, positiveNumber } from '../parse.js';

interface KrylovFlags {
  matrices?: string;
  h?: string;
  s?: string;
  hErr?: string;
  sErr?: string;
  threshold?: number;
  relative?: boolean;
  eigs: number;
  scan?: boolean;
  scanFrom: number;
  scanTo: number;
  scanSteps: number;
  plateauTol?: number;
  plateauLength: number;
  bootstrap: number;
  seed: number;
  checkTol?: number;
  scanOut?: string;
  plot?: string;
  json?: boolean;
  out?: string;
}

/** `bitspan krylov`: energies from measured Krylov matrices H̃ and S by the thresholded generalized eigenproblem. */
export function krylovCommand(io: CliIo): Command {
  const cmd = new Command('krylov').description('energies from Krylov matrices H̃ and S (thresholded generalized eigenproblem, threshold scan, bootstrap)');
  cmd
    .option('--matrices <file>', 'JSON {"h": [[[re, im], ...], ...], "s": ..., "hErr": ..., "sErr": ...}')
    .option('--h <file>', 'H̃ as CSV, one row per Krylov index, columns re,im,re,im,...')
    .option('--s <file>', 'S as CSV, same layout as --h')
    .option('--h-err <file>', 'element errors of H̃ as CSV (r columns, or r re,im pairs)')
    .option('--s-err <file>', 'element errors of S as CSV (r columns, or r re,im pairs)')
    .option('--threshold <t>', 'keep eigenvalues of S above T (default: chosen from the plateau of the scan)', nonNegativeNumber('--threshold'))
    .option('--relative', '--threshold is relative to the largest eigenvalue of S')
    .option('--eigs <k>', 'number of lowest energies', positiveInt('--eigs'), 1)
    .option('--scan', 'report the threshold scan (JSON "scan") and plateau')
    .option('--scan-from <r>', 'smallest scanned threshold, relative to the largest eigenvalue of S', positiveNumber('--scan-from'), SCAN_DEFAULTS.from)
    .option('--scan-to <r>', 'largest scanned threshold, relative to the largest eigenvalue of S', positiveNumber('--scan-to'), SCAN_DEFAULTS.to)
    .option('--scan-steps <n>', 'scanned thresholds per decade', positiveInt('--scan-steps'), SCAN_DEFAULTS.stepsPerDecade)
    .option('--plateau-tol <e>', 'energy spread allowed within a plateau (default: 2 × median first-order energy error, or 1e-6·|E| without errors)', positiveNumber('--plateau-tol'))
    .option('--plateau-length <decades>', 'decades of threshold a plateau must span', nonNegativeNumber('--plateau-length'), 0.5)
    .option('--bootstrap <k>', 'resample the matrices K times within their errors and report the spread of E0', nonNegativeInt('--bootstrap'), 0)
    .option('--seed <n>', 'seed of the bootstrap', nonNegativeInt('--seed'), 1)
    .option('--check-tol <t>', 'absolute tolerance of the Hermiticity and positivity checks (default 1e-8 × largest entry)', positiveNumber('--check-tol'))
    .option('--scan-out <file>', 'write the scan as CSV (.csv) or JSON (any other extension), atomically')
    .option('--plot <file>', 'write the scan plot as SVG, or PNG if FILE ends in .png')
    .option('--json', 'print one JSON object on stdout')
    .option('--out <file>', 'also write the JSON report to FILE (atomically)')
    .action(async (f: KrylovFlags) => {
      const source = sourceFromFlags(f);
      if (f.relative && f.threshold === undefined) throw new BitspanError('bad-argument', '--relative needs --threshold', 'e.g. --threshold 1e-6 --relative');
      if (!(f.scanTo >= f.scanFrom)) throw new BitspanError('bad-argument', `--scan-to ${f.scanTo} is below --scan-from ${f.scanFrom}`, 'e.g. --scan-from 1e-14 --scan-to 1');
      // The pipeline is loaded here, not at the top, so other commands and --help start without it.
      const { krylov } = await import('../../pipeline/krylov.js');
      const { report, scan } = await krylov({
        source,
        threshold: f.threshold,
        relative: f.relative,
        eigs: f.eigs,
        scanFrom: f.scanFrom,
        scanTo: f.scanTo,
        scanSteps: f.scanSteps,
        plateauTolerance: f.plateauTol,
        plateauDecades: f.plateauLength,
        bootstrap: f.bootstrap,
        seed: f.seed,
        checkTolerance: f.checkTol,
      });
      if (f.scan) report.scan = scan;
      // Render everything before writing anything, so a failure leaves no partial set of outputs.
      const outputs: Array<[string, string | Uint8Array]> = [];
      if (f.scanOut) {
        const text = extname(f.scanOut).toLowerCase() === '.csv' ? scanCsv(scan, f.eigs) : JSON.stringify({ noiseFloor: report.noiseFloor, plateau: report.plateau, scan }, null, 2) + '\n';
        outputs.push([f.scanOut, text]);
      }
      if (f.plot) {
        const svg = await lineChartSvg(thresholdScanChart(scan, report.plateau, report.noiseFloor, f.eigs));
        outputs.push([f.plot, extname(f.plot).toLowerCase() === '.png' ? svgToPng(svg) : svg]);
      }
      const json = JSON.stringify(report, null, 2) + '\n';
      if (f.out) outputs.push([f.out, json]);
      for (const [file, data] of outputs) await writeFileAtomic(file, data);
      io.stdout(f.json ? json : krylovSummary(report));
    });
  return cmd;
}

function sourceFromFlags(f: KrylovFlags): KrylovSource {
  const csv = f.h !== undefined || f.s !== undefined || f.hErr !== undefined || f.sErr !== undefined;
  if (f.matrices !== undefined) {
    if (csv) throw new BitspanError('bad-argument', '--matrices cannot be combined with --h/--s/--h-err/--s-err', 'give one JSON file, or CSV files, not both');
    return { matrices: f.matrices };
  }
  if (f.h === undefined || f.s === undefined) throw new BitspanError('bad-argument', 'no matrices given', 'use --matrices FILE.json, or --h H.csv --s S.csv');
  return { h: f.h, s: f.s, hErr: f.hErr, sErr: f.sErr };
}
