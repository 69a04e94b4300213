import { describe, expect, it } from 'vitest';
import { hubbardModel, hubbardNeel } from '../../../src/operators/models/hubbard.js';
import { makeBasis } from '../../../src/bits/basis.js';
import { enumerateSector } from '../../../src/sectors/enumerateSector.js';
import { projectAndSolve } from '../../../src/pipeline/solve.js';
import { PauliSumBuilder, type PauliSum } from '../../../src/operators/pauliSum.js';
import { buildLattice, type LatticeSpec } from '../../../src/operators/models/lattice.js';
import type { Sector } from '../../../src/sectors/sector.js';
import { closeTo, denseFromPauliSum, hermitianEigenvalues, type DenseComplex } from '../../helpers.js';

/**
 * The Hubbard Hamiltonian built directly in Fock space from creation and annihilation operators
 * on occupation-number bitstrings, with mode m = site + L·spin and the canonical sign
 * c_m |n⟩ = (−1)^{Σ_{k<m} n_k} |n − e_m⟩ — no Pauli algebra involved.
 */
function fockHubbard(spec: LatticeSpec, t: number, u: number, mu: number): DenseComplex {
  const lat = buildLattice(spec);
  const L = lat.sites;
  const dim = 2 ** (2 * L);
  const re = new Float64Array(dim * dim);
  const sign = (n: number, m: number): number => {
    let s = 0;
    for (let k = 0; k < m; k++) s += (n >> k) & 1;
    return s & 1 ? -1 : 1;
  };
  // c†_a c_b |n⟩, as [amplitude, new state] or null.
  const hop = (n: number, a: number, b: number): [number, number] | null => {
    if (!((n >> b) & 1)) return null;
    const s1 = sign(n, b);
    const n1 = n & ~(1 << b);
    if ((n1 >> a) & 1) return null;
    return [s1 * sign(n1, a), n1 | (1 << a)];
  };
  for (let n = 0; n < dim; n++) {
    for (const [i, j] of lat.nearest) {
      for (const spin of [0, L]) {
        for (const [a, b] of [[i + spin, j + spin], [j + spin, i + spin]]) {
          const r = hop(n, a!, b!);
          if (r) re[r[1] * dim + n]! += -t * r[0];
        }
      }
    }
    let diag = 0;
    for (let i = 0; i < L; i++) {
      const up = (n >> i) & 1;
      const dn = (n >> (i + L)) & 1;
      diag += u * up * dn - mu * (up + dn);
    }
    re[n * dim + n]! += diag;
  }
  return { dim, re, im: new Float64Array(dim * dim) };
}

const popcount = (n: number): number => n.toString(2).split('1').length - 1;

function maxDiff(a: DenseComplex, b: DenseComplex): number {
  let d = 0;
  for (let k = 0; k < a.re.length; k++) d = Math.max(d, Math.abs(a.re[k]! - b.re[k]!), Math.abs(a.im[k]! - b.im[k]!));
  return d;
}

async function sectorGround(h: PauliSum, sector: Sector): Promise<number> {
  const e = enumerateSector(sector, h.qubits);
  const basis = makeBasis(h.qubits, e.nWords, e.states, e.count);
  return (await projectAndSolve(h, basis, sector, { tol: 1e-11 })).eigen.values[0]!;
}

const filling = (L: number, up: number, down: number): Sector => ({ weights: [{ lo: 0, hi: L - 1, weight: up }, { lo: L, hi: 2 * L - 1, weight: down }] });
const chain = (L: number, boundary: 'open' | 'periodic'): LatticeSpec => ({ kind: 'chain', lx: L, ly: 1, boundary });

