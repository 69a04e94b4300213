// `npm run bench`: bitspan against the independent numpy/scipy peer (bench/reference_pipeline.py)
// on deterministic Heisenberg cases, all in one invocation so every ratio compares like with like.
// Usage: node dist/bench/run.js [--sizes 1e4,1e5,1e6] [--qubits 64|100] [--skip-peer] [--out bench/results.json]
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeBenchCase } from './cases.js';
import { writeFileAtomic } from '../src/io/atomicWrite.js';
import { packageRoot } from '../src/util/packageRoot.js';

interface Args {
  sizes: number[];
  qubits: number;
  peer: boolean;
  out: string;
}

function parseArgs(argv: string[]): Args {
  const a: Args = { sizes: [1e4, 1e5, 1e6], qubits: 64, peer: true, out: join(packageRoot(), 'bench', 'results.json') };
  for (let i = 0; i < argv.length; i++) {
    const k = argv[i];
    if (k === '--sizes') a.sizes = argv[++i]!.split(',').map(Number);
    else if (k === '--qubits') a.qubits = Number(argv[++i]);
    else if (k === '--skip-peer') a.peer = false;
    else if (k === '--out') a.out = argv[++i]!;
    else throw new Error(`unknown argument ${k}`);
  }
  return a;
}

const bin = join(packageRoot(), 'dist', 'src', 'cli', 'bin.js');

/** Run `bitspan solve --json` as a fresh process; wall time measured here, stage times and peak RSS from its report. */
function runBitspan(hamiltonian: string, samples: string, weight: number, threads: number): Record<string, unknown> & { wall: number } {
  const t = performance.now();
  const r = spawnSync(process.execPath, [bin, 'solve', '--hamiltonian', hamiltonian, '--samples', samples, '--weight', String(weight), '--threads', String(threads), '--json'], { encoding: 'utf8', maxBuffer: 1 << 26 });
  const wall = (performance.now() - t) / 1000;
  if (r.status !== 0) throw new Error(`bitspan failed: ${r.stderr}`);
  return { ...JSON.parse(r.stdout), wall };
}

/** The real interpreter behind `python3` (a version-manager shim would add its own start-up to the peer's time). */
const python = ((): string => {
  const r = spawnSync('python3', ['-c', 'import sys; print(sys.executable)'], { encoding: 'utf8' });
  return r.status === 0 && r.stdout.trim() ? r.stdout.trim() : 'python3';
})();

function runPeer(hamiltonian: string, samples: string, weight: number): Record<string, unknown> & { wall: number } {
  const t = performance.now();
  const r = spawnSync(python, [join(packageRoot(), 'bench', 'reference_pipeline.py'), '--hamiltonian', hamiltonian, '--samples', samples, '--weight', String(weight), '--json'], { encoding: 'utf8', maxBuffer: 1 << 26 });
  const wall = (performance.now() - t) / 1000;
  if (r.status !== 0) throw new Error(`peer failed: ${r.stderr}`);
  return { ...JSON.parse(r.stdout), wall };
}

function numpyTriad(): number | null {
  const code = 'import os\nos.environ["OPENBLAS_NUM_THREADS"]="1"\nimport numpy as np,time\nn=1<<25\na=np.zeros(n);b=np.ones(n);c=np.full(n,2.0);t=np.empty(n)\nbest=9e9\nfor r in range(6):\n  s=time.perf_counter();np.multiply(c,3.0,out=t);np.add(b,t,out=a);d=time.perf_counter()-s\n  best=min(best,d) if r else best\nprint(5*8*n/best/1e9)';
  const r = spawnSync(python, ['-c', code], { encoding: 'utf8' });
  return r.status === 0 ? Number(r.stdout.trim()) : null;
}

/**
 * Measurements that allocate a lot run in child processes (bench/measure.ts): Linux carries a
 * parent's peak RSS into its children, so a large parent would inflate every child's peak.
 */
