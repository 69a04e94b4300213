import { mkdir } from 'node:fs/promises';
import { extname, join } from 'node:path';
import { BitspanError } from '../errors.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { krylovMatricesJson } from '../io/krylovMatricesJson.js';
import { hadamardTestNoise } from '../sim/hadamardTestNoise.js';
import { KrylovMatrixRecorder } from '../sim/krylovMatrixRecorder.js';
import { readHamiltonian } from '../io/readHamiltonian.js';
import { highestQubit } from '../operators/pauliSum.js';
import { evolutionArrays, evolveStates, type EvolutionMethod, type EvolvedState } from '../sim/evolveStates.js';
import { LocalKernels, type SimKernels } from '../sim/simKernels.js';
import { initialConfiguration } from '../sim/initialState.js';
import { NO_NOISE, sampleDump, timeSeed, type Dump, type ShotNoise } from '../sim/sampleDump.js';
import { checkStateFits, createState, MAX_SIM_QUBITS } from '../sim/stateVector.js';
import { fullSpaceOperator } from '../sim/fullSpaceOperator.js';
import { WorkerKernels } from '../sim/workerKernels.js';

/** Everything `simulate` needs; the Hamiltonian path is read here. */
export interface SimulateOptions {
  hamiltonian: string;
  /** A bitstring (qubit 0 rightmost) or a named state (`neel`, `zeros`, ...). */
  initial: string;
  dt: number;
  steps: number;
  shots: number;
  evolution: EvolutionMethod;
  /** Trotter steps per dt (Trotter evolutions only). */
  trotterSteps?: number;
  noise?: ShotNoise;
  seed: number;
  /** Folder for t0.csv … t<steps−1>.csv and simulate.json. */
  out: string;
  /** Also report ⟨H⟩ and its spread for every state. */
  energy?: boolean;
  /** Also write the exact H̃ and S of the simulated states to this JSON file (`krylov --matrices` format). */
  krylovMatrices?: string;
  /** With `krylovMatrices`: also write a Hadamard-test estimate from this many shots per part to `noisyMatricesPath(file)`. */
  matrixShots?: number;
  /** Threads for the state-vector kernels (this one and workers); 1 runs everything here. */
  threads?: number;
  /**
   * Called with every evolved state before it is sampled (the buffer is reused: copy what you keep),
   * with the kernels that act on it — e.g. to accumulate overlaps and ⟨ψ_j|H|ψ_k⟩.
   */
  onState?: (s: EvolvedState, kernels: SimKernels) => void;
  /** Called after each dump is written, and with fractions in between (`done` may be fractional). */
  onProgress?: (done: number, total: number) => void;
}

/** What `simulate` did, as `simulate.json` and `--json` hold it. */
export interface SimulateReport {
  command: 'simulate';
  qubits: number;
  hamiltonian: { file: string; terms: number; constant: number; qubits: number };
  initial: { spec: string; bitstring: string };
  evolution: { method: EvolutionMethod; dt: number; steps: number; trotterSteps: number | null; work: number; threads: number };
  shots: number;
  seed: number;
  noise: ShotNoise;
  dumps: Array<{ file: string; time: number; distinct: number; energy?: number; spread?: number }>;
  timings: { evolve: number; sample: number; write: number; total: number };
  /** With `krylovMatrices`: where H̃ and S went, and how the noisy copy was made. */
  krylovMatrices?: { file: string; noisyFile: string | null; matrixShots: number | null; pauliNorm: number; noiseSeed: number | null };
}

/** Where the noisy Krylov matrices go: `.noisy` before the extension (`k.json` → `k.noisy.json`). */
export function noisyMatricesPath(file: string): string {
  const ext = extname(file);
  return ext ? file.slice(0, -ext.length) + '.noisy' + ext : file + '.noisy';
}

/** Stream index of the Hadamard-test noise: apart from every dump's stream (k ≥ 0). */
const MATRIX_NOISE_STREAM = -2;

/** Registers below this size run on one thread: waking workers would cost more than it saves. */
const POOL_MIN_QUBITS = 14;

/** Render a dump as CSV: `bitstring,count`, the most frequent first (ties: smaller bitstring first). */
export function dumpCsv(d: Dump, qubits: number): string {
  const order = Array.from(d.configs.keys()).sort((a, b) => d.counts[b]! - d.counts[a]! || d.configs[a]! - d.configs[b]!);
  const lines = ['bitstring,count'];
  for (const i of order) lines.push(`${d.configs[i]!.toString(2).padStart(qubits, '0')},${d.counts[i]!}`);
  return lines.join('\n') + '\n';
}

/**
 * Evolve a reference configuration under the Hamiltonian, sample `shots` bitstrings at each time
 * k·dt (k = 0..steps−1) with seeded noise, and write `out/t<k>.csv` plus `out/simulate.json`.
 */
