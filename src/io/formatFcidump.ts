import { eriIndex, type Integrals } from '../operators/integrals.js';

/** Header values written with the integrals. */
export interface FcidumpHeader {
  electrons: number;
  ms2?: number;
  orbsym?: number[];
  isym?: number;
}

/**
 * Render integrals as FCIDUMP text: the `&FCI` namelist, then each symmetry-distinct nonzero
 * (ij|kl) with ij ≥ kl, h_ij with i ≥ j, and the core energy last, values in shortest round-trip
 * form so reading the text back gives the same doubles.
 */
export function formatFcidump(ints: Integrals, header: FcidumpHeader): string {
  const m = ints.orbitals;
  const orbsym = header.orbsym ?? new Array<number>(m).fill(1);
  const lines = [` &FCI NORB=${m},NELEC=${header.electrons},MS2=${header.ms2 ?? 0},`, `  ORBSYM=${orbsym.join(',')},`, `  ISYM=${header.isym ?? 1},`, ' &END'];
  for (let i = 0; i < m; i++) {
    for (let j = 0; j <= i; j++) {
      for (let k = 0; k < m; k++) {
        for (let l = 0; l <= k; l++) {
          if (k * (k + 1) / 2 + l > i * (i + 1) / 2 + j) continue;
          const v = ints.eri[eriIndex(m, i, j, k, l)]!;
          if (v !== 0) lines.push(`${v} ${i + 1} ${j + 1} ${k + 1} ${l + 1}`);
        }
      }
    }
  }
  for (let i = 0; i < m; i++) {
    for (let j = 0; j <= i; j++) {
      const v = ints.h1[i * m + j]!;
      if (v !== 0) lines.push(`${v} ${i + 1} ${j + 1} 0 0`);
    }
  }
  lines.push(`${ints.core} 0 0 0 0`);
  return lines.join('\n') + '\n';
}
