import { Command } from 'commander';
import { BitspanError } from '../../errors.js';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import { solve } from '../../pipeline/solve.js';
import type { CliIo } from '../io.js';
import { parseElectrons } from '../../sectors/electronSector.js';
import { positiveInt, positiveNumber } from '../parse.js';
import { addSampleOptions, addSolverOptions, sectorFromFlags, type SampleFlags } from '../sectorOptions.js';
import { solveSummary } from '../summary.js';

interface SolveFlags extends SampleFlags {
  hamiltonian?: string;
  integrals?: string;
  electrons?: [number, number];
  repair?: boolean;
  repairRounds?: number;
  productSpace?: boolean;
  memoryBudget?: number;
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
  const cmd = new Command('solve').description('lowest energies of a Pauli Hamiltonian or molecular integrals projected on sampled configurations');
  cmd.option('--hamiltonian <file>', 'Pauli-sum Hamiltonian (text or .json)');
  cmd.option('--integrals <file>', 'molecular integrals (FCIDUMP), solved in the determinant basis instead of a Pauli sum');
  cmd.option('--electrons <A,B>', 'spin-up and spin-down electron counts (with --integrals; default from NELEC and MS2)', parseElectrons);
  cmd.requiredOption('--samples <files...>', 'sample dumps (CSV, JSON counts or text), one group per file');
  addSampleOptions(cmd);
  addSolverOptions(cmd);
  cmd
    .option('--repair', 'repair off-sector configurations (wrong weight in a register) instead of dropping them')
    .option('--repair-rounds <n>', 'at most N rounds of solve, occupations, repair (default 3)', positiveInt('--repair-rounds'))
    .option('--product-space', 'with --integrals: use every sampled spin-up string with every sampled spin-down string')
    .option('--memory-budget <GiB>', 'memory the determinant matrix and vectors may use (default 60% of RAM, at most 16)', positiveNumber('--memory-budget'))
    .option('--top <n>', 'most probable ground-state configurations to report', positiveInt('--top'), 10)
    .option('--json', 'print one JSON object on stdout')
    .option('--out <file>', 'also write the JSON report to FILE (atomically)')
    .action(async (f: SolveFlags) => {
      if (f.repairRounds !== undefined && !f.repair) throw new BitspanError('bad-argument', '--repair-rounds without --repair', 'add --repair, or drop --repair-rounds');
      const { report } = await solve({
        hamiltonian: f.hamiltonian,
        integrals: f.integrals,
        electrons: f.electrons,
        repair: f.repair,
        repairRounds: f.repairRounds,
        productSpace: f.productSpace,
        memoryBudget: f.memoryBudget === undefined ? undefined : f.memoryBudget * 2 ** 30,
        log: (line) => io.stderr(`bitspan: ${line}\n`),
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
      });
      const json = JSON.stringify(report, null, 2) + '\n';
      if (f.out) await writeFileAtomic(f.out, json);
      io.stdout(f.json ? json : solveSummary(report));
    });
  return cmd;
}