describe('hubbardModel', () => {
  it('hubbardModel equals the direct Fock-space construction on rings, chains and a plaquette (wrap-around sign included)', () => {
    for (const [spec, t, u, mu] of [
      [chain(3, 'periodic'), 1, 4, 0.3],
      [chain(4, 'periodic'), 0.7, 2, 0],
      [chain(4, 'open'), 1, 8, -0.5],
      [{ kind: 'square', lx: 2, ly: 2, boundary: 'open' }, 1, 3, 0.2],
    ] as const) {
      const { hamiltonian } = hubbardModel({ lattice: spec, t, u, mu });
      const diff = maxDiff(denseFromPauliSum(hamiltonian, hamiltonian.qubits), fockHubbard(spec, t, u, mu));
      expect(diff, `${spec.kind} ${spec.lx}x${spec.ly} ${spec.boundary}`).toBeLessThan(1e-12);
    }
  });

  it('hubbardModel two-site ground energy is U/2 − sqrt((U/2)² + 4t²) at half filling (textbook)', async () => {
    for (const [t, u] of [[1, 4], [0.5, 1], [1, 0.1], [2, 10]] as const) {
      const { hamiltonian } = hubbardModel({ lattice: chain(2, 'open'), t, u });
      closeTo(await sectorGround(hamiltonian, filling(2, 1, 1)), u / 2 - Math.sqrt((u / 2) ** 2 + 4 * t * t), 1e-10, `t=${t} U=${u}`);
    }
  });

  it('hubbardModel at U = 0 fills the periodic tight-binding band −2t cos(2πk/L) (textbook), which needs the wrap-around sign', async () => {
    // L = 6, three electrons per spin: k = 0, ±1 → −2t(1 + 2 cos(π/3)) = −4t per spin.
    const ring6 = hubbardModel({ lattice: chain(6, 'periodic'), t: 1, u: 0 }).hamiltonian;
    closeTo(await sectorGround(ring6, filling(6, 3, 3)), -8, 1e-10, 'L=6 N=3+3');
    // L = 4, two electrons per spin: k = 0 and one of ±1 → −2t per spin. A ring without the
    // Jordan–Wigner string on the wrap bond would instead give the antiperiodic band, −2√2 t per spin.
    const ring4 = hubbardModel({ lattice: chain(4, 'periodic'), t: 1, u: 0 }).hamiltonian;
    closeTo(await sectorGround(ring4, filling(4, 2, 2)), -4, 1e-10, 'L=4 N=2+2');
    const naive = new PauliSumBuilder(8);
    for (const off of [0, 4]) {
      for (const [i, k] of [[0, 1], [1, 2], [2, 3], [0, 3]]) {
        naive.add(-0.5, [['X', off + i!], ['X', off + k!]]);
        naive.add(-0.5, [['Y', off + i!], ['Y', off + k!]]);
      }
    }
    closeTo(await sectorGround(naive.finish(true), filling(4, 2, 2)), -4 * Math.SQRT2, 1e-10, 'string-less ring');
  });

  it('hubbardModel ring of 4 at half filling matches ml-matrix on the Fock-space matrix', async () => {
    const spec = chain(4, 'periodic');
    const { hamiltonian } = hubbardModel({ lattice: spec, t: 1, u: 4 });
    // The Fock matrix restricted to two electrons of each spin, diagonalised densely.
    const fock = fockHubbard(spec, 1, 4, 0);
    const states: number[] = [];
    for (let n = 0; n < fock.dim; n++) if (popcount(n & 0xf) === 2 && popcount(n >> 4) === 2) states.push(n);
    const d = states.length;
    const sub: DenseComplex = { dim: d, re: new Float64Array(d * d), im: new Float64Array(d * d) };
    states.forEach((a, i) => states.forEach((b, k) => (sub.re[i * d + k] = fock.re[a * fock.dim + b]!)));
    closeTo(await sectorGround(hamiltonian, filling(4, 2, 2)), hermitianEigenvalues(sub)[0]!, 1e-9, 'half filling');
  });

  it('hubbardNeel puts spin-up on even sites and spin-down on odd sites', () => {
    expect(hubbardNeel(4)).toBe('10100101');
    expect(hubbardNeel(3)).toBe('010101');
  });
});
