import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { formatHamiltonianText } from '../../src/io/hamiltonianTextWriter.js';
import { readHamiltonian } from '../../src/io/readHamiltonian.js';
import { formatPauliOps } from '../../src/operators/pauliSum.js';
import { hubbardModel } from '../../src/operators/models/hubbard.js';
import { heisenbergModel } from '../../src/operators/models/heisenberg.js';
import { tempDir } from '../helpers.js';

describe('formatHamiltonianText', () => {
  it('formatHamiltonianText round-trips through readHamiltonian with identical doubles', async () => {
    const dir = tempDir();
    for (const m of [hubbardModel({ lattice: { kind: 'chain', lx: 5, ly: 1, boundary: 'periodic' }, t: 1 / 3, u: 4.1, mu: 0.7 }), heisenbergModel({ lattice: { kind: 'triangular', lx: 3, ly: 3, boundary: 'periodic' }, j: 0.1, jz: 1e-7, j2: 1 / 7 })]) {
      const file = join(dir, 'h.txt');
      const text = formatHamiltonianText(m.hamiltonian, m.header);
      writeFileSync(file, text);
      const back = await readHamiltonian(file);
      expect(back.qubits).toBe(m.hamiltonian.qubits);
      expect(back.declaredQubits).toBe(true);
      expect(back.constant).toBe(m.hamiltonian.constant);
      const key = (h: typeof back) => h.terms.map((t) => `${formatPauliOps(t)} ${t.coeff}`).sort();
      expect(key(back)).toEqual(key(m.hamiltonian));
      expect(text.split('\n')[0]).toBe(`qubits ${m.hamiltonian.qubits}`);
      for (const line of m.header) expect(text).toContain(`# ${line}`);
    }
  });
});
