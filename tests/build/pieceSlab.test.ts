import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PieceSlab, SLAB_BYTES } from '../../src/build/pieceSlab.js';

describe('PieceSlab', () => {
  it('PieceSlab hands out zeroed, 8-byte aligned regions that never overlap, each a view of the asked length', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.constantFrom('int32', 'uint32', 'float64'), fc.integer({ min: 0, max: 600_000 })), { minLength: 1, maxLength: 30 }), (asks) => {
        const slab = new PieceSlab();
        const taken: Array<{ buffer: ArrayBufferLike; start: number; end: number }> = [];
        for (const [kind, length] of asks) {
          const view = kind === 'int32' ? slab.int32(length) : kind === 'uint32' ? slab.uint32(length) : slab.float64(length);
          expect(view.length).toBe(length);
          expect(view.buffer).toBeInstanceOf(SharedArrayBuffer);
          expect(view.byteOffset % 8).toBe(0);
          expect(view.every((v) => v === 0)).toBe(true);
          // Mark the region, so a later overlapping region would not read as zeroed.
          view.fill(1);
          taken.push({ buffer: view.buffer, start: view.byteOffset, end: view.byteOffset + view.byteLength });
        }
        for (let i = 0; i < taken.length; i++) {
          for (let j = 0; j < i; j++) {
            const [a, b] = [taken[i]!, taken[j]!];
            if (a.buffer === b.buffer) expect(a.end <= b.start || b.end <= a.start).toBe(true);
          }
        }
      }),
      { numRuns: 25, seed: 51 },
    );
  });

  it('PieceSlab gives a region larger than a slab a buffer of its own, and fills slabs before starting new ones', () => {
    const slab = new PieceSlab();
    const big = slab.float64(SLAB_BYTES / 8 + 1);
    expect(big.buffer.byteLength).toBeGreaterThan(SLAB_BYTES);
    const a = slab.int32(1000);
    const b = slab.int32(1000);
    expect(b.buffer).toBe(a.buffer);
    expect(a.buffer.byteLength).toBe(SLAB_BYTES);
    // What no longer fits goes to a new slab.
    const c = slab.float64(SLAB_BYTES / 8 - 100);
    expect(c.buffer).not.toBe(a.buffer);
  });
});
