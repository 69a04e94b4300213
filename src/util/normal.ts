import { seededUniform } from './random.js';

/** A seeded stream of standard normal deviates. */
export interface NormalSource {
  next(): number;
}

/** Seeded standard normal generator (Box–Muller on `seededUniform`); same seed, same stream. */
export function seededNormal(seed: number): NormalSource {
  const u = seededUniform(seed);
  let spare = Number.NaN;
  return {
    next(): number {
      if (!Number.isNaN(spare)) {
        const z = spare;
        spare = Number.NaN;
        return z;
      }
      // 1 − u lies in (0, 1], so the logarithm is finite.
      const radius = Math.sqrt(-2 * Math.log(1 - u.next()));
      const angle = 2 * Math.PI * u.next();
      spare = radius * Math.sin(angle);
      return radius * Math.cos(angle);
    },
  };
}
