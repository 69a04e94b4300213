import { describe, expect, it } from 'vitest';
import { outOfMemory } from '../../src/cli/main.js';

function thrown(f: () => unknown): unknown {
  try {
    f();
  } catch (e) {
    return e;
  }
  throw new Error('nothing thrown');
}

describe('outOfMemory', () => {
  it('outOfMemory turns a failed typed-array allocation into a too-large refusal with the helpful options', () => {
    // A real V8 error: a typed array longer than the engine allows.
    const err = outOfMemory(thrown(() => new Float64Array(2 ** 40)));
    expect(err?.code).toBe('too-large');
    expect(err?.hint).toContain('--max-dim');
    expect(err?.hint).toContain('--matrix-free');
  });

  it('outOfMemory leaves other errors alone (they stay internal faults)', () => {
    expect(outOfMemory(thrown(() => (1).toFixed(200)))).toBeUndefined();
    expect(outOfMemory(new TypeError('Array buffer allocation failed'))).toBeUndefined();
    expect(outOfMemory('allocation failed')).toBeUndefined();
  });
});
