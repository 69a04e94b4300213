import { describe, expect, it } from 'vitest';
import { formatPauliOps } from '../../src/operators/pauliSum.js';
import { formatFcidump } from '../../src/io/formatFcidump.js';
import { hubbardRingIntegrals, hubbardRingPauli } from '../../bench/molecules/hubbard.js';
import { closeTo, runCli, tempDir, writeFiles } from '../helpers.js';

const H2 = 'fixtures/molecules/h2-tabulated.fcidump';
const H2_SAMPLES = 'fixtures/molecules/h2-samples.csv';
const H6 = 'fixtures/molecules/h6-chain.fcidump';
const H6_NOISY = 'fixtures/molecules/h6-chain-noisy.csv';
const RING = 'fixtures/molecules/hubbard-ring6.fcidump';
const RING_NOISY = 'fixtures/molecules/hubbard-ring6-noisy.csv';

async function json(argv: string[]): Promise<Record<string, any>> {
  const r = await runCli(['solve', ...argv, '--json']);
  if (r.status !== 0) throw new Error(`exit ${r.status}: ${r.stderr}`);
  return JSON.parse(r.stdout);
}

describe('solve --integrals', () => {
  it('solve --integrals prints the qubit path JSON keys and the H2 full-CI energy including the core energy', async () => {
    const out = await json(['--integrals', H2, '--samples', H2_SAMPLES]);
    for (const key of ['qubits', 'dimension', 'nonzeros', 'energies', 'residuals', 'iterations', 'samples', 'sector', 'timings', 'groundState']) expect(out).toHaveProperty(key);
    for (const key of ['shots', 'distinct', 'kept', 'keptShots', 'groups']) expect(out.samples).toHaveProperty(key);
    expect(out.groundState.top[0].bitstring).toBe('0101');
    expect(out.qubits).toBe(4);
    expect(out.dimension).toBe(4);
    expect(out.integrals.electrons).toEqual([1, 1]);
    expect(out.repair).toBeUndefined();
    // Szabo & Ostlund's H2 at 1.4 bohr: −1.1373 (from memory); the closed-form 2×2 CI of the
    // tabulated integrals gives −1.137285215 (see tests/operators/integrals.test.ts).
    closeTo(out.energies[0], -1.1373, 1e-4, 'E(FCI) vs table');
    closeTo(out.energies[0], -1.137285215065, 1e-9, 'E(FCI) vs closed form');
    expect(out.residuals[0]).toBeLessThan(1e-8);
    const explicit = await json(['--integrals', H2, '--samples', H2_SAMPLES, '--electrons', '1,1']);
    expect(explicit.energies).toEqual(out.energies);
  });

  it('solve --integrals on a Hubbard ring FCIDUMP agrees with solve --hamiltonian on its Jordan–Wigner Pauli sum to 1e-10', async () => {
    // Reference: the qubit path on the ring's JW Pauli sum (bench/molecules/hubbard.ts), same dump.
    const dir = tempDir('bitspan-ring-');
    const pauli = hubbardRingPauli(6, 1, 4);
    const text = [`qubits ${pauli.qubits}`, `${pauli.constant}`, ...pauli.terms.map((t) => `${t.coeff} ${formatPauliOps(t)}`)].join('\n') + '\n';
    const files = writeFiles(dir, { 'ring.txt': text, 'ring.fcidump': formatFcidump(hubbardRingIntegrals(6, 1, 4), { electrons: 6 }) });
    const det = await json(['--integrals', files['ring.fcidump']!, '--samples', RING_NOISY]);
    const jw = await json(['--hamiltonian', files['ring.txt']!, '--samples', RING_NOISY, '--weight', '0-5=3', '--weight', '6-11=3']);
    expect(det.dimension).toBe(jw.dimension);
    expect(det.nonzeros).toBe(jw.nonzeros);
    closeTo(det.energies[0], jw.energies[0], 1e-10, 'determinant vs JW energy');
    const fixture = await json(['--integrals', RING, '--samples', RING_NOISY]);
    closeTo(fixture.energies[0], det.energies[0], 1e-12, 'shipped ring fixture');
  });

  it('solve --repair reports per-round recovered shots and energies, and lands below dropping the off-sector shots', async () => {
    const drop = await json(['--integrals', H6, '--samples', H6_NOISY]);
    const repaired = await json(['--integrals', H6, '--samples', H6_NOISY, '--repair', '--repair-rounds', '4']);
    const offSector = drop.samples.dropped.weight.shots;
    expect(offSector).toBeGreaterThan(0);
    expect(repaired.repair.rounds.length).toBeGreaterThanOrEqual(1);
    expect(repaired.repair.rounds.length).toBeLessThanOrEqual(4);
    for (const round of repaired.repair.rounds) {
      expect(round.recovered).toBe(offSector);
      expect(typeof round.energy).toBe('number');
    }
    expect(repaired.repair.offSector.shots).toBe(offSector);
    expect(repaired.energies[0]).toBe(Math.min(...repaired.repair.rounds.map((r: { energy: number }) => r.energy)));
    expect(repaired.repair.rounds[repaired.repair.chosenRound - 1].energy).toBe(repaired.energies[0]);
    expect(repaired.energies[0]).toBeLessThan(drop.energies[0]);
    expect(repaired.samples.keptShots).toBe(drop.samples.shots);
  });

  it('solve --repair works for a Pauli Hamiltonian with per-register weights', async () => {
    const dir = tempDir('bitspan-ring-');
    const pauli = hubbardRingPauli(6, 1, 4);
    const text = [`qubits ${pauli.qubits}`, `${pauli.constant}`, ...pauli.terms.map((t) => `${t.coeff} ${formatPauliOps(t)}`)].join('\n') + '\n';
    const files = writeFiles(dir, { 'ring.txt': text });
    const qubitPath = await json(['--hamiltonian', files['ring.txt']!, '--samples', RING_NOISY, '--weight', '0-5=3', '--weight', '6-11=3', '--repair']);
    const integralPath = await json(['--integrals', RING, '--samples', RING_NOISY, '--repair']);
    expect(qubitPath.repair.rounds.length).toBeGreaterThan(0);
    expect(qubitPath.repair.rounds[0].recovered).toBe(integralPath.repair.rounds[0].recovered);
    closeTo(qubitPath.energies[0], integralPath.energies[0], 1e-10, 'repaired energy, qubit vs determinant path');
  });

  it('solve --product-space closes the sampled strings, reports the dimension first, and refuses over the memory budget', async () => {
    const r = await runCli(['solve', '--integrals', H6, '--samples', H6_NOISY, '--product-space', '--json']);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.productSpace.dimension).toBe(out.productSpace.alphaStrings * out.productSpace.betaStrings);
    expect(out.dimension).toBe(out.productSpace.dimension);
    expect(out.productSpace.sampledDimension).toBeLessThanOrEqual(out.dimension);
    expect(r.stderr).toMatch(/product space: \d+ spin-up × \d+ spin-down strings = \d+ determinants/);
    const plain = await json(['--integrals', H6, '--samples', H6_NOISY]);
    // Interlacing (Cauchy): a larger subspace never raises the lowest energy.
    expect(out.energies[0]).toBeLessThanOrEqual(plain.energies[0] + 1e-10);
    const refused = await runCli(['solve', '--integrals', H6, '--samples', H6_NOISY, '--product-space', '--memory', '1K', '--json']);
    expect(refused.status).toBe(2);
    expect(refused.stdout).toBe('');
    expect(refused.stderr).toMatch(/too|budget/);
    expect(refused.stderr.trim().split('\n').filter((l) => l.includes('error')).length).toBe(1);
  });

  const bad: Array<[string, string[]]> = [
    ['both Hamiltonians', ['--integrals', H2, '--hamiltonian', 'fixtures/quickstart/heisenberg.txt', '--samples', H2_SAMPLES]],
    ['no Hamiltonian', ['--samples', H2_SAMPLES]],
    ['samples of the wrong register size', ['--integrals', H6, '--samples', H2_SAMPLES]],
    ['a malformed --electrons', ['--integrals', H2, '--samples', H2_SAMPLES, '--electrons', '1;1']],
    ['more electrons than orbitals', ['--integrals', H2, '--samples', H2_SAMPLES, '--electrons', '3,0']],
    ['--product-space without integrals', ['--hamiltonian', 'fixtures/quickstart/heisenberg.txt', '--samples', 'fixtures/quickstart/samples.csv', '--product-space']],
    ['--repair-rounds without --repair', ['--integrals', H2, '--samples', H2_SAMPLES, '--repair-rounds', '2']],
    ['a sector no sample reaches', ['--integrals', H2, '--samples', H2_SAMPLES, '--electrons', '2,0']],
  ];
  for (const [what, argv] of bad) {
    it(`solve --integrals refuses ${what} with exit status 2 and one line`, async () => {
      const r = await runCli(['solve', ...argv, '--json']);
      expect(r.status).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr.trim().split('\n').length).toBe(1);
    });
  }
});
