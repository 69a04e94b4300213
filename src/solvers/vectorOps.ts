/**
 * Vector kernels for real or complex (interleaved re, im) Float64Arrays. The conjugate-linear
 * argument of `dot` is the first, as in ⟨x|y⟩.
 */

/** ⟨x|y⟩; for complex vectors writes the imaginary part to out[1]. Returns the real part. */
export function dot(x: Float64Array, y: Float64Array, complex: boolean, out?: Float64Array): number {
  const n = x.length;
  if (!complex) {
    let s0 = 0;
    let s1 = 0;
    let i = 0;
    for (; i + 1 < n; i += 2) {
      s0 += x[i]! * y[i]!;
      s1 += x[i + 1]! * y[i + 1]!;
    }
    if (i < n) s0 += x[i]! * y[i]!;
    if (out) out[1] = 0;
    return s0 + s1;
  }
  let re = 0;
  let im = 0;
  for (let i = 0; i < n; i += 2) {
    const xr = x[i]!;
    const xi = x[i + 1]!;
    const yr = y[i]!;
    const yi = y[i + 1]!;
    re += xr * yr + xi * yi;
    im += xr * yi - xi * yr;
  }
  if (out) out[1] = im;
  return re;
}

/** ‖x‖₂. */
export function norm(x: Float64Array): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i]! * x[i]!;
  return Math.sqrt(s);
}

/** y += (ar + i·ai)·x. */
export function axpy(ar: number, ai: number, x: Float64Array, y: Float64Array, complex: boolean): void {
  const n = x.length;
  if (!complex || ai === 0) {
    for (let i = 0; i < n; i++) y[i]! += ar * x[i]!;
    return;
  }
  for (let i = 0; i < n; i += 2) {
    const xr = x[i]!;
    const xi = x[i + 1]!;
    y[i]! += ar * xr - ai * xi;
    y[i + 1]! += ar * xi + ai * xr;
  }
}

/** x *= s. */
export function scale(x: Float64Array, s: number): void {
  for (let i = 0; i < x.length; i++) x[i]! *= s;
}

/**
 * Remove from w its components along the orthonormal vectors `basis[0..count)`, twice (classical
 * Gram–Schmidt repeated once, enough for orthogonality to working precision). Returns the real
 * parts of the first-pass coefficients plus second-pass corrections, i.e. Re⟨v_i|w⟩.
 */
export function orthogonalize(w: Float64Array, basis: Float64Array[], count: number, complex: boolean, coeffs?: Float64Array): void {
  const im = new Float64Array(2);
  for (let pass = 0; pass < 2; pass++) {
    for (let i = 0; i < count; i++) {
      const re = dot(basis[i]!, w, complex, im);
      axpy(-re, -im[1]!, basis[i]!, w, complex);
      if (coeffs) coeffs[i]! += re;
    }
  }
}
