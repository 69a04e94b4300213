import { Command } from 'commander';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import { solve } from '../../pipeline/solve.js';
import type { CliIo } from '../io.js';
import { positiveInt } from '../parse.js';
import { addSampleOptions, addSolverOptions, sectorFromFlags, type SampleFlags, type SolverFlags } from '../sectorOptions.js';
import { solveSummary } from '../summary.js';
import { progressFor } from '../progress.js';

interface SolveFlags extends SampleFlags, SolverFlags {
  hamiltonian: string;
  samples: string[];
  eigs: number;
  tol: number;
  seed: number;
  json?: boolean;
  out?: string;
  top: number;
}

/** `bitspan solve`: the lowest energies of the Hamiltonian projected on the sampled configurations. */
export function solveCommand(io: CliIo): Command {
  const cmd = new Command('solve').description('lowest energies of a Pauli Hamiltonian projected on sampled configurations');
  cmd.requiredOption('--hamiltonian <file>', 'Pauli-sum Hamiltonian (text or .json)');
  cmd.requiredOption('--samples <files...>', 'sample dumps (CSV, JSON counts or text), one group per file');
  addSampleOptions(cmd);
  addSolverOptions(cmd);
  cmd
    .option('--top <n>', 'most probable ground-state configurations to report', positiveInt('--top'), 10)
    .option('--json', 'print one JSON object on stdout')
    .option('--out <file>', 'also write the JSON report to FILE (atomically)')
    .action(async (f: SolveFlags) => {
      const progress = progressFor(io, Boolean(f.json));
      const { report } = await solve({
        hamiltonian: f.hamiltonian,
        samples: f.samples,
        sector: sectorFromFlags(f),
        minCount: f.minCount,
        maxDim: f.maxDim,
        eigs: f.eigs,
        tol: f.tol,
        seed: f.seed,
        qubits: f.qubits,
        qubit0: f.qubit0,
        format: f.format,
        top: f.top,
        threads: f.threads,
        memoryBytes: f.memory,
        matrixFree: f.matrixFree,
        onBuildProgress: (d, t) => progress.build(d, t),
        onSolveProgress: (i) => progress.solve(i),
      }).finally(() => progress.stop());
      const json = JSON.stringify(report, null, 2) + '\n';
      if (f.out) await writeFileAtomic(f.out, json);
      io.stdout(f.json ? json : solveSummary(report));
    });
  return cmd;
}
