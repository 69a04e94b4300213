import { Command } from 'commander';
import { availableParallelism } from 'node:os';
import { BitspanError } from '../../errors.js';
import type { SimulateReport } from '../../pipeline/simulate.js';
import type { EvolutionMethod } from '../../sim/evolveStates.js';
import type { ShotNoise } from '../../sim/sampleDump.js';
import type { CliIo } from '../io.js';
import { nonNegativeInt, oneOf, positiveInt, positiveNumber } from '../parse.js';

interface SimulateFlags {
  hamiltonian: string;
  initial: string;
  dt: number;
  steps: number;
  shots: number;
  evolution: EvolutionMethod;
  trotterSteps?: number;
  readoutError?: [number, number];
  flipNoise?: number;
  seed: number;
  out: string;
  energy?: boolean;
  krylovMatrices?: string;
  matrixShots?: number;
  threads: number;
  json?: boolean;
}

function probability(flag: string, v: string): number {
  const x = Number(v);
  if (v.trim() === '' || !Number.isFinite(x) || x < 0 || x > 1) throw new BitspanError('bad-argument', `${flag} '${v}' is not a probability between 0 and 1`, `e.g. ${flag} 0.01`);
  return x;
}

function readoutPair(v: string): [number, number] {
  const parts = v.split(',');
  if (parts.length > 2) throw new BitspanError('bad-argument', `--readout-error '${v}' is not P01,P10`, 'e.g. --readout-error 0.01,0.03 (0 read as 1, 1 read as 0)');
  const p01 = probability('--readout-error', parts[0]!);
  return [p01, parts.length === 2 ? probability('--readout-error', parts[1]!) : p01];
}

/** Terminal summary: what was written, never an energy without its spread. */
function simulateSummary(r: SimulateReport, out: string): string {
  const lines = [
    `bitspan simulate: ${r.qubits} qubits, ${r.evolution.method} evolution from ${r.initial.bitstring} (${r.initial.spec}), dt ${r.evolution.dt}, ${r.evolution.steps} times${r.evolution.trotterSteps !== null ? `, ${r.evolution.trotterSteps} Trotter step(s) per dt` : ''}`,
    `shots ${r.shots} per time, seed ${r.seed}, readout error 0->1 ${r.noise.p01}, 1->0 ${r.noise.p10}, flip noise ${r.noise.flip}`,
  ];
  for (const d of r.dumps) {
    const e = d.energy !== undefined ? `   <H> = ${d.energy.toFixed(10)} +- ${d.spread!.toExponential(3)} (spread of H in the full ${r.qubits}-qubit state)` : '';
    lines.push(`  t = ${d.time.toPrecision(6)}: ${d.file} (${d.distinct} distinct)${e}`);
  }
  if (r.krylovMatrices) {
    const k = r.krylovMatrices;
    lines.push(`Krylov matrices of the same ${r.dumps.length} states: ${k.file} (exact)${k.noisyFile ? `, ${k.noisyFile} (${k.matrixShots} Hadamard-test shots per part, Pauli 1-norm ${k.pauliNorm})` : ''}`);
  }
  lines.push(`wrote ${r.dumps.length} dumps and simulate.json to ${out}; timings: evolve ${r.timings.evolve.toFixed(3)}s, sample ${r.timings.sample.toFixed(3)}s, write ${r.timings.write.toFixed(3)}s`);
  return lines.join('\n') + '\n';
}

/** `bitspan simulate`: sample dumps of a time-evolved reference state, as a hardware Krylov run would. */
export function simulateCommand(io: CliIo): Command {
  return new Command('simulate')
    .description('state-vector simulation of a Krylov-type experiment: one CSV dump of sampled bitstrings per evolution time')
    .requiredOption('--hamiltonian <file>', 'Pauli-sum Hamiltonian (text or .json)')
    .requiredOption('--initial <state>', 'reference configuration: a bitstring (qubit 0 rightmost), neel, neel-even, zeros, ones or half')
    .requiredOption('--dt <dt>', 'time between dumps', positiveNumber('--dt'))
    .requiredOption('--steps <r>', 'number of dumps, at times k*dt for k = 0..r-1', positiveInt('--steps'))
    .requiredOption('--shots <s>', 'shots per dump', positiveInt('--shots'))
    .option('--evolution <method>', 'exact, trotter1 or trotter2', oneOf('--evolution', ['exact', 'trotter1', 'trotter2'] as const), 'exact')
    .option('--trotter-steps <m>', 'Trotter steps per dt (trotter1/trotter2)', positiveInt('--trotter-steps'))
    .option('--readout-error <p01,p10>', 'readout error: probability of reading 0 as 1, and 1 as 0 (one value: both)', readoutPair)
    .option('--flip-noise <p>', 'probability of flipping each bit before readout', (v) => probability('--flip-noise', v))
    .option('--seed <n>', 'seed of the sampling and noise streams', nonNegativeInt('--seed'), 1)
    .requiredOption('--out <dir>', 'folder for t0.csv ... t<r-1>.csv and simulate.json (created if missing)')
    .option('--energy', 'also report <H> and its spread ||H psi - <H> psi|| for every state')
    .option('--krylov-matrices <file>', 'also write the exact H~ and S of the simulated states as JSON (the format of krylov --matrices)')
    .option('--matrix-shots <n>', 'with --krylov-matrices: also write FILE with .noisy before the extension, estimated from n Hadamard-test shots per element part', positiveInt('--matrix-shots'))
    .option('--threads <n>', 'threads for the state-vector kernels (default: all cores; small registers use one)', positiveInt('--threads'), availableParallelism())
    .option('--json', 'print the report as one JSON object on stdout')
    .action(async (f: SimulateFlags) => {
      if (f.matrixShots !== undefined && !f.krylovMatrices) throw new BitspanError('bad-argument', '--matrix-shots needs --krylov-matrices FILE', 'add --krylov-matrices krylov.json');
      const noise: ShotNoise = { p01: f.readoutError?.[0] ?? 0, p10: f.readoutError?.[1] ?? 0, flip: f.flipNoise ?? 0 };
      // The pipeline is loaded here, not at the top, so other commands and --help start without it.
      const { simulate } = await import('../../pipeline/simulate.js');
      const cliProgress = io.stderrIsTTY && !f.json ? (await import('cli-progress')).default : undefined;
      const bar = cliProgress ? new cliProgress.SingleBar({ stream: process.stderr, format: 'simulate [{bar}] {percentage}% | {dumps}/{total} dumps | {duration_formatted} (eta {eta_formatted})', hideCursor: true }, cliProgress.Presets.shades_classic) : undefined;
      bar?.start(f.steps, 0, { dumps: 0 });
      try {
        const report = await simulate({
          hamiltonian: f.hamiltonian,
          initial: f.initial,
          dt: f.dt,
          steps: f.steps,
          shots: f.shots,
          evolution: f.evolution,
          trotterSteps: f.trotterSteps,
          noise,
          seed: f.seed,
          out: f.out,
          energy: f.energy,
          krylovMatrices: f.krylovMatrices,
          matrixShots: f.matrixShots,
          threads: f.threads,
          onProgress: (done) => bar?.update(done, { dumps: Math.floor(done) }),
        });
        bar?.stop();
        io.stdout(f.json ? JSON.stringify(report, null, 2) + '\n' : simulateSummary(report, f.out));
      } finally {
        bar?.stop();
      }
    });
}
