import { popcount32 } from '../bits/packed.js';
import type { FullSpaceOperator } from './fullSpaceOperator.js';

/**
 * Gershgorin bounds on the spectrum: every eigenvalue lies in [min_b (H_bb − R_b), max_b (H_bb + R_b)]
 * with R_b the sum of |H_bc| over c ≠ b. One pass over the rows, like a product.
 */
export function gershgorinBounds(op: FullSpaceOperator): { lower: number; upper: number } {
  const { diagonal, flips, termStart, zMasks, phaseRe, phaseIm } = op;
  let lower = Infinity;
  let upper = -Infinity;
  for (let b = 0; b < op.dim; b++) {
    let r = 0;
    for (let g = 0; g < flips.length; g++) {
      const c = b ^ flips[g]!;
      let ar = 0;
      let ai = 0;
      for (let t = termStart[g]!; t < termStart[g + 1]!; t++) {
        const s = popcount32(c & zMasks[t]!) & 1 ? -1 : 1;
        ar += s * phaseRe[t]!;
        ai += s * phaseIm[t]!;
      }
      r += Math.hypot(ar, ai);
    }
    const d = diagonal[b]!;
    if (d - r < lower) lower = d - r;
    if (d + r > upper) upper = d + r;
  }
  return { lower, upper };
}
