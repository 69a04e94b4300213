/**
 * Linear hydrogen chains in the minimal STO-3G basis, integrals computed from scratch, so molecule
 * fixtures are a scenario of our own: Gaussian s-function integrals in closed form (overlap,
 * kinetic, nuclear attraction and repulsion through the Boys function F0), restricted Hartree–Fock,
 * and the transformation to molecular orbitals. Formulas: the standard s-type Gaussian product
 * results (common practice; as tabulated for 1s Gaussians in quantum-chemistry textbooks).
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { makeIntegrals, setOneElectron, setTwoElectron, type Integrals } from '../../src/operators/integrals.js';

/** STO-3G hydrogen 1s (Slater exponent 1.24): exponents and contraction coefficients (common practice). */
const ALPHA = [3.42525091, 0.62391373, 0.1688554];
const COEFF = [0.15432897, 0.53532814, 0.44463454];

/** Boys function F0(t) = ∫₀¹ exp(−t u²) du = exp(−t) Σ_k (2t)^k / (2k+1)!!, asymptotic for large t. */
export function boysF0(t: number): number {
  if (t > 40) return 0.5 * Math.sqrt(Math.PI / t);
  let term = 1;
  let sum = 1;
  for (let k = 1; k < 400 && term > 1e-17 * sum; k++) {
    term *= (2 * t) / (2 * k + 1);
    sum += term;
  }
  return Math.exp(-t) * sum;
}

interface Primitive {
  a: number;
  c: number;
  x: number;
}

function basisFunctions(positions: number[]): Primitive[][] {
  return positions.map((x) => ALPHA.map((a, k) => ({ a, c: COEFF[k]! * (2 * a / Math.PI) ** 0.75, x })));
}

/** AO integrals of nuclei at `positions` (bohr, on a line, charge 1 each). */
function aoIntegrals(positions: number[]): { s: Matrix; h: Matrix; eri: Float64Array } {
  const f = basisFunctions(positions);
  const n = f.length;
  const s = Matrix.zeros(n, n);
  const h = Matrix.zeros(n, n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let ov = 0;
      let kin = 0;
      let nuc = 0;
      for (const p of f[i]!) {
        for (const q of f[j]!) {
          const g = p.a + q.a;
          const mu = (p.a * q.a) / g;
          const r2 = (p.x - q.x) ** 2;
          const sab = (Math.PI / g) ** 1.5 * Math.exp(-mu * r2);
          const px = (p.a * p.x + q.a * q.x) / g;
          ov += p.c * q.c * sab;
          kin += p.c * q.c * mu * (3 - 2 * mu * r2) * sab;
          for (const cx of positions) nuc -= p.c * q.c * ((2 * Math.PI) / g) * Math.exp(-mu * r2) * boysF0(g * (px - cx) ** 2);
        }
      }
      s.set(i, j, ov);
      h.set(i, j, kin + nuc);
    }
  }
  const eri = new Float64Array(n ** 4);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      for (let k = 0; k < n; k++) {
        for (let l = 0; l < n; l++) {
          let v = 0;
          for (const p of f[i]!) {
            for (const q of f[j]!) {
              const g1 = p.a + q.a;
              const e1 = Math.exp((-p.a * q.a * (p.x - q.x) ** 2) / g1);
              const x1 = (p.a * p.x + q.a * q.x) / g1;
              for (const r of f[k]!) {
                for (const u of f[l]!) {
                  const g2 = r.a + u.a;
                  const e2 = Math.exp((-r.a * u.a * (r.x - u.x) ** 2) / g2);
                  const x2 = (r.a * r.x + u.a * u.x) / g2;
                  const pre = (2 * Math.PI ** 2.5) / (g1 * g2 * Math.sqrt(g1 + g2));
                  v += p.c * q.c * r.c * u.c * pre * e1 * e2 * boysF0(((g1 * g2) / (g1 + g2)) * (x1 - x2) ** 2);
                }
              }
            }
          }
          eri[((i * n + j) * n + k) * n + l] = v;
        }
      }
    }
  }
  return { s, h, eri };
}

/** Result of `hydrogenChain`: MO-basis integrals and the Hartree–Fock energy. */
export interface HydrogenChain {
  integrals: Integrals;
  hartreeFock: number;
  electrons: number;
}