export async function simulate(opts: SimulateOptions): Promise<SimulateReport> {
  const t0 = performance.now();
  const h = await readHamiltonian(opts.hamiltonian);
  const named = !/^[01]+$/.test(opts.initial.trim());
  // The register: as declared, else wide enough for the Hamiltonian and an explicit bitstring.
  const qubits = h.declaredQubits || named ? h.qubits : Math.max(h.qubits, opts.initial.trim().length);
  if (qubits > MAX_SIM_QUBITS) {
    throw new BitspanError('too-large', `the state-vector simulator handles at most ${MAX_SIM_QUBITS} qubits; the Hamiltonian has ${qubits}`, 'use a smaller model', { file: opts.hamiltonian });
  }
  if (highestQubit(h) >= qubits) {
    throw new BitspanError('qubit-mismatch', `the Hamiltonian acts on qubit ${highestQubit(h)} but --initial has ${qubits} qubits`, 'give one character per qubit', { file: opts.hamiltonian });
  }
  const config = initialConfiguration(opts.initial, qubits);
  const noise = opts.noise ?? NO_NOISE;
  checkStateFits(qubits, evolutionArrays(opts.evolution), opts.evolution === 'exact' ? 'exact evolution' : 'Trotter simulation');
  // Before any folder or thread exists: a refusal leaves nothing behind.
  const recorder = opts.krylovMatrices ? new KrylovMatrixRecorder(qubits, opts.steps, evolutionArrays(opts.evolution)) : null;
  await mkdir(opts.out, { recursive: true }).catch((e: NodeJS.ErrnoException) => {
    throw new BitspanError('output-unwritable', `cannot create the output folder (${e.code ?? String(e)})`, 'check the path and permissions', { file: opts.out });
  });
  // Small registers are not worth waking threads for.
  const threads = qubits >= POOL_MIN_QUBITS ? Math.max(1, opts.threads ?? 1) : 1;
  const shared = threads > 1;
  const operator = fullSpaceOperator(h, qubits, shared);
  const kernels: SimKernels = shared ? await WorkerKernels.start(operator, threads) : new LocalKernels(operator);
  const psi = createState(qubits, shared);
  psi.re[config] = 1;
  const report: SimulateReport = {
    command: 'simulate',
    qubits,
    hamiltonian: { file: opts.hamiltonian, terms: h.terms.length, constant: h.constant, qubits: h.qubits },
    initial: { spec: opts.initial, bitstring: config.toString(2).padStart(qubits, '0') },
    evolution: { method: opts.evolution, dt: opts.dt, steps: opts.steps, trotterSteps: opts.evolution === 'exact' ? null : (opts.trotterSteps ?? 1), work: 0, threads },
    shots: opts.shots,
    seed: opts.seed,
    noise,
    dumps: [],
    timings: { evolve: 0, sample: 0, write: 0, total: 0 },
  };
  let mark = performance.now();
  const evolution = evolveStates(h, psi, {
    method: opts.evolution,
    dt: opts.dt,
    steps: opts.steps,
    trotterSteps: opts.trotterSteps,
    energy: opts.energy,
    operator,
    kernels,
    shared,
    onTick: (k, fraction) => opts.onProgress?.(k + fraction, opts.steps),
  });
  try {
    for (const s of evolution) {
      recorder?.add(s.state, kernels);
      opts.onState?.(s, kernels);
      const t1 = performance.now();
      report.timings.evolve += (t1 - mark) / 1000;
      const dump = sampleDump(s.state, opts.shots, noise, opts.seed, s.k);
      const t2 = performance.now();
      report.timings.sample += (t2 - t1) / 1000;
      const file = join(opts.out, `t${s.k}.csv`);
      await writeFileAtomic(file, dumpCsv(dump, qubits));
      const entry: SimulateReport['dumps'][number] = { file, time: s.time, distinct: dump.configs.length };
      if (s.energy) {
        entry.energy = s.energy.mean;
        entry.spread = s.energy.spread;
      }
      report.dumps.push(entry);
      report.evolution.work = s.work;
      mark = performance.now();
      report.timings.write += (mark - t2) / 1000;
      opts.onProgress?.(s.k + 1, opts.steps);
    }
  } finally {
    kernels.close();
  }
  if (recorder && opts.krylovMatrices) {
    const exact = recorder.result();
    // λ = Σ|c| over all terms and the constant: the 1-norm that bounds ‖H‖ (see hadamardTestNoise).
    const pauliNorm = Math.abs(h.constant) + h.terms.reduce((a, t) => a + Math.abs(t.coeff), 0);
    const info = { source: 'bitspan simulate', times: report.dumps.map((d) => d.time), evolution: report.evolution.method, initial: report.initial.bitstring, pauliNorm };
    await writeFileAtomic(opts.krylovMatrices, krylovMatricesJson({ ...exact, info: { ...info, matrixShots: null } }));
    let noisyFile: string | null = null;
    let noiseSeed: number | null = null;
    if (opts.matrixShots) {
      noisyFile = noisyMatricesPath(opts.krylovMatrices);
      noiseSeed = timeSeed(opts.seed, MATRIX_NOISE_STREAM);
      const noisy = hadamardTestNoise(exact, { shots: opts.matrixShots, scale: pauliNorm, seed: noiseSeed });
      await writeFileAtomic(noisyFile, krylovMatricesJson({ ...noisy, info: { ...info, matrixShots: opts.matrixShots, seed: opts.seed } }));
    }
    report.krylovMatrices = { file: opts.krylovMatrices, noisyFile, matrixShots: opts.matrixShots ?? null, pauliNorm, noiseSeed };
  }
  report.timings.total = (performance.now() - t0) / 1000;
  await writeFileAtomic(join(opts.out, 'simulate.json'), JSON.stringify(report, null, 2) + '\n');
  return report;
}
