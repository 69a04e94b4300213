/**
 * A square sparse matrix in compressed-sparse-row form. Complex matrices store values interleaved
 * (re, im) so entry e is values[2e], values[2e+1]. `rowPtr` is a Float64Array because the number
 * of nonzeros may exceed 2^31.
 */
export interface SparseMatrix {
  dim: number;
  complex: boolean;
  rowPtr: Float64Array;
  cols: Int32Array;
  values: Float64Array;
}

/** Number of stored entries. */
export function nonzeros(m: SparseMatrix): number {
  return m.rowPtr[m.dim]!;
}

/** y = M x over rows r0..r1 (vectors interleaved when complex). */
export function csrApplyRows(m: SparseMatrix, x: Float64Array, y: Float64Array, r0 = 0, r1 = m.dim): void {
  const { rowPtr, cols, values } = m;
  if (!m.complex) {
    for (let r = r0; r < r1; r++) {
      let s = 0;
      const end = rowPtr[r + 1]!;
      for (let e = rowPtr[r]!; e < end; e++) s += values[e]! * x[cols[e]!]!;
      y[r] = s;
    }
    return;
  }
  for (let r = r0; r < r1; r++) {
    let sr = 0;
    let si = 0;
    const end = rowPtr[r + 1]!;
    for (let e = rowPtr[r]!; e < end; e++) {
      const c = 2 * cols[e]!;
      const vr = values[2 * e]!;
      const vi = values[2 * e + 1]!;
      const xr = x[c]!;
      const xi = x[c + 1]!;
      sr += vr * xr - vi * xi;
      si += vr * xi + vi * xr;
    }
    y[2 * r] = sr;
    y[2 * r + 1] = si;
  }
}

/** Join row-range pieces (in row order) into one matrix. */
export function joinRowPieces(dim: number, complex: boolean, pieces: SparseMatrixPiece[]): SparseMatrix {
  let nnz = 0;
  for (const p of pieces) nnz += p.cols.length;
  const rowPtr = new Float64Array(dim + 1);
  const cols = new Int32Array(nnz);
  const values = new Float64Array(complex ? 2 * nnz : nnz);
  let at = 0;
  for (const p of pieces) {
    for (let r = p.r0; r < p.r1; r++) rowPtr[r + 1] = at + p.rowEnd[r - p.r0]!;
    cols.set(p.cols, at);
    values.set(p.values, complex ? 2 * at : at);
    at += p.cols.length;
  }
  return { dim, complex, rowPtr, cols, values };
}

/** Rows r0..r1 of a matrix: `rowEnd[i]` is the end of row r0+i within this piece's arrays. */
export interface SparseMatrixPiece {
  r0: number;
  r1: number;
  rowEnd: Float64Array;
  cols: Int32Array;
  values: Float64Array;
}

/** Dense copy (row-major, complex as [re, im] pairs) for tests and tiny problems. */
export function toDense(m: SparseMatrix): { re: Float64Array; im: Float64Array } {
  const n = m.dim;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let r = 0; r < n; r++) {
    for (let e = m.rowPtr[r]!; e < m.rowPtr[r + 1]!; e++) {
      const c = m.cols[e]!;
      if (m.complex) {
        re[r * n + c]! += m.values[2 * e]!;
        im[r * n + c]! += m.values[2 * e + 1]!;
      } else re[r * n + c]! += m.values[e]!;
    }
  }
  return { re, im };
}
