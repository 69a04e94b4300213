import { describe, expect, it } from 'vitest';
import { makeBasis } from '../../src/bits/basis.js';
import { basisIndexOf } from '../../src/bits/basis.js';
import { buildProductSpace, planProductSpace } from '../../src/sectors/productSpace.js';

/** 2M-qubit determinant from spin-up and spin-down strings (M = 4). */
const det = (up: number, down: number): number => up | (down << 4);

describe('planProductSpace', () => {
  it('planProductSpace / buildProductSpace: every sampled spin-up string with every sampled spin-down string, counts kept', () => {
    // 2 spin-up + 1 spin-down electrons: no symmetrisation (different counts).
    const sampled = [det(0b0011, 0b0001), det(0b0101, 0b0010), det(0b0011, 0b1000)];
    const basis = makeBasis(8, 1, Uint32Array.from(sampled), 3, Float64Array.from([5, 3, 2]));
    const plan = planProductSpace(basis, 4);
    expect(plan.symmetric).toBe(false);
    expect([plan.alphaStrings, plan.betaStrings, plan.dimension]).toEqual([2, 3, 6]);
    const product = buildProductSpace(plan, basis);
    expect(product.dim).toBe(6);
    for (const up of [0b0011, 0b0101]) {
      for (const down of [0b0001, 0b0010, 0b1000]) {
        const at = basisIndexOf(product, Uint32Array.of(det(up, down)));
        expect(at).toBeGreaterThanOrEqual(0);
        const was = sampled.indexOf(det(up, down));
        expect(product.counts[at]).toBe(was >= 0 ? [5, 3, 2][was] : 0);
      }
    }
  });

  it('planProductSpace uses the union of both spins when their electron counts match, so spin exchange maps the space to itself', () => {
    const basis = makeBasis(8, 1, Uint32Array.from([det(0b0011, 0b0101), det(0b0110, 0b0011)]), 2);
    const plan = planProductSpace(basis, 4);
    expect(plan.symmetric).toBe(true);
    expect([plan.alphaStrings, plan.betaStrings, plan.dimension]).toEqual([3, 3, 9]);
    const product = buildProductSpace(plan, basis);
    for (let i = 0; i < product.dim; i++) {
      const x = product.states[i]!;
      const swapped = ((x & 0xf) << 4) | (x >>> 4);
      expect(basisIndexOf(product, Uint32Array.of(swapped))).toBeGreaterThanOrEqual(0);
    }
  });
});
