import { describe, expect, it } from 'vitest';
import { checkStateFits, createState, innerProduct, normSquared } from '../../src/sim/stateVector.js';
import { BitspanError } from '../../src/errors.js';

describe('checkStateFits', () => {
  it('checkStateFits refuses registers that cannot fit with too-large and says what fits', () => {
    try {
      checkStateFits(34, 7, 'exact evolution');
      expect.unreachable();
    } catch (e) {
      expect((e as BitspanError).code).toBe('too-large');
      expect((e as BitspanError).hint).toMatch(/at most \d+ qubits/);
    }
    expect(() => checkStateFits(12, 7, 'exact evolution')).not.toThrow();
  });
});

describe('createState', () => {
  it('createState allocates a zero state, shared when asked', () => {
    const s = createState(4, true);
    expect(s.dim).toBe(16);
    expect(s.re.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(normSquared(s)).toBe(0);
  });
});

describe('innerProduct', () => {
  it('innerProduct conjugates its first argument: ⟨a|b⟩ = conj⟨b|a⟩, ⟨a|a⟩ = ‖a‖²', () => {
    const a = createState(2);
    const b = createState(2);
    a.re[1] = 0.6;
    a.im[1] = 0.8;
    b.re[1] = 1;
    b.im[2] = 1;
    expect(innerProduct(a, b)).toEqual([0.6, -0.8]);
    expect(innerProduct(b, a)).toEqual([0.6, 0.8]);
    expect(innerProduct(a, a)[0]).toBeCloseTo(normSquared(a), 15);
  });
});
