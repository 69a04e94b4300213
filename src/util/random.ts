// The generator's own module: the package root loads every generator and distribution (~40 files).
import { xoroshiro128plus } from 'pure-rand/generator/XoroShiro';

/** A seeded stream of uniform doubles in [0, 1) (xoroshiro128+ from pure-rand, 53-bit mantissa). */
export interface UniformSource {
  next(): number;
}

/** Seeded uniform generator; the same seed always gives the same stream. */
export function seededUniform(seed: number): UniformSource {
  const g = xoroshiro128plus(seed | 0);
  return {
    next(): number {
      const hi = (g.unsafeNext() >>> 0) >>> 5; // 27 bits
      const lo = (g.unsafeNext() >>> 0) >>> 6; // 26 bits
      return (hi * 67108864 + lo) / 9007199254740992;
    },
  };
}
