import { describe, expect, it } from 'vitest';
import { buildLattice, parseLatticeSize, siteQubit, type LatticeSpec } from '../../../src/operators/models/lattice.js';
import { BitspanError } from '../../../src/errors.js';

const spec = (kind: LatticeSpec['kind'], lx: number, ly: number, boundary: LatticeSpec['boundary']): LatticeSpec => ({ kind, lx, ly, boundary });

describe('buildLattice', () => {
  it('buildLattice counts bonds as coordination number × sites / 2 on periodic lattices (common practice)', () => {
    // Square z = 4, triangular z = 6: N·z/2 nearest bonds; square next-nearest (diagonals) z = 4.
    expect(buildLattice(spec('square', 4, 4, 'periodic')).nearest.length).toBe(32);
    expect(buildLattice(spec('square', 4, 4, 'periodic')).nextNearest.length).toBe(32);
    expect(buildLattice(spec('triangular', 3, 4, 'periodic')).nearest.length).toBe(36);
    expect(buildLattice(spec('triangular', 6, 6, 'periodic')).nextNearest.length).toBe(108);
    expect(buildLattice(spec('chain', 10, 1, 'periodic')).nearest.length).toBe(10);
    // Ladder: two periodic legs of L bonds and L rungs.
    expect(buildLattice(spec('ladder', 6, 2, 'periodic')).nearest.length).toBe(18);
  });

  it('buildLattice counts open-boundary bonds by hand', () => {
    expect(buildLattice(spec('chain', 7, 1, 'open')).nearest.length).toBe(6);
    expect(buildLattice(spec('chain', 7, 1, 'open')).nextNearest.length).toBe(5);
    expect(buildLattice(spec('square', 4, 3, 'open')).nearest.length).toBe(3 * 3 + 4 * 2);
    expect(buildLattice(spec('square', 4, 3, 'open')).nextNearest.length).toBe(2 * 3 * 2);
    expect(buildLattice(spec('ladder', 5, 2, 'open')).nearest.length).toBe(2 * 4 + 5);
    // Triangular open L×W: (L−1)W + L(W−1) + (L−1)(W−1).
    expect(buildLattice(spec('triangular', 4, 3, 'open')).nearest.length).toBe(3 * 3 + 4 * 2 + 3 * 2);
  });

  it('buildLattice keeps each pair once per shell, also when a periodic side is 2', () => {
    const l = buildLattice(spec('chain', 2, 1, 'periodic'));
    expect(l.nearest).toEqual([[0, 1]]);
    const ring4 = buildLattice(spec('chain', 4, 1, 'periodic'));
    expect(ring4.nextNearest).toEqual([[0, 2], [1, 3]]);
    for (const kind of ['chain', 'ladder', 'square', 'triangular'] as const) {
      const lat = buildLattice(spec(kind, 5, kind === 'chain' ? 1 : kind === 'ladder' ? 2 : 4, 'periodic'));
      for (const shell of [lat.nearest, lat.nextNearest]) {
        const keys = shell.map(([a, b]) => `${a}-${b}`);
        expect(new Set(keys).size).toBe(keys.length);
        for (const [a, b] of shell) expect(a).toBeLessThan(b);
      }
    }
  });

  it('siteQubit walks the lattice as a snake: consecutive qubits are nearest neighbours', () => {
    for (const s of [spec('ladder', 6, 2, 'open'), spec('square', 5, 4, 'open'), spec('triangular', 4, 3, 'open')]) {
      const lat = buildLattice(s);
      const near = new Set(lat.nearest.map(([a, b]) => `${a}-${b}`));
      for (let q = 0; q + 1 < lat.sites; q++) expect(near.has(`${q}-${q + 1}`)).toBe(true);
      const seen = new Set<number>();
      for (let y = 0; y < s.ly; y++) for (let x = 0; x < s.lx; x++) seen.add(siteQubit(s, x, y));
      expect(seen.size).toBe(lat.sites);
    }
  });

  it('buildLattice with the snake order makes the alternating bitstring a Néel state on bipartite lattices', () => {
    for (const s of [spec('square', 4, 4, 'periodic'), spec('square', 5, 4, 'open'), spec('ladder', 6, 2, 'periodic'), spec('chain', 8, 1, 'periodic')]) {
      for (const [a, b] of buildLattice(s).nearest) expect((a + b) % 2).toBe(1);
    }
  });
});

describe('parseLatticeSize', () => {
  it('parseLatticeSize reads L and LxW with per-lattice defaults', () => {
    expect(parseLatticeSize('chain', '12')).toEqual({ lx: 12, ly: 1 });
    expect(parseLatticeSize('ladder', '8')).toEqual({ lx: 8, ly: 2 });
    expect(parseLatticeSize('square', '4')).toEqual({ lx: 4, ly: 4 });
    expect(parseLatticeSize('triangular', '3x4')).toEqual({ lx: 3, ly: 4 });
    expect(parseLatticeSize('ladder', '2x6')).toEqual({ lx: 6, ly: 2 });
    expect(parseLatticeSize('chain', '1x5')).toEqual({ lx: 5, ly: 1 });
  });

  it('parseLatticeSize refuses malformed sizes with bad-argument', () => {
    for (const [kind, size] of [['chain', '4x2'], ['ladder', '4x3'], ['square', 'x4'], ['square', '0x3'], ['chain', '1']] as const) {
      try {
        parseLatticeSize(kind, size);
        expect.unreachable();
      } catch (e) {
        expect((e as BitspanError).code).toBe('bad-argument');
      }
    }
  });
});
