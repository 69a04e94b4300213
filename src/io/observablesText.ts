import { BitspanError } from '../errors.js';
import { wordsFor } from '../bits/packed.js';
import type { PauliObservable } from '../analysis/observables.js';
import { MAX_QUBITS } from './bitstringParser.js';
import { parseCoefficient, parsePauliOps } from './hamiltonianText.js';
import { checkReadable, readLines } from './lines.js';

/**
 * Read observables in the Hamiltonian text format, one observable per line (`COEFF OP OP ...`,
 * `#` comments, optional `qubits N` first). Unlike a Hamiltonian, lines are not combined.
 * Errors carry the code `bad-observables`, the file and the line.
 */
export async function readObservables(file: string): Promise<{ qubits: number | undefined; observables: PauliObservable[] }> {
  await checkReadable(file, 'observables');
  let declared: number | undefined;
  const parsed: Array<{ coeff: number; ops: Array<readonly ['X' | 'Y' | 'Z', number]>; line: number }> = [];
  let top = -1;
  try {
    for await (const { text, line } of readLines(file)) {
      const hash = text.indexOf('#');
      const body = (hash >= 0 ? text.slice(0, hash) : text).trim();
      if (body.length === 0) continue;
      const tokens = body.split(/\s+/);
      if (tokens[0]!.toLowerCase() === 'qubits') {
        if (declared !== undefined || parsed.length > 0 || tokens.length !== 2 || !/^\d+$/.test(tokens[1]!) || Number(tokens[1]) < 1 || Number(tokens[1]) > MAX_QUBITS) {
          throw new BitspanError('bad-observables', `'${body.slice(0, 40)}' is not a valid qubits line`, "put one 'qubits N' line before the observables", { file, line });
        }
        declared = Number(tokens[1]);
        continue;
      }
      const coeff = parseCoefficient(tokens[0]!, file, line);
      const ops = parsePauliOps(tokens.slice(1), file, line, declared ?? MAX_QUBITS);
      for (const [, q] of ops) top = Math.max(top, q);
      parsed.push({ coeff, ops, line });
    }
  } catch (e) {
    // The Hamiltonian parsers say `bad-hamiltonian`; here the file is an observables file.
    if (e instanceof BitspanError && e.code === 'bad-hamiltonian') {
      throw new BitspanError('bad-observables', e.message, e.hint, { file: e.file, line: e.line });
    }
    throw e;
  }
  if (parsed.length === 0) throw new BitspanError('file-empty', 'observables file has no observables', 'write one Pauli string per line, e.g. 1 Z0 Z1', { file });
  const nWords = wordsFor(Math.max(declared ?? 0, top + 1, 1));
  const observables = parsed.map(({ coeff, ops, line }) => {
    const x = new Uint32Array(nWords);
    const z = new Uint32Array(nWords);
    for (const [op, q] of ops) {
      if (op !== 'Z') x[q >>> 5]! |= 1 << (q & 31);
      if (op !== 'X') z[q >>> 5]! |= 1 << (q & 31);
    }
    return { ops: ops.map(([op, q]) => `${op}${q}`).join(' '), coeff, x, z, line };
  });
  return { qubits: declared, observables };
}
