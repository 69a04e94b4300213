import type { Command } from 'commander';
import { parseMemorySize } from '../build/memoryPlan.js';
import type { Qubit0 } from '../io/bitstringParser.js';
import type { SampleFormat } from '../io/readSamples.js';
import { parseWeightSpec, type Sector } from '../sectors/sector.js';
import { collect, nonNegativeNumber, oneOf, positiveInt, positiveNumber } from './parse.js';

/** The sample and sector flags shared by every command that reads dumps. */
export function addSampleOptions(cmd: Command): Command {
  return cmd
    .option('--weight <spec>', 'keep configurations with K ones (K), or K ones among qubits A..B (A-B=K); repeatable', collect)
    .option('--parity <even|odd>', 'keep configurations of this total parity', oneOf('--parity', ['even', 'odd'] as const))
    .option('--min-count <c>', 'keep configurations seen at least C times in all dumps together', nonNegativeNumber('--min-count'))
    .option('--max-dim <d>', 'keep at most D configurations, the most frequent first', positiveInt('--max-dim'))
    .option('--qubits <n>', 'register size (needed for hexadecimal bitstrings)', positiveInt('--qubits'))
    .option('--qubit0 <right|left>', 'which end of a bitstring is qubit 0', oneOf('--qubit0', ['right', 'left'] as const), 'right')
    .option('--format <fmt>', 'sample format: auto (by extension), csv, json or text', oneOf('--format', ['auto', 'csv', 'json', 'text'] as const), 'auto');
}

export interface SampleFlags {
  weight?: string[];
  parity?: 'even' | 'odd';
  minCount?: number;
  maxDim?: number;
  qubits?: number;
  qubit0: Qubit0;
  format: SampleFormat;
}

/** The sector described by the flags. */
export function sectorFromFlags(f: SampleFlags): Sector {
  return {
    weights: (f.weight ?? []).map((s) => {
      const w = parseWeightSpec(s);
      return { lo: w.lo, hi: w.hi, weight: w.weight };
    }),
    parity: f.parity,
  };
}

/** The solver flags shared by commands that diagonalise. */
export function addSolverOptions(cmd: Command): Command {
  return cmd
    .option('--eigs <k>', 'number of lowest eigenpairs', positiveInt('--eigs'), 1)
    .option('--tol <t>', 'converged when the residual norm is below tol times the largest |eigenvalue|', positiveNumber('--tol'), 1e-8)
    .option('--seed <n>', 'seed of the Lanczos start vector', (v) => Number(positiveIntOrZero(v)), 1)
    .option('--threads <n>', "worker threads for the build and the products (default: the machine's cores)", positiveInt('--threads'))
    .option('--memory <size>', 'memory budget, e.g. 4G (default: half the RAM); over it H is applied matrix-free', parseMemorySize)
    .option('--matrix-free', 'apply H on the fly instead of storing the projected matrix');
}

/** Values of the solver flags. */
export interface SolverFlags {
  eigs: number;
  tol: number;
  seed: number;
  threads?: number;
  memory?: number;
  matrixFree?: boolean;
}

function positiveIntOrZero(v: string): number {
  return /^\d+$/.test(v) ? Number(v) : positiveInt('--seed')(v);
}

/** The sample, sector and solver options every diagonalising command passes on to the library. */
export function sampleAndSolverOptions(f: SampleFlags & SolverFlags): {
  sector: Sector;
  minCount?: number;
  maxDim?: number;
  eigs: number;
  tol: number;
  seed: number;
  qubits?: number;
  qubit0: Qubit0;
  format: SampleFormat;
  threads?: number;
  memoryBytes?: number;
  matrixFree?: boolean;
} {
  return {
    sector: sectorFromFlags(f),
    minCount: f.minCount,
    maxDim: f.maxDim,
    eigs: f.eigs,
    tol: f.tol,
    seed: f.seed,
    qubits: f.qubits,
    qubit0: f.qubit0,
    format: f.format,
    threads: f.threads,
    memoryBytes: f.memory,
    matrixFree: f.matrixFree,
  };
}
