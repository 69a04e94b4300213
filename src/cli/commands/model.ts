import { Command } from 'commander';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import { formatHamiltonianText } from '../../io/hamiltonianTextWriter.js';
import { buildModel, type ModelSpec } from '../../operators/models/buildModel.js';
import { parseLatticeSize, type Boundary, type LatticeKind, type LatticeSpec } from '../../operators/models/lattice.js';
import type { CliIo } from '../io.js';
import { oneOf, realNumber } from '../parse.js';

interface LatticeFlags {
  lattice: LatticeKind;
  size: string;
  boundary: Boundary;
  out?: string;
}

function latticeFrom(f: LatticeFlags): LatticeSpec {
  return { kind: f.lattice, boundary: f.boundary, ...parseLatticeSize(f.lattice, f.size) };
}

function withLatticeOptions(cmd: Command): Command {
  return cmd
    .option('--lattice <kind>', 'chain, ladder, square or triangular', oneOf('--lattice', ['chain', 'ladder', 'square', 'triangular'] as const), 'chain')
    .requiredOption('--size <L|LxW>', 'sites along x (and y): a chain L, a ladder L (two legs of L), a square or triangular LxW')
    .option('--boundary <open|periodic>', 'open or periodic (a ladder wraps along its legs)', oneOf('--boundary', ['open', 'periodic'] as const), 'open')
    .option('--out <file>', 'write the Hamiltonian to FILE (atomically) instead of stdout');
}

async function emit(io: CliIo, spec: ModelSpec, out: string | undefined, argv: string): Promise<void> {
  const model = buildModel(spec);
  const text = formatHamiltonianText(model.hamiltonian, [`written by: bitspan model ${argv}`, ...model.header]);
  if (out) {
    await writeFileAtomic(out, text);
    io.stderr(`bitspan model: wrote ${out} (${model.hamiltonian.qubits} qubits, ${model.hamiltonian.terms.length} terms)\n`);
  } else io.stdout(text);
}

/** The flags as given, for the file header (so the file says how to make it again). */
function describeFlags(family: string, f: object): string {
  const parts = [family];
  for (const [k, v] of Object.entries(f)) {
    if (k === 'out' || v === undefined || v === false) continue;
    const flag = `--${k.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;
    parts.push(v === true ? flag : `${flag} ${String(v)}`);
  }
  return parts.join(' ');
}

/** `bitspan model`: write lattice-model Hamiltonians in the text format `solve` reads. */
export function modelCommand(io: CliIo): Command {
  const model = new Command('model').description('write a lattice-model Hamiltonian (Heisenberg/XXZ, transverse-field Ising, Fermi-Hubbard)');

  const heisenberg = withLatticeOptions(new Command('heisenberg').alias('xxz').description('Heisenberg / XXZ model, optionally J1-J2; S = sigma/2 unless --pauli'))
    .option('--j <J>', 'nearest-neighbour exchange (xy part)', realNumber('--j'), 1)
    .option('--jz <Jz>', 'nearest-neighbour exchange along z (default: J)', realNumber('--jz'))
    .option('--j2 <J2>', 'next-nearest-neighbour exchange (xy part)', realNumber('--j2'), 0)
    .option('--j2z <J2z>', 'next-nearest-neighbour exchange along z (default: J2)', realNumber('--j2z'))
    .option('--pauli', 'use Pauli matrices (sigma . sigma, 4x the spin couplings)')
    .action(async (f: LatticeFlags & { j: number; jz?: number; j2: number; j2z?: number; pauli?: boolean }) => {
      await emit(io, { family: 'heisenberg', lattice: latticeFrom(f), j: f.j, jz: f.jz, j2: f.j2, j2z: f.j2z, pauli: f.pauli }, f.out, describeFlags('heisenberg', f));
    });

  const ising = withLatticeOptions(new Command('ising').description('transverse-field Ising model in Pauli matrices: -J ZZ - h X'))
    .option('--j <J>', 'nearest-neighbour ZZ coupling (ferromagnetic when positive)', realNumber('--j'), 1)
    .option('--field <h>', 'transverse field along x', realNumber('--field'), 1)
    .option('--j2 <J2>', 'next-nearest-neighbour ZZ coupling', realNumber('--j2'), 0)
    .option('--hz <hz>', 'longitudinal field along z', realNumber('--hz'), 0)
    .action(async (f: LatticeFlags & { j: number; field: number; j2: number; hz: number }) => {
      await emit(io, { family: 'ising', lattice: latticeFrom(f), j: f.j, field: f.field, j2: f.j2, hz: f.hz }, f.out, describeFlags('ising', f));
    });

  const hubbard = withLatticeOptions(new Command('hubbard').description('Fermi-Hubbard model under Jordan-Wigner: spin-up on qubits 0..L-1, spin-down on L..2L-1'))
    .option('--t <t>', 'nearest-neighbour hopping', realNumber('--t'), 1)
    .option('--u <U>', 'on-site repulsion', realNumber('--u'), 4)
    .option('--mu <mu>', 'chemical potential', realNumber('--mu'), 0)
    .action(async (f: LatticeFlags & { t: number; u: number; mu: number }) => {
      await emit(io, { family: 'hubbard', lattice: latticeFrom(f), t: f.t, u: f.u, mu: f.mu }, f.out, describeFlags('hubbard', f));
    });

  for (const sub of [heisenberg, ising, hubbard]) {
    sub.exitOverride().configureOutput({ writeOut: (s) => io.stdout(s), writeErr: (s) => io.stderr(s) });
    model.addCommand(sub);
  }
  return model;
}
