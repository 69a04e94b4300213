import { complex, expm, matrix, multiply, type Complex, type Matrix } from 'mathjs';
import type { DenseComplex } from '../helpers.js';

/**
 * e^{−iHt}ψ by mathjs `expm` (Padé approximation with scaling and squaring) of the dense matrix —
 * the outside reference for the simulator's evolutions.
 */
export function expmEvolve(h: DenseComplex, psi: { re: Float64Array; im: Float64Array }, t: number): { re: Float64Array; im: Float64Array } {
  const n = h.dim;
  const rows: Complex[][] = [];
  for (let i = 0; i < n; i++) {
    const row: Complex[] = [];
    // −iHt = t·Im(H) − i·t·Re(H)
    for (let j = 0; j < n; j++) row.push(complex(t * h.im[i * n + j]!, -t * h.re[i * n + j]!));
    rows.push(row);
  }
  const u = expm(matrix(rows)) as Matrix;
  const v = matrix(Array.from({ length: n }, (_, i) => complex(psi.re[i]!, psi.im[i]!)));
  const out = multiply(u, v) as Matrix;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  (out.toArray() as unknown as Complex[]).forEach((c, i) => {
    const z = typeof c === 'number' ? complex(c, 0) : c;
    re[i] = z.re;
    im[i] = z.im;
  });
  return { re, im };
}
