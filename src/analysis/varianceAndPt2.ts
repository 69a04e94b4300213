import type { Basis } from '../bits/basis.js';
import type { FlipGroups } from '../operators/pauliSum.js';
import type { CompiledSector } from '../sectors/sector.js';
import type { LinearOperator } from '../solvers/lanczos.js';
import { diagonalEnergies, externalAmplitudes, externalPlan, type ExternalAmplitudes, type ExternalPlan } from './externalAmplitudes.js';

/** Error estimates of one state ψ of the subspace, all for ψ normalised. */
export interface EnergyErrorEstimate {
  /** Rayleigh quotient ⟨ψ|H|ψ⟩ (equal to the Ritz value up to rounding). */
  energy: number;
  /** ⟨ψ|H²|ψ⟩ − ⟨ψ|H|ψ⟩² over the full space. */
  variance: number;
  /** The part of the variance inside the subspace: ‖(H_S − E)ψ‖², the squared residual. */
  internalVariance: number;
  /** The part outside: Σ_a∉S |⟨a|H|ψ⟩|². */
  externalWeight: number;
  /** Epstein–Nesbet second-order correction Σ_a∉S |⟨a|H|ψ⟩|² / (E − H_aa). */
  pt2: number;
  /** Distinct external configurations reached by H from ψ. */
  external: number;
  /** External configurations left out of the PT2 sum because E − H_aa vanished. */
  singular: number;
  /** Part of `externalWeight` on configurations outside the sector (zero when H conserves it). */
  outsideSector: number;
}

/** Options of `varianceAndPt2`. */
export interface VarianceOptions {
  /** The sector, to report how much of H|ψ⟩ leaves it. */
  sector?: CompiledSector;
  /** Hash partitions processed one after another: bounds memory to about 1/parts. */
  parts?: number;
  /** Keep the external amplitudes (for expansion by importance); needs parts = 1. */
  keepExternal?: boolean;
}

/**
 * Energy variance and Epstein–Nesbet PT2 of the state `psi` over `basis` (interleaved when
 * complex). The internal part comes from one application of the projected operator `op`; the
 * external part from the components of H|ψ⟩ outside the subspace, merged by hash.
 * PT2 follows Epstein (Phys. Rev. 28 (1926) 695) and Nesbet (Proc. R. Soc. A 230 (1955) 312).
 */
export function varianceAndPt2(
  basis: Basis,
  groups: FlipGroups,
  op: LinearOperator,
  psi: Float64Array,
  options: VarianceOptions = {},
): EnergyErrorEstimate & { external_?: { amplitudes: ExternalAmplitudes; plan: ExternalPlan } } {
  const n2 = squaredNorm(psi);
  // Internal part: y = H_S ψ, E = ⟨ψ|y⟩, ‖y − Eψ‖² (stable: no cancellation between ⟨H²⟩ and E²).
  const y = new Float64Array(psi.length);
  op.apply(psi, y);
  let e = 0;
  for (let i = 0; i < psi.length; i++) e += psi[i]! * y[i]!;
  e /= n2;
  let internal = 0;
  for (let i = 0; i < psi.length; i++) {
    const d = y[i]! - e * psi[i]!;
    internal += d * d;
  }
  internal /= n2;

  const plan = externalPlan(groups);
  const rowDiagonal = diagonalEnergies(basis, plan);
  const parts = Math.max(1, options.parts ?? 1);
  const keep = Boolean(options.keepExternal) && parts === 1;
  let weight = 0;
  let pt2 = 0;
  let external = 0;
  let singular = 0;
  let outside = 0;
  let kept: ExternalAmplitudes | undefined;
  for (let part = 0; part < parts; part++) {
    const r = externalAmplitudes(basis, plan, psi, rowDiagonal, { part, parts, energy: e, sector: options.sector, keepDiagonal: keep });
    weight += r.weight;
    pt2 += r.pt2;
    singular += r.singular;
    outside += r.outsideSector;
    external += r.external.size;
    if (keep) kept = r.external;
  }
  return {
    energy: e,
    variance: internal + weight / n2,
    internalVariance: internal,
    externalWeight: weight / n2,
    pt2: pt2 / n2,
    external,
    singular,
    outsideSector: outside / n2,
    ...(kept ? { external_: { amplitudes: kept, plan } } : {}),
  };
}

function squaredNorm(v: Float64Array): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i]! * v[i]!;
  return s;
}