function measure(kind: 'stream' | 'matvec', extra: string[] = []): Record<string, number> {
  const r = spawnSync(process.execPath, [join(packageRoot(), 'dist', 'bench', 'measure.js'), kind, ...extra], { encoding: 'utf8', maxBuffer: 1 << 24 });
  if (r.status !== 0) throw new Error(`measure ${kind} failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as Record<string, number>;
}

async function main(): Promise<void> {
  const args = parseArgs(process.argv.slice(2));
  const stream = measure('stream').triadGBs!;
  const streamNumpy = args.peer ? numpyTriad() : null;
  console.log(`stream triad: ${stream.toFixed(1)} GB/s (JavaScript, one core)${streamNumpy ? `, ${streamNumpy.toFixed(1)} GB/s (numpy, one core)` : ''}`);
  const rows: Array<Record<string, unknown>> = [];
  for (const size of args.sizes) {
    const dir = mkdtempSync(join(tmpdir(), 'bitspan-bench-'));
    try {
      const side = args.qubits === 100 ? 10 : 8;
      const c = writeBenchCase(dir, { side, distinct: size, seed: 1, qubits: args.qubits });
      const ours1 = runBitspan(c.hamiltonian, c.samples, c.weight, 1);
      const ours2 = runBitspan(c.hamiltonian, c.samples, c.weight, 2);
      const peer = args.peer ? runPeer(c.hamiltonian, c.samples, c.weight) : null;
      const mv = size <= 2e6 ? measure('matvec', [c.hamiltonian, c.samples, String(c.weight)]) : null;
      const peak = (o: Record<string, unknown>): number => (o.timings as { peakRSSMB: number }).peakRSSMB;
      const buildStage = (o: Record<string, unknown>): number => (o.timings as { build: number }).build;
      const row = {
        distinct: size,
        qubits: c.qubits,
        dimension: ours2.dimension,
        nonzeros: ours2.nonzeros,
        energy: (ours2.energies as number[])[0],
        residual: (ours2.residuals as number[])[0],
        matvecs: ours2.matvecs,
        timings: ours2.timings,
        wallThreads1: ours1.wall,
        wallThreads2: ours2.wall,
        peakMB: peak(ours2),
        buildSpeedupThreads2: mv?.buildSpeedup ?? buildStage(ours1) / buildStage(ours2),
        // The solves' own build stages (each stored as that thread count stores it, with the stage's serial steps).
        buildStageSpeedupThreads2: buildStage(ours1) / buildStage(ours2),
        timingsThreads1: ours1.timings,
        matvec: mv,
        matvecBandwidthFraction: mv ? mv.bandwidth1GBs! / stream : null,
        matvecBandwidthFractionTeam: mv ? mv.bandwidth2GBs! / stream : null,
        peer: peer ? { energy: peer.energy, residual: peer.residual, wall: peer.wall, timings: peer.timings, peakMB: peer.peakRSSMB, matvecs: peer.matvecs, nonzeros: peer.nonzeros } : null,
        ratioWall: peer ? ours2.wall / peer.wall : null,
        ratioPeakMemory: peer ? peak(ours2) / (peer.peakRSSMB as number) : null,
        energyDifference: peer ? Math.abs((ours2.energies as number[])[0]! - (peer.energy as number)) : null,
      };
      rows.push(row);
      console.log(
        `D=${size.toExponential(0)} (${c.qubits} qubits): dim ${row.dimension}, nnz ${row.nonzeros}, E0 ${Number(row.energy).toFixed(9)} (residual ${Number(row.residual).toExponential(1)}), ` +
          `wall ${ours2.wall.toFixed(2)}s (threads 1: ${ours1.wall.toFixed(2)}s), peak ${row.peakMB.toFixed(0)} MB, matvecs ${row.matvecs}` +
          (peer ? ` | peer ${peer.wall.toFixed(2)}s ${Number(peer.peakRSSMB).toFixed(0)} MB → time ratio ${row.ratioWall!.toFixed(2)}, memory ratio ${row.ratioPeakMemory!.toFixed(2)}` : '') +
          ` | build stage ${buildStage(ours1).toFixed(2)}s → ${buildStage(ours2).toFixed(2)}s on 2 threads (${row.buildStageSpeedupThreads2.toFixed(2)}×)` +
          (mv ? ` | build speed-up (2 vs 1 threads, same storage) ${mv.buildSpeedup!.toFixed(2)}×, product ${mv.bandwidth1GBs!.toFixed(1)} GB/s = ${(100 * row.matvecBandwidthFraction!).toFixed(0)}% of stream (2 threads: ${mv.bandwidth2GBs!.toFixed(1)} GB/s = ${(100 * row.matvecBandwidthFractionTeam!).toFixed(0)}%)` : ''),
      );
      console.log(`  stages: ${Object.entries(ours2.timings as Record<string, number>).map(([k, v]) => (k === 'peakRSSMB' ? `peak ${v.toFixed(0)} MiB` : `${k} ${v.toFixed(2)}s`)).join(', ')}`);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
  const result = { date: new Date().toISOString(), node: process.version, streamTriadGBs: stream, streamTriadNumpyGBs: streamNumpy, rows };
  await writeFileAtomic(args.out, JSON.stringify(result, null, 2) + '\n');
  console.log(`results written to ${args.out}`);
}

await main();