/**
 * MO integrals of H_n on a line with spacing `r` bohr (n even, closed shell) after restricted
 * Hartree–Fock (Roothaan equations with Löwdin orthogonalisation, damped to convergence).
 */
export function hydrogenChain(atoms: number, r: number): HydrogenChain {
  const positions = Array.from({ length: atoms }, (_, i) => i * r);
  const { s, h, eri } = aoIntegrals(positions);
  const n = atoms;
  const occ = atoms / 2;
  const es = new EigenvalueDecomposition(s, { assumeSymmetric: true });
  const x = es.eigenvectorMatrix.mmul(Matrix.diag(es.realEigenvalues.map((v) => 1 / Math.sqrt(v)))).mmul(es.eigenvectorMatrix.transpose());
  let density = Matrix.zeros(n, n);
  let c = Matrix.zeros(n, n);
  let energy = 0;
  for (let iter = 0; iter < 500; iter++) {
    const fock = h.clone();
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let g = 0;
        for (let k = 0; k < n; k++) for (let l = 0; l < n; l++) g += density.get(k, l) * (eri[((i * n + j) * n + k) * n + l]! - 0.5 * eri[((i * n + l) * n + k) * n + j]!);
        fock.set(i, j, fock.get(i, j) + g);
      }
    }
    const fp = x.transpose().mmul(fock).mmul(x);
    const ef = new EigenvalueDecomposition(fp, { assumeSymmetric: true });
    const order = ef.realEigenvalues.map((_, k) => k).sort((p, q) => ef.realEigenvalues[p]! - ef.realEigenvalues[q]!);
    const cp = Matrix.zeros(n, n);
    order.forEach((src, k) => {
      for (let i = 0; i < n; i++) cp.set(i, k, ef.eigenvectorMatrix.get(i, src));
    });
    c = x.mmul(cp);
    const fresh = Matrix.zeros(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
      let v = 0;
      for (let k = 0; k < occ; k++) v += 2 * c.get(i, k) * c.get(j, k);
      fresh.set(i, j, v);
    }
    let e = 0;
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) e += 0.5 * fresh.get(i, j) * (h.get(i, j) + fock.get(i, j));
    const change = Math.abs(e - energy) + fresh.clone().sub(density).norm('frobenius');
    density = iter < 2 ? fresh : fresh.mul(0.7).add(density.mul(0.3));
    energy = e;
    if (change < 1e-13 && iter > 2) break;
  }
  let nuclear = 0;
  for (let i = 0; i < atoms; i++) for (let j = i + 1; j < atoms; j++) nuclear += 1 / Math.abs(positions[i]! - positions[j]!);

  const ints = makeIntegrals(n);
  ints.core = nuclear;
  for (let p = 0; p < n; p++) {
    for (let q = 0; q <= p; q++) {
      let v = 0;
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) v += c.get(i, p) * c.get(j, q) * h.get(i, j);
      setOneElectron(ints, p, q, Math.abs(v) < 1e-12 ? 0 : v);
    }
  }
  // Four quarter transformations, O(n^5).
  let t = eri;
  for (let pass = 0; pass < 4; pass++) {
    const next = new Float64Array(n ** 4);
    for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) for (let d = 0; d < n; d++) for (let p = 0; p < n; p++) {
      let v = 0;
      for (let i = 0; i < n; i++) v += c.get(i, p) * t[((i * n + a) * n + b) * n + d]!;
      // Rotate the index order so each pass transforms the leading index: (i a b d) → (a b d p).
      next[((a * n + b) * n + d) * n + p] = v;
    }
    t = next;
  }
  for (let p = 0; p < n; p++) for (let q = 0; q < n; q++) for (let r2 = 0; r2 < n; r2++) for (let u = 0; u < n; u++) {
    if (q > p || u > r2 || r2 * n + u > p * n + q) continue;
    const v = t[((p * n + q) * n + r2) * n + u]!;
    // Symmetry-forbidden integrals come out at rounding level; write them as exact zeros.
    setTwoElectron(ints, p, q, r2, u, Math.abs(v) < 1e-12 ? 0 : v);
  }
  return { integrals: ints, hartreeFock: energy + nuclear, electrons: atoms };
}
