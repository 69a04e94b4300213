import { describe, expect, it } from 'vitest';
import { readHamiltonian } from '../../src/io/readHamiltonian.js';
import { formatPauliOps } from '../../src/operators/pauliSum.js';
import { BitspanError } from '../../src/errors.js';
import { codeOf, tempDir, writeFiles } from '../helpers.js';


describe('readHamiltonian', () => {
  it('readHamiltonian parses text and JSON forms and combines like terms', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, {
      'h.txt': 'qubits 3\n# comment\n0.25 X0 X1\n\n0.25 X1 X0  # same term\n-1.5 Z2\n2.0\n1e-1 Y0 I1 Y2\n',
      'h.json': '{"qubits": 3, "terms": [{"coeff": 0.25, "ops": "X0 X1"}, {"coeff": 0.25, "ops": "X1 X0"}, {"coeff": -1.5, "ops": "Z2"}, {"coeff": 2, "ops": ""}, {"coeff": 0.1, "ops": "Y0 Y2"}]}',
    });
    for (const file of [f['h.txt']!, f['h.json']!]) {
      const h = await readHamiltonian(file);
      expect(h.qubits).toBe(3);
      expect(h.declaredQubits).toBe(true);
      expect(h.constant).toBe(2);
      expect(h.terms.map((t) => `${t.coeff} ${formatPauliOps(t)}`)).toEqual(['0.5 X0 X1', '-1.5 Z2', '0.1 Y0 Y2']);
    }
  });

  it('readHamiltonian refuses malformed terms with the line number', async () => {
    const dir = tempDir();
    const cases: Record<string, [string, string, number?]> = {
      'twice.txt': ['1 X0 Z0\n', 'bad-hamiltonian', 1],
      'range.txt': ['qubits 2\n1 X0\n1 X2\n', 'bad-hamiltonian', 3],
      'complex.txt': ['0.5+1j X0\n', 'bad-hamiltonian', 1],
      'nan.txt': ['NaN X0\n', 'bad-hamiltonian', 1],
      'inf.txt': ['Infinity X0\n', 'bad-hamiltonian', 1],
      'op.txt': ['1 X0 W1\n', 'bad-hamiltonian', 1],
      'empty.txt': ['', 'file-empty'],
      'comments.txt': ['# nothing\n\n', 'file-empty'],
      'huge.txt': ['1 X99999999999\n', 'bad-hamiltonian', 1],
      'bad.json': ['{"terms": [{"coeff": [1, 2], "ops": "X0"}]}', 'bad-hamiltonian'],
      'syntax.json': ['{"terms": [\n{"coeff": 1, "ops": "X0"},\n]}', 'bad-hamiltonian', 3],
    };
    for (const [name, [text, code, line]] of Object.entries(cases)) {
      const file = writeFiles(dir, { [name]: text })[name]!;
      let err: unknown;
      try {
        await readHamiltonian(file);
      } catch (e) {
        err = e;
      }
      expect(err, name).toBeInstanceOf(BitspanError);
      expect((err as BitspanError).code, name).toBe(code);
      if (line !== undefined) expect((err as BitspanError).line, name).toBe(line);
    }
    expect(await codeOf(readHamiltonian(dir))).toBe('file-unreadable');
  });
});
