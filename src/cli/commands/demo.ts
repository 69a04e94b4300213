import { Command } from 'commander';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { DemoReport, DemoRow } from '../../pipeline/demo.js';
import type { CliIo } from '../io.js';
import { packageRoot } from '../../util/packageRoot.js';

/** fixtures/demo of the package this module belongs to, else of the working folder. */
function defaultFixtures(): string {
  const beside = join(packageRoot(), 'fixtures', 'demo');
  return existsSync(beside) ? beside : 'fixtures/demo';
}

const pad = (s: string, n: number): string => (s.length >= n ? s : ' '.repeat(n - s.length) + s);

function rowLine(r: DemoRow): string {
  return [
    pad(String(r.dumps), 5),
    pad(r.time.toFixed(2), 6),
    pad(String(r.keptShots), 10),
    pad(String(r.dimension), 9),
    pad(r.energy.toFixed(8), 15),
    pad(r.residual.toExponential(1), 9),
    pad(r.error.toExponential(3), 11),
    pad((100 * r.relativeError).toFixed(3) + '%', 8),
  ].join('  ');
}

const HEADER = ['dumps', 't_max', 'kept shots', 'subspace', 'energy', 'residual', 'error', 'rel.err'];
const WIDTHS = [5, 6, 10, 9, 15, 9, 11, 8];

function exactLine(e: DemoReport['exact'], sector: string): string {
  return `exact: E0 = ${e.energy.toFixed(8)}   residual ${e.residual.toExponential(1)}   subspace ${e.dimension} configurations (${sector}, whole sector)`;
}

/** `bitspan demo`: replay the shipped scenario, solve on growing sets of dumps, compare with exact. */
export function demoCommand(io: CliIo): Command {
  return new Command('demo')
    .description('replay the shipped demo: solve on the first 1, 2, ..., r dumps and compare with the exact sector energy')
    .option('--fixtures <dir>', 'folder with scenario.json, the Hamiltonian and the dumps (default: fixtures/demo)')
    .option('--out <dir>', 'folder for demo.json and demo.csv', 'out/demo')
    .option('--json', 'print the report as one JSON object on stdout instead of the table')
    .action(async (f: { fixtures?: string; out: string; json?: boolean }) => {
      const fixtures = f.fixtures ?? defaultFixtures();
      // The pipeline is loaded here, not at the top, so other commands and --help start without it.
      const { runDemo } = await import('../../pipeline/demo.js');
      const report = await runDemo({
        fixtures,
        out: f.out,
        onExact: (info) => {
          if (f.json) return;
          io.stdout(`bitspan demo: ${info.title}\n${info.qubits} qubits, dumps from ${fixtures}\n${exactLine(info.exact, info.sector)}\n`);
          io.stdout('solve on the first k dumps (error = energy - exact E0):\n');
          io.stdout(HEADER.map((h, i) => pad(h, WIDTHS[i]!)).join('  ') + '\n');
        },
        onRow: (row) => {
          if (!f.json) io.stdout(rowLine(row) + '\n');
        },
      });
      if (f.json) io.stdout(JSON.stringify(report, null, 2) + '\n');
      else io.stdout(`results: ${report.files.json}, ${report.files.csv}   (exact ${report.timings.exact.toFixed(1)}s, solves ${report.timings.solves.toFixed(1)}s, total ${report.timings.total.toFixed(1)}s)\n`);
    });
}
