import { BitspanError } from '../errors.js';
import type { Sector } from './sector.js';

/**
 * The sector of determinants with `up` spin-up electrons (qubits 0..M−1) and `down` spin-down
 * electrons (qubits M..2M−1), as per-register Hamming weights. Throws `bad-argument` when a count
 * does not fit in M orbitals.
 */
export function electronSector(orbitals: number, up: number, down: number): Sector {
  for (const [n, spin] of [[up, 'spin-up'], [down, 'spin-down']] as const) {
    if (!Number.isInteger(n) || n < 0 || n > orbitals) {
      throw new BitspanError('bad-argument', `${n} ${spin} electrons do not fit in ${orbitals} orbitals`, `each count is between 0 and ${orbitals}`);
    }
  }
  return { weights: [{ lo: 0, hi: orbitals - 1, weight: up }, { lo: orbitals, hi: 2 * orbitals - 1, weight: down }] };
}

/** Parse `--electrons A,B` (spin-up, spin-down). */
export function parseElectrons(spec: string): [number, number] {
  const m = /^\s*(\d+)\s*,\s*(\d+)\s*$/.exec(spec);
  if (!m) throw new BitspanError('bad-argument', `--electrons '${spec}' is not A,B`, 'give the spin-up and spin-down electron counts, e.g. --electrons 5,5');
  return [Number(m[1]), Number(m[2])];
}

/**
 * Spin-up and spin-down counts from an FCIDUMP header: N↑ = (NELEC + MS2)/2, N↓ = (NELEC − MS2)/2.
 * Throws `bad-argument` when NELEC is missing or the counts are not whole.
 */
export function electronsFromHeader(electrons: number | undefined, ms2: number, file: string): [number, number] {
  if (electrons === undefined) {
    throw new BitspanError('bad-argument', 'the FCIDUMP header gives no NELEC and --electrons is missing', 'give the spin-up and spin-down counts, e.g. --electrons 5,5', { file });
  }
  if ((electrons + ms2) % 2 !== 0 || Math.abs(ms2) > electrons) {
    throw new BitspanError('bad-argument', `NELEC=${electrons} and MS2=${ms2} do not give whole spin-up and spin-down counts`, 'give the counts with --electrons A,B', { file });
  }
  return [(electrons + ms2) / 2, (electrons - ms2) / 2];
}
