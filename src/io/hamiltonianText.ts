import { BitspanError } from '../errors.js';
import { MAX_QUBITS } from './bitstringParser.js';
import { PauliSumBuilder, type PauliSum } from '../operators/pauliSum.js';

type Op = readonly ['X' | 'Y' | 'Z', number];

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const OP = /^([XYZI])(\d+)$/;

/** Parse a real decimal coefficient; anything else (complex, NaN, Infinity, hex) is refused. */
export function parseCoefficient(text: string, file: string, line: number | undefined): number {
  if (!DECIMAL.test(text)) {
    const complexLike = /[ij]\b|[ij]$|\(|,/.test(text);
    throw new BitspanError(
      'bad-hamiltonian',
      complexLike ? `coefficient '${clip(text)}' is not real` : `coefficient '${clip(text)}' is not a decimal number`,
      complexLike ? 'a Pauli sum of a Hermitian operator has real coefficients; combine P and P† terms' : 'each term starts with a real coefficient, e.g. 0.25 X0 X1',
      { file, line },
    );
  }
  const v = Number(text);
  if (!Number.isFinite(v)) throw new BitspanError('bad-hamiltonian', `coefficient '${clip(text)}' overflows`, 'use a finite coefficient', { file, line });
  return v;
}

/**
 * Parse a Pauli-string operator list such as `X0 Y3 Z5` (I<k> factors are identities). Refuses a
 * qubit named twice and indices at or above `limit`.
 */
export function parsePauliOps(tokens: string[], file: string, line: number | undefined, limit: number): Op[] {
  const ops: Op[] = [];
  const seen = new Set<number>();
  for (const tok of tokens) {
    const m = OP.exec(tok);
    if (!m) {
      throw new BitspanError('bad-hamiltonian', `'${clip(tok)}' is not a Pauli operator`, 'operators are X<k>, Y<k> or Z<k> with k a 0-based qubit index, e.g. X3', { file, line });
    }
    const q = Number(m[2]);
    if (!Number.isSafeInteger(q) || q >= limit) {
      const declared = limit < MAX_QUBITS;
      throw new BitspanError(
        'bad-hamiltonian',
        `qubit index ${clip(m[2]!)} is out of range (${declared ? `the file declares qubits ${limit}` : `limit ${MAX_QUBITS}`})`,
        declared ? 'indices are 0-based and must be below the declared qubit count' : 'qubit indices are 0-based',
        { file, line },
      );
    }
    if (seen.has(q)) {
      throw new BitspanError('bad-hamiltonian', `qubit ${q} appears twice in one term`, 'multiply the Pauli factors out so each qubit appears once per term', { file, line });
    }
    seen.add(q);
    if (m[1] !== 'I') ops.push([m[1] as 'X' | 'Y' | 'Z', q]);
  }
  return ops;
}

/** Parse the text form from an iterable of lines: `COEFF OP OP ...`, `#` comments, `qubits N`. */
export async function parseHamiltonianText(lines: AsyncIterable<{ text: string; line: number }>, file: string): Promise<PauliSum> {
  let declared: number | undefined;
  const pending: Array<{ coeff: number; ops: Op[] }> = [];
  const sums = new Map<string, number>();
  let maxIndex = -1;
  let any = false;
  for await (const { text, line } of lines) {
    const hash = text.indexOf('#');
    const body = (hash >= 0 ? text.slice(0, hash) : text).trim();
    if (body.length === 0) continue;
    const tokens = body.split(/\s+/);
    if (tokens[0]!.toLowerCase() === 'qubits') {
      if (declared !== undefined || any) {
        throw new BitspanError('bad-hamiltonian', declared !== undefined ? "second 'qubits' line" : "'qubits' line after the first term", "put one 'qubits N' line before the terms", { file, line });
      }
      if (tokens.length !== 2 || !/^\d+$/.test(tokens[1]!) || Number(tokens[1]) < 1 || Number(tokens[1]) > MAX_QUBITS) {
        throw new BitspanError('bad-hamiltonian', `'${clip(body)}' is not a valid qubit count`, `write 'qubits N' with 1 <= N <= ${MAX_QUBITS}`, { file, line });
      }
      declared = Number(tokens[1]);
      continue;
    }
    any = true;
    const coeff = parseCoefficient(tokens[0]!, file, line);
    const ops = parsePauliOps(tokens.slice(1), file, line, declared ?? MAX_QUBITS);
    for (const [, q] of ops) if (q > maxIndex) maxIndex = q;
    pending.push({ coeff, ops });
    checkSumFinite(sums, coeff, ops, file, line);
  }
  if (!any) throw new BitspanError('file-empty', 'Hamiltonian file has no terms', 'write one term per line, e.g. 0.25 X0 X1', { file });
  const builder = new PauliSumBuilder(declared ?? maxIndex + 1);
  for (const t of pending) builder.add(t.coeff, t.ops);
  return builder.finish(declared !== undefined);
}

/**
 * Add `coeff` to the running sum of its like terms and refuse the term whose addition overflows,
 * so that combined coefficients never silently become ±Infinity.
 */
export function checkSumFinite(sums: Map<string, number>, coeff: number, ops: readonly Op[], file: string, line: number | undefined, what = 'this term'): void {
  const key = ops.map(([p, q]) => `${p}${q}`).sort().join(' ');
  const sum = (sums.get(key) ?? 0) + coeff;
  sums.set(key, sum);
  if (!Number.isFinite(sum)) {
    throw new BitspanError('bad-hamiltonian', `${what} brings the combined coefficient of '${clip(key || 'constant')}' beyond the double range`, 'rescale the Hamiltonian; like terms are added together', { file, line });
  }
}

function clip(s: string): string {
  return s.length > 40 ? `${s.slice(0, 37)}...` : s;
}
