import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { enumerateSector, sectorDimension } from '../../src/sectors/enumerateSector.js';
import { compileSector, inSector, type Sector } from '../../src/sectors/sector.js';
import { formatBitstring } from '../../src/bits/packed.js';

/** Every configuration of n ≤ 12 qubits that the sector filter of `solve` keeps. */
function bruteForce(sector: Sector, n: number): string[] {
  const c = compileSector(sector, n, 1);
  const out: string[] = [];
  const w = new Uint32Array(1);
  for (let b = 0; b < 2 ** n; b++) {
    w[0] = b;
    if (inSector(c, w, 0)) out.push(formatBitstring(w, 0, n));
  }
  return out.sort();
}

function enumerated(sector: Sector, n: number): string[] {
  const e = enumerateSector(sector, n);
  const out: string[] = [];
  for (let i = 0; i < e.count; i++) out.push(formatBitstring(e.states, i * e.nWords, n));
  return out.sort();
}

describe('enumerateSector', () => {
  it('enumerateSector lists exactly the configurations the solve filter keeps, for overlapping ranges and parity too', () => {
    const sectorArb = fc.integer({ min: 1, max: 10 }).chain((n) =>
      fc.record({
        n: fc.constant(n),
        weights: fc.array(
          fc.tuple(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n })).map(([a, b, k]) => {
            const lo = Math.min(a, b);
            const hi = Math.max(a, b);
            return { lo, hi, weight: Math.min(k, hi - lo + 1) };
          }),
          { maxLength: 3 },
        ),
        parity: fc.constantFrom(undefined, 'even' as const, 'odd' as const),
      }),
    );
    fc.assert(
      fc.property(sectorArb, ({ n, weights, parity }) => {
        const sector: Sector = { weights, parity };
        const expected = bruteForce(sector, n);
        const got = enumerated(sector, n);
        expect(got).toEqual(expected);
        expect(sectorDimension(sector, n)).toBe(expected.length);
      }),
      { seed: 42, numRuns: 150 },
    );
  });

  it('sectorDimension of Hubbard registers is C(L, N↑)·C(L, N↓) (combinatorics)', () => {
    const sector: Sector = { weights: [{ lo: 0, hi: 9, weight: 5 }, { lo: 10, hi: 19, weight: 4 }] };
    expect(sectorDimension(sector, 20)).toBe(252 * 210);
    expect(sectorDimension({ weights: [{ lo: 0, hi: -1, weight: 15 }] }, 30)).toBe(155117520);
    expect(sectorDimension({ weights: [], parity: 'odd' }, 40)).toBe(2 ** 39);
  });

  it('enumerateSector packs configurations beyond 32 qubits into several words', () => {
    const e = enumerateSector({ weights: [{ lo: 0, hi: -1, weight: 2 }] }, 40);
    expect(e.count).toBe(780);
    expect(e.nWords).toBe(2);
    const high = Array.from({ length: e.count }, (_, i) => e.states[i * 2 + 1]!).filter((w) => w !== 0).length;
    // Pairs with at least one of qubits 32..39: C(40,2) − C(32,2).
    expect(high).toBe(780 - 496);
  });
});
