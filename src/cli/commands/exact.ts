import { Command } from 'commander';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import type { Qubit0 } from '../../io/bitstringParser.js';
import type { ExactReport } from '../../pipeline/exact.js';
import type { CliIo } from '../io.js';
import { collect, oneOf, positiveInt } from '../parse.js';
import { type SolverFlags, addSolverOptions } from '../sectorOptions.js';
import { parseWeightSpec } from '../../sectors/sector.js';
import { energyLine, timingsText } from '../summary.js';

interface ExactFlags extends SolverFlags {
  hamiltonian: string;
  weight?: string[];
  parity?: 'even' | 'odd';
  qubits?: number;
  qubit0: Qubit0;
  top: number;
  json?: boolean;
  out?: string;
}

/** Terminal summary of an exact run; every energy with its residual and its subspace. */
function exactSummary(r: ExactReport): string {
  const lines = [
    `bitspan exact: ${r.qubits} qubits, Hamiltonian ${r.hamiltonian.file} (${r.hamiltonian.terms} terms)`,
    `sector: ${r.sector.description}, every configuration enumerated`,
    `projected Hamiltonian: dimension ${r.dimension}, ${r.nonzeros} nonzeros, ${r.complex ? 'complex Hermitian' : 'real symmetric'}`,
  ];
  r.energies.forEach((e, i) => lines.push(energyLine(`E${i}`, e, r.residuals[i]!, r.dimension, r.sector.description)));
  lines.push(`Lanczos: ${r.iterations} iterations, ${r.matvecs} matrix-vector products, ${r.converged ? 'converged' : 'NOT converged'} (tol ${r.tolerance})`);
  if (r.groundState.top.length) {
    lines.push('ground state, most probable configurations:');
    for (const t of r.groundState.top) lines.push(`  ${t.bitstring}  ${t.probability.toFixed(6)}`);
  }
  lines.push(`timings: ${timingsText(r.timings)}`);
  return lines.join('\n') + '\n';
}

/** `bitspan exact`: the ground state of a Hamiltonian in a whole sector, as a reference for `solve`. */
export function exactCommand(io: CliIo): Command {
  const cmd = new Command('exact').description('lowest energies in a whole symmetry sector (every configuration enumerated), same JSON as solve');
  cmd
    .requiredOption('--hamiltonian <file>', 'Pauli-sum Hamiltonian (text or .json)')
    .option('--weight <spec>', 'configurations with K ones (K), or K ones among qubits A..B (A-B=K); repeatable', collect)
    .option('--parity <even|odd>', 'configurations of this total parity', oneOf('--parity', ['even', 'odd'] as const))
    .option('--qubits <n>', 'register size when the Hamiltonian file does not declare it', positiveInt('--qubits'))
    .option('--qubit0 <right|left>', 'which end of a reported bitstring is qubit 0', oneOf('--qubit0', ['right', 'left'] as const), 'right');
  addSolverOptions(cmd);
  cmd
    .option('--top <n>', 'most probable ground-state configurations to report', positiveInt('--top'), 10)
    .option('--json', 'print one JSON object on stdout')
    .option('--out <file>', 'also write the JSON report to FILE (atomically)')
    .action(async (f: ExactFlags) => {
      // The pipeline is loaded here, not at the top, so other commands and --help start without it.
      const { exact } = await import('../../pipeline/exact.js');
      const { report } = await exact({
        hamiltonian: f.hamiltonian,
        sector: { weights: (f.weight ?? []).map((w) => parseWeightSpec(w)).map(({ lo, hi, weight }) => ({ lo, hi, weight })), parity: f.parity },
        qubits: f.qubits,
        threads: f.threads,
        memoryBytes: f.memory,
        matrixFree: f.matrixFree,
        eigs: f.eigs,
        tol: f.tol,
        seed: f.seed,
        top: f.top,
        qubit0: f.qubit0,
      });
      const json = JSON.stringify(report, null, 2) + '\n';
      if (f.out) await writeFileAtomic(f.out, json);
      io.stdout(f.json ? json : exactSummary(report));
    });
  return cmd;
}
