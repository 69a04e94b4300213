import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { exact } from '../../src/pipeline/exact.js';
import { BitspanError } from '../../src/errors.js';
import { closeTo, runCli, tempDir, writeFiles } from '../helpers.js';

describe('exact', () => {
  it('exact prints the same JSON keys as solve, with an enumerated samples block', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, {
      'h.txt': 'qubits 4\n0.25 X0 X1\n0.25 Y0 Y1\n0.25 Z0 Z1\n0.25 X1 X2\n0.25 Y1 Y2\n0.25 Z1 Z2\n0.25 X2 X3\n0.25 Y2 Y3\n0.25 Z2 Z3\n',
      's.csv': 'bitstring,count\n0101,3\n1010,2\n0110,1\n',
    });
    const e = await runCli(['exact', '--hamiltonian', f['h.txt']!, '--weight', '2', '--json']);
    const s = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.csv']!, '--weight', '2', '--json']);
    expect(e.status).toBe(0);
    expect(s.status).toBe(0);
    const ej = JSON.parse(e.stdout);
    const sj = JSON.parse(s.stdout);
    expect(Object.keys(ej).sort()).toEqual(Object.keys(sj).sort());
    for (const k of Object.keys(sj.samples)) expect(ej.samples).toHaveProperty(k);
    expect(ej.command).toBe('exact');
    expect(ej.samples.enumerated).toBe(true);
    expect(ej.dimension).toBe(6);
    // Open 4-site Heisenberg chain: E0 = −(3 + 2√3)/4 (textbook; S·S convention).
    closeTo(ej.energies[0], -(3 + 2 * Math.sqrt(3)) / 4, 1e-10, 'open 4-chain');
    // Variational bound: the sampled subspace cannot go below the whole sector.
    expect(sj.energies[0]).toBeGreaterThanOrEqual(ej.energies[0] - 1e-10);
  });

  it('exact refuses a sector that cannot fit with too-large and a hint to narrow it', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': 'qubits 60\n1 Z0 Z59\n' });
    await expect(exact({ hamiltonian: f['h.txt']! })).rejects.toMatchObject({ code: 'too-large' });
    const r = await runCli(['exact', '--hamiltonian', f['h.txt']!, '--weight', '30']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/narrow the sector/);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });

  it('exact reports an empty sector and mismatched --qubits with their codes', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': 'qubits 4\n1 Z0 Z1\n', 'u.txt': '1 Z0 Z1\n' });
    await expect(exact({ hamiltonian: f['h.txt']!, sector: { weights: [{ lo: 0, hi: 1, weight: 2 }, { lo: 2, hi: 3, weight: 0 }], parity: 'odd' } })).rejects.toMatchObject({ code: 'empty-subspace' });
    await expect(exact({ hamiltonian: f['h.txt']!, qubits: 5 })).rejects.toMatchObject({ code: 'qubit-mismatch' });
    // An undeclared register may be widened with --qubits.
    const wide = await exact({ hamiltonian: f['u.txt']!, qubits: 3, sector: { weights: [{ lo: 0, hi: -1, weight: 1 }] } });
    expect(wide.report.dimension).toBe(3);
    try {
      await exact({ hamiltonian: join(dir, 'missing.txt') });
      expect.unreachable();
    } catch (e) {
      expect((e as BitspanError).code).toBe('file-unreadable');
    }
  });

  it('exact on a whole 2^n space equals the lowest eigenvalue over every sector', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': 'qubits 5\n-1 Z0 Z1\n-1 Z1 Z2\n-1 Z2 Z3\n-1 Z3 Z4\n-0.8 X0\n-0.8 X1\n-0.8 X2\n-0.8 X3\n-0.8 X4\n' });
    const whole = await exact({ hamiltonian: f['h.txt']! });
    const even = await exact({ hamiltonian: f['h.txt']!, sector: { weights: [], parity: 'even' } });
    expect(whole.report.dimension).toBe(32);
    expect(even.report.dimension).toBe(16);
    expect(whole.report.energies[0]!).toBeLessThanOrEqual(even.report.energies[0]! + 1e-12);
  });
});
