import { promises as fsp } from 'node:fs';
import { extname } from 'node:path';
import { BitspanError } from '../errors.js';
import type { PauliSum } from '../operators/pauliSum.js';
import { parseHamiltonianJson } from './hamiltonianJson.js';
import { parseHamiltonianText } from './hamiltonianText.js';
import { checkReadable, readLines } from './lines.js';

/**
 * Largest JSON Hamiltonian read whole (kept well below V8's ~512 MiB string limit, and a parsed
 * JSON tree costs several times its text); text files stream and have no such limit.
 */
const MAX_JSON_BYTES = 256 * 1024 * 1024;

/** Read a qubit Hamiltonian from the text form (`COEFF OP OP ...`) or the JSON form (`.json`). */
export async function readHamiltonian(file: string): Promise<PauliSum> {
  const size = await checkReadable(file, 'Hamiltonian');
  if (size === 0) throw new BitspanError('file-empty', 'Hamiltonian file is empty', 'write one term per line, e.g. 0.25 X0 X1', { file });
  if (extname(file).toLowerCase() === '.json') {
    if (size > MAX_JSON_BYTES) throw new BitspanError('too-large', 'JSON Hamiltonian is larger than 256 MiB', 'use the text format, which is streamed', { file });
    return parseHamiltonianJson(await fsp.readFile(file, 'utf8'), file);
  }
  return parseHamiltonianText(readLines(file, 'bad-hamiltonian'), file);
}
