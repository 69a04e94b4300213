import { BitspanError } from '../errors.js';
import { MAX_QUBITS } from './bitstringParser.js';
import { PauliSumBuilder, type PauliSum } from '../operators/pauliSum.js';
import { checkSumFinite, parseCoefficient, parsePauliOps } from './hamiltonianText.js';
import { jsonPathLine, parseJsonLocated } from './jsonSyntax.js';

/** Parse the JSON form `{"qubits": N, "terms": [{"coeff": 0.25, "ops": "X0 X1"}]}`. */
export function parseHamiltonianJson(text: string, file: string): PauliSum {
  const doc = parseJsonLocated(text, file, 'bad-hamiltonian', 'check brackets, commas and quotes');
  // Structure errors name the term and the line where its offending value starts.
  const fail = (what: string, hint: string, path: Array<string | number> = []): never => {
    throw new BitspanError('bad-hamiltonian', what, hint, { file, line: jsonPathLine(text, path) ?? jsonPathLine(text, path.slice(0, -1)) });
  };
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) fail('top level is not an object', 'write {"qubits": N, "terms": [...]}');
  const o = doc as Record<string, unknown>;
  let declared: number | undefined;
  if (o.qubits !== undefined) {
    if (typeof o.qubits !== 'number' || !Number.isInteger(o.qubits) || o.qubits < 1 || o.qubits > MAX_QUBITS) {
      fail(`"qubits" is ${JSON.stringify(o.qubits)}, not a whole number from 1 to ${MAX_QUBITS}`, 'give the register size as a number', ['qubits']);
    }
    declared = o.qubits as number;
  }
  if (!Array.isArray(o.terms)) fail('"terms" is missing or not a list', 'write "terms": [{"coeff": 0.25, "ops": "X0 X1"}]', ['terms']);
  const terms = o.terms as unknown[];
  if (terms.length === 0) throw new BitspanError('file-empty', 'Hamiltonian has no terms', 'add at least one term', { file });
  const parsed: Array<{ coeff: number; ops: ReturnType<typeof parsePauliOps> }> = [];
  const sums = new Map<string, number>();
  let maxIndex = -1;
  terms.forEach((t, i) => {
    if (typeof t !== 'object' || t === null) fail(`terms[${i}] is not an object`, 'each term is {"coeff": number, "ops": "X0 X1"}', ['terms', i]);
    const term = t as Record<string, unknown>;
    const c = term.coeff;
    if (typeof c !== 'number' && typeof c !== 'string') {
      fail(`terms[${i}].coeff is ${Array.isArray(c) ? 'a list (complex?)' : JSON.stringify(c)}, not a real number`, 'coefficients are real numbers', ['terms', i, 'coeff']);
    }
    const coeff = typeof c === 'number' ? c : parseCoefficient(String(c).trim(), file, jsonPathLine(text, ['terms', i, 'coeff']));
    if (!Number.isFinite(coeff)) fail(`terms[${i}].coeff is not finite`, 'use a finite real coefficient', ['terms', i, 'coeff']);
    const opsText = term.ops ?? '';
    if (typeof opsText !== 'string') fail(`terms[${i}].ops is not a string`, 'write ops as "X0 X1"', ['terms', i, 'ops']);
    let ops;
    try {
      ops = parsePauliOps((opsText as string).trim().split(/\s+/).filter((s) => s.length > 0), file, undefined, declared ?? MAX_QUBITS);
    } catch (e) {
      if (e instanceof BitspanError) throw new BitspanError(e.code, `terms[${i}]: ${e.message}`, e.hint, { file, line: jsonPathLine(text, ['terms', i, 'ops']) ?? jsonPathLine(text, ['terms', i]) });
      throw e;
    }
    for (const [, q] of ops) if (q > maxIndex) maxIndex = q;
    checkSumFinite(sums, coeff, ops, file, jsonPathLine(text, ['terms', i]), `terms[${i}]`);
    parsed.push({ coeff, ops });
  });
  const builder = new PauliSumBuilder(declared ?? maxIndex + 1);
  for (const t of parsed) builder.add(t.coeff, t.ops);
  return builder.finish(declared !== undefined);
}
