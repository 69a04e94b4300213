import { BitspanError } from '../../errors.js';

/** The lattice families `bitspan model` knows. */
export type LatticeKind = 'chain' | 'ladder' | 'square' | 'triangular';

export type Boundary = 'open' | 'periodic';

/** A lattice of `lx × ly` sites; a chain has ly = 1 and a ladder ly = 2. */
export interface LatticeSpec {
  kind: LatticeKind;
  lx: number;
  ly: number;
  boundary: Boundary;
}

/** Sites and the coupled pairs of the first two neighbour shells, as qubit indices (i < j). */
export interface Lattice {
  spec: LatticeSpec;
  sites: number;
  /** Nearest-neighbour pairs, each unordered pair once. */
  nearest: Array<[number, number]>;
  /** Next-nearest-neighbour pairs, each unordered pair once. */
  nextNearest: Array<[number, number]>;
}

// Displacements (dx, dy) in lattice coordinates, one per bond direction. Triangular: a1 = (1, 0),
// a2 = (1/2, √3/2); nearest at distance 1, next-nearest at √3.
const SHELLS: Record<LatticeKind, { nearest: Array<[number, number]>; nextNearest: Array<[number, number]> }> = {
  chain: { nearest: [[1, 0]], nextNearest: [[2, 0]] },
  ladder: { nearest: [[1, 0], [0, 1]], nextNearest: [[1, 1], [1, -1]] },
  square: { nearest: [[1, 0], [0, 1]], nextNearest: [[1, 1], [1, -1]] },
  triangular: { nearest: [[1, 0], [0, 1], [1, -1]], nextNearest: [[1, 1], [2, -1], [1, -2]] },
};

/**
 * Qubit of site (x, y): rows are walked as a snake (even rows left to right, odd rows right to
 * left), so consecutive qubits are nearest neighbours and the alternating bitstring is the
 * checkerboard Néel state on the square lattice and the ladder.
 */
export function siteQubit(spec: LatticeSpec, x: number, y: number): number {
  return y * spec.lx + (y % 2 === 0 ? x : spec.lx - 1 - x);
}

/**
 * Parse `--size`: `L` or `LxW`. A chain is L×1 (or 1×L), a ladder L×2 (or 2×L; legs of length L),
 * a square or triangular lattice given as `L` is L×L.
 */
export function parseLatticeSize(kind: LatticeKind, size: string): { lx: number; ly: number } {
  const m = /^\s*(\d+)\s*(?:[xX×]\s*(\d+))?\s*$/.exec(size);
  const fail = (why: string): never => {
    const eg = kind === 'chain' ? '12' : kind === 'ladder' ? '8x2' : '4x4';
    throw new BitspanError('bad-argument', `--size '${size}' ${why}`, `e.g. --size ${eg}`);
  };
  if (!m) return fail('is not L or LxW');
  let lx = Number(m[1]);
  let ly = m[2] === undefined ? (kind === 'chain' ? 1 : kind === 'ladder' ? 2 : lx) : Number(m[2]);
  // A chain written 1xL or a ladder written 2xL: the legs are the long side.
  if ((kind === 'chain' && lx === 1 && ly !== 1) || (kind === 'ladder' && lx === 2 && ly !== 2)) [lx, ly] = [ly, lx];
  if (kind === 'chain' && ly !== 1) fail('gives a width, but a chain has width 1');
  if (kind === 'ladder' && ly !== 2) fail('gives a width other than 2, but a ladder has two legs');
  if (lx < 1 || ly < 1) fail('has an empty side');
  if (kind === 'chain') ly = 1;
  if (lx * ly < 2) fail('has fewer than 2 sites');
  return { lx, ly };
}

/**
 * Sites and bonds of a lattice. With periodic boundaries every direction wraps (a ladder wraps
 * along its legs only); each unordered pair is kept once per shell, so a periodic side of 2 does
 * not double its bond.
 */
export function buildLattice(spec: LatticeSpec): Lattice {
  const { kind, lx, ly, boundary } = spec;
  const wrapX = boundary === 'periodic';
  const wrapY = boundary === 'periodic' && kind !== 'ladder' && kind !== 'chain';
  const shell = (dirs: Array<[number, number]>): Array<[number, number]> => {
    const seen = new Set<number>();
    const pairs: Array<[number, number]> = [];
    for (let y = 0; y < ly; y++) {
      for (let x = 0; x < lx; x++) {
        for (const [dx, dy] of dirs) {
          let x2 = x + dx;
          let y2 = y + dy;
          if (x2 < 0 || x2 >= lx) {
            if (!wrapX) continue;
            x2 = ((x2 % lx) + lx) % lx;
          }
          if (y2 < 0 || y2 >= ly) {
            if (!wrapY) continue;
            y2 = ((y2 % ly) + ly) % ly;
          }
          const a = siteQubit(spec, x, y);
          const b = siteQubit(spec, x2, y2);
          if (a === b) continue;
          const lo = Math.min(a, b);
          const hi = Math.max(a, b);
          const key = lo * lx * ly + hi;
          if (seen.has(key)) continue;
          seen.add(key);
          pairs.push([lo, hi]);
        }
      }
    }
    return pairs.sort((p, q) => p[0] - q[0] || p[1] - q[1]);
  };
  return { spec, sites: lx * ly, nearest: shell(SHELLS[kind].nearest), nextNearest: shell(SHELLS[kind].nextNearest) };
}

/** One-line description for file headers, e.g. `square 4x4 periodic (16 sites, 32 nearest bonds)`. */
export function describeLattice(l: Lattice): string {
  const { kind, lx, ly, boundary } = l.spec;
  const size = kind === 'chain' ? `${lx}` : `${lx}x${ly}`;
  return `${kind} ${size} ${boundary} (${l.sites} sites, ${l.nearest.length} nearest and ${l.nextNearest.length} next-nearest pairs)`;
}
