import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { makeBasis } from '../../src/bits/basis.js';
import { buildProjectedHamiltonianParallel } from '../../src/build/parallelBuild.js';
import { buildProjectedHamiltonian, sectorFlipTest } from '../../src/build/projectedHamiltonian.js';
import { SLAB_MIN_DIM } from '../../src/build/pieceSlab.js';
import { rowScanPlan, upperPerRowEstimate } from '../../src/build/rowScan.js';
import { LENGTH_WINDOW, reorderForLocality, sortRowsByLength, toSparseMatrix, type StoredHamiltonian } from '../../src/build/storedHamiltonian.js';
import { readHamiltonian } from '../../src/io/readHamiltonian.js';
import { readSamples } from '../../src/io/readSamples.js';
import { selectSubspace } from '../../src/sectors/selectSubspace.js';
import { tempDir } from '../helpers.js';
import { groupByFlipMask, PauliSumBuilder } from '../../src/operators/pauliSum.js';
import { compileSector } from '../../src/sectors/sector.js';
import { projectAndSolve, projectAndSolveSync } from '../../src/pipeline/solve.js';
import { closeSolveWorkers } from '../../src/parallel/solveWorkers.js';
import { seededUniform } from '../../src/util/random.js';

afterAll(closeSolveWorkers);

/** A 40-qubit random XXZ-plus-field model and ~30k sampled weight-20 configurations (seeded). */
function problem(complex: boolean, dim = 30000) {
  const n = 40;
  const rng = seededUniform(77);
  const b = new PauliSumBuilder(n);
  for (let i = 0; i < n; i++) {
    const j = (i + 1 + Math.floor(rng.next() * 3)) % n;
    b.add(0.5 + rng.next(), [['X', i], ['X', j]]);
    b.add(0.5 + rng.next(), [['Y', i], ['Y', j]]);
    b.add(rng.next() - 0.5, [['Z', i], ['Z', j]]);
    if (complex) b.add(0.3 * (rng.next() - 0.5), [['X', i], ['Y', j]]);
    b.add(rng.next() - 0.5, [['Z', i]]);
  }
  const h = b.finish(true);
  const seen = new Set<string>();
  const states = new Uint32Array(dim * 2);
  let k = 0;
  while (k < dim) {
    // Néel-like start with random swaps keeps weight 20 and clusters the samples.
    const bits = Array.from({ length: n }, (_, q) => q % 2);
    for (let s = 0; s < 8; s++) {
      const p = Math.floor(rng.next() * n);
      const q = (p + 1) % n;
      [bits[p], bits[q]] = [bits[q]!, bits[p]!];
    }
    const key = bits.join('');
    if (seen.has(key)) continue;
    seen.add(key);
    bits.forEach((v, q) => {
      if (v) states[k * 2 + (q >>> 5)]! |= 1 << (q & 31);
    });
    k++;
  }
  return { h, n, states, dim };
}

