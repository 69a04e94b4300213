import { BitspanError } from '../errors.js';
import { makeBasis, type Basis } from '../bits/basis.js';
import { wordsFor } from '../bits/packed.js';
import { compileSector, type Sector } from './sector.js';

/**
 * Every configuration of the sector as a basis (for exact reference energies on small systems):
 * a depth-first walk over qubits that prunes branches which can no longer meet a weight
 * constraint. Throws `too-large` when the sector holds more than `maxDim` configurations.
 */
export function enumerateSector(sector: Sector, qubits: number, maxDim: number): Basis {
  const nWords = wordsFor(qubits);
  const s = compileSector(sector, qubits, nWords);
  const nc = s.count;
  // For each constraint: whether qubit q is in it, and how many of its qubits are ≥ q.
  const member = new Uint8Array(nc * qubits);
  const remaining = new Int32Array(nc * (qubits + 1));
  for (let c = 0; c < nc; c++) {
    for (let q = qubits - 1; q >= 0; q--) {
      const inMask = (s.masks[c * nWords + (q >>> 5)]! >>> (q & 31)) & 1;
      member[c * qubits + q] = inMask;
      remaining[c * (qubits + 1) + q] = remaining[c * (qubits + 1) + q + 1]! + inMask;
    }
  }
  const need = Int32Array.from(s.targets);
  let cap = 1024;
  let states = new Uint32Array(cap * nWords);
  let count = 0;
  const cur = new Uint32Array(nWords);
  const tooLarge = (): BitspanError =>
    new BitspanError('too-large', `the sector holds more than ${maxDim} configurations`, 'give --reference E instead of --exact, or raise --exact-max-dim');
  const visit = (q: number, parity: number): void => {
    for (let c = 0; c < nc; c++) if (need[c]! < 0 || need[c]! > remaining[c * (qubits + 1) + q]!) return;
    if (q === qubits) {
      if (s.parity >= 0 && parity !== s.parity) return;
      if (count === maxDim) throw tooLarge();
      if (count === cap) {
        cap *= 2;
        const grown = new Uint32Array(cap * nWords);
        grown.set(states);
        states = grown;
      }
      states.set(cur, count * nWords);
      count++;
      return;
    }
    visit(q + 1, parity);
    for (let c = 0; c < nc; c++) if (member[c * qubits + q]) need[c]!--;
    cur[q >>> 5]! |= 1 << (q & 31);
    visit(q + 1, parity ^ 1);
    cur[q >>> 5]! &= ~(1 << (q & 31));
    for (let c = 0; c < nc; c++) if (member[c * qubits + q]) need[c]!++;
  };
  visit(0, 0);
  if (count === 0) throw new BitspanError('empty-subspace', 'the sector holds no configuration', 'check the sector flags');
  return makeBasis(qubits, nWords, states, count);
}
