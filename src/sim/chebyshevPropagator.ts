import { besselJSequence } from './besselJ.js';
import type { FullSpaceOperator } from './fullSpaceOperator.js';
import type { SimKernels } from './simKernels.js';
import { createState, type StateVector } from './stateVector.js';

/**
 * e^{−iHτ} applied in place by its Chebyshev expansion (Tal-Ezer & Kosloff, J. Chem. Phys. 81
 * (1984) 3967): with H = b + a·H̃ and the spectrum of H̃ inside [−1, 1],
 * e^{−iHτ} = e^{−ibτ} Σ_k (2 − δ_k0) (−i)^k J_k(aτ) T_k(H̃). The series is cut where the Bessel
 * weights fall below 1e-17, which makes the step exact to rounding; it needs only three state
 * vectors, so it reaches the same register sizes as the Trotter circuits.
 */
export class ChebyshevPropagator {
  private readonly prev: StateVector;
  private readonly cur: StateVector;
  private readonly center: number;
  private readonly halfWidth: number;
  /** Products with H spent so far. */
  matvecs = 0;

  constructor(
    op: FullSpaceOperator,
    private readonly kernels: SimKernels,
    bounds: { lower: number; upper: number },
    shared = false,
  ) {
    this.center = (bounds.upper + bounds.lower) / 2;
    // A sliver of margin: a spectrum touching ±1 only through rounding must not make T_k grow.
    this.halfWidth = Math.max((bounds.upper - bounds.lower) / 2, 1e-12) * (1 + 1e-6) + 1e-12;
    this.prev = createState(op.qubits, shared);
    this.cur = createState(op.qubits, shared);
  }

  /** ψ ← e^{−iHτ} ψ; returns the number of Chebyshev terms used. `onTick` gets the fraction done. */
  step(psi: StateVector, tau: number, onTick?: (fraction: number) => void): number {
    const { kernels, prev, cur } = this;
    const a = this.halfWidth;
    const b = this.center;
    const coeff = besselJSequence(a * Math.abs(tau));
    const sign = tau < 0 ? -1 : 1;
    // φ0 = ψ (kept in prev), φ1 = H̃ψ (in cur); ψ becomes the running sum.
    prev.re.set(psi.re);
    prev.im.set(psi.im);
    kernels.scaleInPlace(psi, coeff[0]!, 0);
    if (coeff.length > 1) {
      kernels.applyH(prev, cur, 1 / a, -b / a, 0);
      this.matvecs++;
      kernels.addScaled(psi, cur, ...weight(1, coeff[1]!, sign));
    }
    let p = prev;
    let c = cur;
    for (let k = 2; k < coeff.length; k++) {
      // φ_{k} = 2H̃φ_{k−1} − φ_{k−2}, written over φ_{k−2}.
      kernels.applyH(c, p, 2 / a, (-2 * b) / a, -1);
      this.matvecs++;
      const t = p;
      p = c;
      c = t;
      kernels.addScaled(psi, c, ...weight(k, coeff[k]!, sign));
      if (onTick && k % 4 === 0) onTick(k / coeff.length);
    }
    // Global phase e^{−ibτ} of the shift.
    kernels.scaleInPlace(psi, Math.cos(b * tau), -Math.sin(b * tau));
    return coeff.length;
  }
}

/** (2 − δ_k0)(∓i)^k J_k as a (re, im) pair; `sign` −1 evolves backwards in time. */
function weight(k: number, j: number, sign: number): [number, number] {
  const w = 2 * j;
  switch (k & 3) {
    case 0:
      return [w, 0];
    case 1:
      return [0, -sign * w];
    case 2:
      return [-w, 0];
    default:
      return [0, sign * w];
  }
}