describe('buildProjectedHamiltonianParallel', () => {
  for (const complex of [false, true]) {
    it(`buildProjectedHamiltonianParallel gives identical matrices for 1, 2 and 4 threads (${complex ? 'complex' : 'real'})`, async () => {
      const { h, n, states, dim } = problem(complex);
      const basis = makeBasis(n, 2, states, dim, undefined, true);
      const groups = groupByFlipMask(h, 2);
      const sector = compileSector({ weights: [{ lo: 0, hi: -1, weight: 20 }] }, n, 2);
      const [m1, m2, m4] = await Promise.all([1, 2, 4].map((t) => buildProjectedHamiltonianParallel(basis, rowScanPlan(groups, sectorFlipTest(groups, sector)), t)));
      const bytes = (a: ArrayBufferView | undefined): Buffer | undefined => (a ? Buffer.from(a.buffer, a.byteOffset, a.byteLength) : undefined);
      for (const m of [m2!, m4!]) {
        for (const key of ['diag', 'rowPtr', 'cols', 'codes', 'table', 'values'] as const) {
          expect(bytes(m[key])?.toString('hex'), key).toEqual(bytes(m1![key])?.toString('hex'));
        }
      }
    });
  }

  it('locality and lengths builds (rows renumbered while assembling) are byte for byte sortRowsByLength of reorderForLocality or of the basis-order build, on 1, 2 and 4 threads (sampled Heisenberg torus)', async () => {
    // 36-qubit Heisenberg torus, 26000 sampled configurations: the build goes to worker threads.
    const { writeBenchCase } = (await import(join(process.cwd(), 'dist/bench/cases.js'))) as typeof import('../../bench/cases.js');
    const { hamiltonian, samples } = writeBenchCase(tempDir('bitspan-locality-'), { side: 6, distinct: 26000, seed: 3 });
    const h = await readHamiltonian(hamiltonian);
    const sector = { weights: [{ lo: 0, hi: -1, weight: 18 }] };
    const { basis } = selectSubspace(await readSamples([samples]), { sector, shared: true });
    const groups = groupByFlipMask(h, basis.nWords);
    const plan = rowScanPlan(groups, sectorFlipTest(groups, compileSector(sector, basis.qubits, basis.nWords)));
    const plain = await buildProjectedHamiltonianParallel(basis, plan, 1);
    // The memory plan's estimate of upper entries per row (sampled blocks) is close to the built count.
    const perRow = plain.rowPtr[plain.dim]! / 2 / plain.dim;
    expect(Math.abs(upperPerRowEstimate(basis, plan) - perRow)).toBeLessThan(0.1 * perRow);
    const bfs = reorderForLocality(plain);
    const bytes = (a: ArrayBufferView | undefined): Buffer | undefined => (a ? Buffer.from(a.buffer, a.byteOffset, a.byteLength) : undefined);
    for (const [opts, want] of [
      [{ locality: true }, sortRowsByLength(bfs)],
      [{ lengths: true }, sortRowsByLength(plain)],
    ] as const) {
      for (const threads of [1, 2, 4]) {
        const got: StoredHamiltonian = await buildProjectedHamiltonianParallel(basis, plan, threads, opts);
        for (const key of ['diag', 'rowPtr', 'cols', 'codes', 'table', 'values', 'order'] as const) {
          const [g, w] = [bytes(got[key]), bytes(want[key])];
          expect(g === undefined ? w === undefined : w !== undefined && g.equals(w), `${key}, ${threads} threads, ${JSON.stringify(opts)}`).toBe(true);
        }
        // Rows ascend in length within each window of LENGTH_WINDOW storage rows (several windows here).
        let descents = 0;
        for (let i = 1; i < got.dim; i++) if (i % LENGTH_WINDOW !== 0 && got.rowPtr[i + 1]! - got.rowPtr[i]! < got.rowPtr[i]! - got.rowPtr[i - 1]!) descents++;
        expect(descents).toBe(0);
      }
    }
    const want = bfs;
    // Independently of reorderForLocality: in a breadth-first numbering every row after the first
    // of its component has a neighbour numbered before it, and these parents (each row's smallest
    // neighbour) never decrease along the order (standard property of BFS / Cuthill–McKee orders).
    const { rowPtr, cols, dim } = want;
    expect(dim).toBeGreaterThan(20000);
    let lastParent = -1;
    let roots = 0;
    let decreases = 0;
    for (let i = 0; i < dim; i++) {
      let parent = i;
      for (let e = rowPtr[i]!; e < rowPtr[i + 1]!; e++) parent = Math.min(parent, cols[e]!);
      if (parent === i) {
        roots++;
        continue;
      }
      if (parent < lastParent) decreases++;
      lastParent = parent;
    }
    expect(decreases).toBe(0);
    // One tree per connected component: count those with union–find over the entries.
    const parentOf = Int32Array.from({ length: dim }, (_, i) => i);
    const find = (x: number): number => {
      while (parentOf[x] !== x) x = parentOf[x] = parentOf[parentOf[x]!]!;
      return x;
    };
    let components = dim;
    for (let i = 0; i < dim; i++) {
      for (let e = rowPtr[i]!; e < rowPtr[i + 1]!; e++) {
        const [a, b] = [find(i), find(cols[e]!)];
        if (a !== b) {
          parentOf[a] = b;
          components--;
        }
      }
    }
    expect(roots).toBe(components);
    expect(components).toBeLessThan(dim);
  });

  it('above SLAB_MIN_DIM (pieces and assembly scratch carved from slabs) every build and storage order is the plain CSR build of the same matrix, on 1 and 2 threads', async () => {
    // 36-qubit Heisenberg torus with more sampled configurations than SLAB_MIN_DIM.
    const { writeBenchCase } = (await import(join(process.cwd(), 'dist/bench/cases.js'))) as typeof import('../../bench/cases.js');
    const { hamiltonian, samples } = writeBenchCase(tempDir('bitspan-slabs-'), { side: 6, distinct: SLAB_MIN_DIM + 10000, seed: 4 });
    const h = await readHamiltonian(hamiltonian);
    const sector = { weights: [{ lo: 0, hi: -1, weight: 18 }] };
    const { basis } = selectSubspace(await readSamples([samples]), { sector, shared: true });
    expect(basis.dim).toBeGreaterThanOrEqual(SLAB_MIN_DIM);
    const groups = groupByFlipMask(h, basis.nWords);
    const compiled = compileSector(sector, basis.qubits, basis.nWords);
    const plan = rowScanPlan(groups, sectorFlipTest(groups, compiled));
    // Reference: the one-piece CSR builder, which uses no slabs.
    const want = buildProjectedHamiltonian(basis, groups, compiled);
    const same = (a: ArrayLike<number>, b: ArrayLike<number>): boolean => a.length === b.length && Array.prototype.every.call(a, (v: number, i: number) => v === b[i]);
    for (const threads of [1, 2]) {
      for (const opts of [{}, { lengths: true }, { locality: true }]) {
        const got = toSparseMatrix(await buildProjectedHamiltonianParallel(basis, plan, threads, opts));
        const what = `${threads} threads, ${JSON.stringify(opts)}`;
        expect(same(got.rowPtr, want.rowPtr), `rowPtr, ${what}`).toBe(true);
        expect(same(got.cols, want.cols), `cols, ${what}`).toBe(true);
        expect(same(got.values, want.values), `values, ${what}`).toBe(true);
      }
    }
  });

  it('projectAndSolve gives the same energies to 1e-10 for 1, 2 and 4 threads, stored and matrix-free', async () => {
    const { h, n, states, dim } = problem(true, 6000);
    const basis = makeBasis(n, 2, states, dim, undefined, true);
    const sector = { weights: [{ lo: 0, hi: -1, weight: 20 }] };
    const runs = [];
    for (const threads of [1, 2, 4]) runs.push(await projectAndSolve(h, basis, sector, { eigs: 2, threads, tol: 1e-11 }));
    for (const threads of [1, 2]) runs.push(await projectAndSolve(h, basis, sector, { eigs: 1, threads, tol: 1e-11, matrixFree: true }));
    expect(runs[3]!.plan.storage).toBe('matrix-free');
    for (const r of runs.slice(1)) expect(Math.abs(r.eigen.values[0]! - runs[0]!.eigen.values[0]!)).toBeLessThan(1e-10);
    for (const r of runs.slice(1, 3)) expect(Math.abs(r.eigen.values[1]! - runs[0]!.eigen.values[1]!)).toBeLessThan(1e-10);
  });

  it('projectAndSolve on a renumbered matrix (reorderFromDim) gives the energy and ground state of the basis-order solve', async () => {
    const { h, n, states, dim } = problem(false, 60000);
    const basis = makeBasis(n, 2, states, dim, undefined, true);
    const sector = { weights: [{ lo: 0, hi: -1, weight: 20 }] };
    const renumbered = await projectAndSolve(h, basis, sector, { threads: 2, tol: 1e-11, reorderFromDim: 50000 });
    expect(renumbered.matrix!.order).toBeInstanceOf(Int32Array);
    // Reference: the plain CSR matrix in basis order, solved on this thread.
    const plain = projectAndSolveSync(h, basis, sector, { tol: 1e-11 });
    expect(Math.abs(renumbered.eigen.values[0]! - plain.eigen.values[0]!)).toBeLessThan(1e-9);
    const a = renumbered.eigen.vectors[0]!;
    const b = plain.eigen.vectors[0]!;
    let overlap = 0;
    for (let i = 0; i < a.length; i++) overlap += a[i]! * b[i]!;
    expect(Math.abs(Math.abs(overlap) - 1)).toBeLessThan(1e-8);
    // One thread renumbers by default at this size (REORDER_MIN_DIM); same ground state.
    const single = await projectAndSolve(h, basis, sector, { threads: 1, tol: 1e-11 });
    expect(single.matrix!.order).toBeInstanceOf(Int32Array);
    expect(Math.abs(single.eigen.values[0]! - plain.eigen.values[0]!)).toBeLessThan(1e-9);
    const c = single.eigen.vectors[0]!;
    let overlap1 = 0;
    for (let i = 0; i < c.length; i++) overlap1 += c[i]! * b[i]!;
    expect(Math.abs(Math.abs(overlap1) - 1)).toBeLessThan(1e-8);
  });
});
