/** Where the lower bound on the first excited energy used by Kato–Temple came from. */
export type GapSource = 'gap' | 'ritz';

/**
 * Bounds on the ground energy from a state's energy E and variance σ². `upper` is variational;
 * `weinstein` [E − σ, E + σ] holds at least one exact eigenvalue (Weinstein, PNAS 20 (1934) 529);
 * `katoTemple` [E − σ²/(β − E), E] holds the ground energy when β ≤ E₁ (Temple, Proc. R. Soc. A 119
 * (1928) 276; Kato, J. Phys. Soc. Jpn. 4 (1949) 334).
 */
export interface EnergyBounds {
  upper: number;
  weinstein: [number, number];
  /** Present when a gap is known (from `--gap`, or estimated from the second Ritz value). */
  katoTemple?: [number, number];
  /** The β (lower bound on the first excited energy) the Kato–Temple interval used. */
  beta?: number;
  /** `gap`: from a given lower bound on E₁ − E₀ (certified if E lies below E₀ + gap/2); `ritz`: β = second Ritz value, an estimate only. */
  betaFrom?: GapSource;
  /** Why no Kato–Temple interval was given although a gap was known. */
  katoTempleNote?: string;
}

/** Options of `energyBounds`: a lower bound on the gap E₁ − E₀, or the second Ritz value. */
export interface BoundOptions {
  gap?: number;
  secondRitz?: number;
}

/**
 * Variational, Weinstein and Kato–Temple bounds for the ground energy from E and σ².
 * With a gap Δ ≤ E₁ − E₀, Kato–Temple with β = E₀ + Δ reads x(Δ − x) ≤ σ² for x = E − E₀; under
 * x < Δ/2 (the state is closer to the ground state than the midpoint) this gives
 * x ≤ (Δ − √(Δ² − 4σ²))/2, computed in the stable form 2σ²/(Δ + √(Δ² − 4σ²)).
 * With only the second Ritz value θ₁ (an upper bound on E₁, so not a certified β) the interval
 * E − σ²/(θ₁ − E) is an estimate.
 */
export function energyBounds(energy: number, variance: number, opts: BoundOptions = {}): EnergyBounds {
  const v = Math.max(0, variance);
  const sigma = Math.sqrt(v);
  const out: EnergyBounds = { upper: energy, weinstein: [energy - sigma, energy + sigma] };
  if (opts.gap !== undefined && opts.gap > 0) {
    const d = opts.gap;
    const disc = d * d - 4 * v;
    if (disc < 0) {
      out.katoTempleNote = `the gap ${d} is below 2σ = ${2 * sigma}: the variance is too large for a Kato–Temple bound`;
    } else {
      const x = (2 * v) / (d + Math.sqrt(disc));
      out.katoTemple = [energy - x, energy];
      out.beta = energy - x + d;
      out.betaFrom = 'gap';
    }
    return out;
  }
  if (opts.secondRitz !== undefined && opts.secondRitz > energy) {
    out.katoTemple = [energy - v / (opts.secondRitz - energy), energy];
    out.beta = opts.secondRitz;
    out.betaFrom = 'ritz';
  }
  return out;
}
