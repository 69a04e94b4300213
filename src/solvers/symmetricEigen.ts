import { EigenvalueDecomposition, Matrix } from 'ml-matrix';

/**
 * All eigenpairs of a small real symmetric matrix (row-major n×n), ascending. Vectors are returned
 * column-wise: vectors[i*n + k] is component i of eigenvector k. Uses ml-matrix's symmetric
 * tridiagonal QL decomposition.
 */
export function symmetricEigen(a: Float64Array, n: number): { values: Float64Array; vectors: Float64Array } {
  const rows: number[][] = [];
  for (let i = 0; i < n; i++) {
    const row = new Array<number>(n);
    // Symmetrise: callers build the matrix from computed inner products that agree only to rounding.
    for (let j = 0; j < n; j++) row[j] = 0.5 * (a[i * n + j]! + a[j * n + i]!);
    rows.push(row);
  }
  const e = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true });
  const raw = e.realEigenvalues;
  const v = e.eigenvectorMatrix;
  const order = raw.map((_, i) => i).sort((p, q) => raw[p]! - raw[q]!);
  const values = new Float64Array(n);
  const vectors = new Float64Array(n * n);
  order.forEach((src, k) => {
    values[k] = raw[src]!;
    for (let i = 0; i < n; i++) vectors[i * n + k] = v.get(i, src);
  });
  return { values, vectors };
}
