/**
 * Dev benchmark: `node dist/bench/simulate.js [--qubits 20] [--threads 2]` times one second-order
 * Trotter step, one product with H and one exact (Chebyshev) step of a periodic Heisenberg
 * lattice on one thread and on the pool, and prints the times and their ratios as JSON (the
 * ratios, measured in the same run, are what to compare across machines).
 */
import { heisenbergModel } from '../src/operators/models/heisenberg.js';
import { fullSpaceOperator } from '../src/sim/fullSpaceOperator.js';
import { LocalKernels, type SimKernels } from '../src/sim/simKernels.js';
import { WorkerKernels } from '../src/sim/workerKernels.js';
import { TrotterPropagator } from '../src/sim/trotterPropagator.js';
import { ChebyshevPropagator } from '../src/sim/chebyshevPropagator.js';
import { gershgorinBounds } from '../src/sim/spectralBounds.js';
import { createState } from '../src/sim/stateVector.js';

function flag(name: string, fallback: number): number {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? Number(process.argv[i + 1]) : fallback;
}

async function main(): Promise<void> {
  const qubits = flag('qubits', 20);
  const threads = flag('threads', 2);
  // A periodic lattice as square as the qubit count allows.
  let ly = Math.floor(Math.sqrt(qubits));
  while (qubits % ly) ly--;
  const lattice = { kind: 'square' as const, lx: qubits / ly, ly, boundary: 'periodic' as const };
  const h = heisenbergModel({ lattice, j: 1 }).hamiltonian;
  const op = fullSpaceOperator(h, qubits, true);
  const bounds = gershgorinBounds(op);
  const time = (f: () => void): number => {
    const t = performance.now();
    f();
    return (performance.now() - t) / 1000;
  };
  const measure = (k: SimKernels): Record<string, number> => {
    const psi = createState(qubits, true);
    psi.re[0x5555 & (2 ** qubits - 1)] = 1;
    const y = createState(qubits, true);
    const trotter = new TrotterPropagator(op, k, 2, 0.1, true);
    const cheb = new ChebyshevPropagator(op, k, bounds, true);
    return {
      trotter2Step: time(() => trotter.step(psi, 1)),
      applyH: time(() => k.applyH(psi, y, 1, 0, 0)),
      exactStep: time(() => cheb.step(psi, 0.25)),
    };
  };
  // Second of two runs each: the first compiles the kernels.
  const local = new LocalKernels(op);
  measure(local);
  const one = measure(local);
  const pool = await WorkerKernels.start(op, threads);
  measure(pool);
  const many = measure(pool);
  pool.close();
  const ratio = Object.fromEntries(Object.keys(one).map((k) => [k, one[k]! / many[k]!]));
  process.stdout.write(JSON.stringify({ qubits, lattice: `${lattice.lx}x${lattice.ly}`, terms: h.terms.length, threads, seconds: { oneThread: one, pool: many }, speedup: ratio, rssMiB: process.memoryUsage().rss / 2 ** 20 }, null, 2) + '\n');
}

void main();
