/**
 * A dense complex square matrix, row-major, real and imaginary parts in separate arrays:
 * entry (j, k) is re[j*n + k] + i·im[j*n + k].
 */
export interface ComplexMatrix {
  n: number;
  re: Float64Array;
  im: Float64Array;
}

/** A zero n×n complex matrix. */
export function complexMatrix(n: number): ComplexMatrix {
  return { n, re: new Float64Array(n * n), im: new Float64Array(n * n) };
}

/** The Hermitian part (A + A†)/2, as a new matrix. */
export function hermitianPart(a: ComplexMatrix): ComplexMatrix {
  const { n } = a;
  const out = complexMatrix(n);
  for (let j = 0; j < n; j++) {
    for (let k = 0; k < n; k++) {
      out.re[j * n + k] = 0.5 * (a.re[j * n + k]! + a.re[k * n + j]!);
      out.im[j * n + k] = 0.5 * (a.im[j * n + k]! - a.im[k * n + j]!);
    }
  }
  return out;
}

/** The leading m×m block of a matrix, as a new matrix. */
export function leadingBlock(a: ComplexMatrix, m: number): ComplexMatrix {
  const out = complexMatrix(m);
  for (let j = 0; j < m; j++) {
    for (let k = 0; k < m; k++) {
      out.re[j * m + k] = a.re[j * a.n + k]!;
      out.im[j * m + k] = a.im[j * a.n + k]!;
    }
  }
  return out;
}
