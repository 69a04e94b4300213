import { readFile, mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { BitspanError } from '../errors.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import type { Sector } from '../sectors/sector.js';
import { describeSector } from '../sectors/sector.js';
import { exact } from './exact.js';
import { solve } from './solve.js';
import type { DemoScenario } from './demoScenario.js';

/** What `fixtures/demo/scenario.json` holds: the scenario and the files it produced. */
export interface DemoManifest {
  scenario: DemoScenario;
  hamiltonian: string;
  /** Dump file names in time order, relative to the fixture folder. */
  dumps: Array<{ file: string; time: number }>;
}

/** One row of the demo table: `solve` on the first `dumps` dumps. */
export interface DemoRow {
  dumps: number;
  /** Latest evolution time included. */
  time: number;
  shots: number;
  keptShots: number;
  dimension: number;
  energy: number;
  residual: number;
  converged: boolean;
  /** energy − exact energy (≥ 0 up to the residuals, by the variational principle). */
  error: number;
  relativeError: number;
}

/** The demo's results, as written to demo.json. */
export interface DemoReport {
  command: 'demo';
  title: string;
  qubits: number;
  sector: string;
  exact: { energy: number; residual: number; dimension: number; converged: boolean };
  rows: DemoRow[];
  files: { json: string; csv: string };
  timings: { exact: number; solves: number; total: number };
}

/** Options of `runDemo`. */
export interface DemoOptions {
  /** Folder holding scenario.json, the Hamiltonian and the dumps. */
  fixtures: string;
  /** Folder for demo.json and demo.csv (created if missing). */
  out: string;
  /** Called once the exact reference is known, before the first solve. */
  onExact?: (info: Pick<DemoReport, 'title' | 'qubits' | 'sector' | 'exact'>) => void;
  /** Called after each solve, for progress output. */
  onRow?: (row: DemoRow, total: number) => void;
}

/** Read and check the fixture manifest. */
export async function readDemoManifest(fixtures: string): Promise<DemoManifest> {
  const file = join(fixtures, 'scenario.json');
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (e) {
    throw new BitspanError('file-unreadable', `demo scenario not found (${(e as NodeJS.ErrnoException).code ?? String(e)})`, 'run from the repository root, pass --fixtures DIR, or regenerate with npm run make-demo', { file });
  }
  let m: DemoManifest;
  try {
    m = JSON.parse(text) as DemoManifest;
  } catch (e) {
    throw new BitspanError('bad-manifest', `scenario.json is not valid JSON: ${(e as Error).message}`, 'regenerate it with npm run make-demo', { file });
  }
  if (typeof m.hamiltonian !== 'string' || !Array.isArray(m.dumps) || m.dumps.length === 0 || typeof m.scenario !== 'object') {
    throw new BitspanError('bad-manifest', 'scenario.json lacks "hamiltonian", "dumps" or "scenario"', 'regenerate it with npm run make-demo', { file });
  }
  return m;
}

function csvOf(rows: DemoRow[]): string {
  const head = 'dumps,time,shots,kept_shots,dimension,energy,residual,error,relative_error,converged';
  const body = rows.map((r) => [r.dumps, r.time, r.shots, r.keptShots, r.dimension, r.energy, r.residual, r.error, r.relativeError, r.converged].join(','));
  return [head, ...body].join('\n') + '\n';
}

/**
 * Replay the shipped scenario: the exact ground energy of the sector, then `solve` on the first
 * 1, 2, …, r dumps, each energy with its residual, subspace dimension and error against exact.
 * Writes demo.json and demo.csv atomically into `out`.
 */
export async function runDemo(opts: DemoOptions): Promise<DemoReport> {
  const t0 = performance.now();
  const manifest = await readDemoManifest(opts.fixtures);
  const hamiltonian = join(opts.fixtures, manifest.hamiltonian);
  const sector: Sector = manifest.scenario.sector;
  const ref = await exact({ hamiltonian, sector });
  const t1 = performance.now();
  const e0 = ref.report.energies[0]!;
  const qubits = ref.report.qubits;
  const exactInfo = { energy: e0, residual: ref.report.residuals[0]!, dimension: ref.report.dimension, converged: ref.report.converged };
  opts.onExact?.({ title: manifest.scenario.title, qubits, sector: describeSector(sector, qubits), exact: exactInfo });
  const rows: DemoRow[] = [];
  for (let k = 1; k <= manifest.dumps.length; k++) {
    const files = manifest.dumps.slice(0, k).map((d) => join(opts.fixtures, d.file));
    const { report } = await solve({ hamiltonian, samples: files, sector });
    const energy = report.energies[0]!;
    const row: DemoRow = {
      dumps: k,
      time: manifest.dumps[k - 1]!.time,
      shots: report.samples.shots,
      keptShots: report.samples.keptShots,
      dimension: report.dimension,
      energy,
      residual: report.residuals[0]!,
      converged: report.converged,
      error: energy - e0,
      relativeError: Math.abs((energy - e0) / e0),
    };
    rows.push(row);
    opts.onRow?.(row, manifest.dumps.length);
  }
  const t2 = performance.now();
  await mkdir(opts.out, { recursive: true }).catch((e: NodeJS.ErrnoException) => {
    throw new BitspanError('output-unwritable', `cannot create the output folder (${e.code ?? String(e)})`, 'check the path and permissions', { file: opts.out });
  });
  const files = { json: join(opts.out, 'demo.json'), csv: join(opts.out, 'demo.csv') };
  const report: DemoReport = {
    command: 'demo',
    title: manifest.scenario.title,
    qubits,
    sector: describeSector(sector, qubits),
    exact: exactInfo,
    rows,
    files,
    timings: { exact: (t1 - t0) / 1000, solves: (t2 - t1) / 1000, total: (performance.now() - t0) / 1000 },
  };
  await writeFileAtomic(files.csv, csvOf(rows));
  await writeFileAtomic(files.json, JSON.stringify(report, null, 2) + '\n');
  return report;
}
