import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { readHamiltonian } from '../../../src/io/readHamiltonian.js';
import { closeTo, runCli, tempDir } from '../../helpers.js';

describe('modelCommand', () => {
  it('bitspan model writes a readable Hamiltonian with its parameters in the header', async () => {
    const dir = tempDir();
    const out = join(dir, 'h.txt');
    const r = await runCli(['model', 'heisenberg', '--lattice', 'square', '--size', '3x2', '--boundary', 'periodic', '--jz', '0.5', '--j2', '0.2', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    const text = readFileSync(out, 'utf8');
    expect(text.split('\n')[0]).toBe('qubits 6');
    expect(text).toMatch(/# written by: bitspan model heisenberg .*--jz 0\.5/);
    expect(text).toMatch(/# J = 1, Jz = 0\.5, J2 = 0\.2, J2z = 0\.2/);
    const h = await readHamiltonian(out);
    expect(h.qubits).toBe(6);
    expect(h.terms.length).toBeGreaterThan(0);
  });

  it('bitspan model hubbard | exact gives the two-site ground energy U/2 − sqrt((U/2)² + 4t²) (textbook)', async () => {
    const dir = tempDir();
    const out = join(dir, 'hub.txt');
    expect((await runCli(['model', 'hubbard', '--size', '2', '--t', '1', '--u', '3', '--out', out])).status).toBe(0);
    const e = await runCli(['exact', '--hamiltonian', out, '--weight', '0-1=1', '--weight', '2-3=1', '--json']);
    expect(e.status, e.stderr).toBe(0);
    closeTo(JSON.parse(e.stdout).energies[0], 1.5 - Math.sqrt(2.25 + 4), 1e-10, 'two-site Hubbard');
  });

  it('bitspan model prints to stdout without --out, and ising takes the xxz-free flags', async () => {
    const r = await runCli(['model', 'ising', '--size', '4', '--field', '0.5']);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^qubits 4\n/);
    expect(r.stdout).toMatch(/\n-0\.5 X0\n/);
    const xxz = await runCli(['model', 'xxz', '--size', '4', '--jz', '2']);
    expect(xxz.status).toBe(0);
    expect(xxz.stdout).toMatch(/\n0\.5 Z0 Z1\n/);
  });

  it('bitspan model refuses bad lattices and numbers with exit status 2', async () => {
    for (const argv of [
      ['model', 'heisenberg', '--size', '4x'],
      ['model', 'heisenberg', '--size', '4', '--lattice', 'hexagonal'],
      ['model', 'hubbard', '--size', '4', '--u', 'big'],
      ['model', 'ising', '--size', '4', '--boundary', 'twisted'],
      ['model', 'heisenberg'],
    ]) {
      const r = await runCli(argv);
      expect(r.status, argv.join(' ')).toBe(2);
    }
  });
});
