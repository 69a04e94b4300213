import { BitspanError } from '../errors.js';

/** Names accepted by `--initial` besides an explicit bitstring. */
export const NAMED_STATES = ['neel', 'neel-even', 'zeros', 'ones', 'half'] as const;

/**
 * The configuration (qubit q = bit q) named by `--initial`: a bitstring of exactly `qubits`
 * characters with qubit 0 rightmost, or `neel` (odd qubits 1: …0101 read right to left is
 * 0,1,0,1), `neel-even` (even qubits 1), `zeros`, `ones`, or `half` (qubits 0..⌊n/2⌋−1 set).
 */
export function initialConfiguration(spec: string, qubits: number): number {
  let b = 0;
  switch (spec) {
    case 'neel':
      for (let q = 1; q < qubits; q += 2) b |= 1 << q;
      return b >>> 0;
    case 'neel-even':
      for (let q = 0; q < qubits; q += 2) b |= 1 << q;
      return b >>> 0;
    case 'zeros':
      return 0;
    case 'ones':
      return qubits === 32 ? 0xffffffff : 2 ** qubits - 1;
    case 'half':
      return 2 ** Math.floor(qubits / 2) - 1;
  }
  const text = spec.trim();
  if (!/^[01]+$/.test(text)) {
    throw new BitspanError('bad-argument', `--initial '${spec.length > 40 ? spec.slice(0, 37) + '...' : spec}' is neither a bitstring nor one of ${NAMED_STATES.join(', ')}`, `e.g. --initial neel, or a string of ${qubits} zeros and ones`);
  }
  if (text.length !== qubits) {
    throw new BitspanError('bad-argument', `--initial has ${text.length} characters but the Hamiltonian has ${qubits} qubits`, `give exactly ${qubits} characters, qubit 0 rightmost`);
  }
  return parseInt(text, 2);
}
