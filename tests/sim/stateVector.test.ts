import { describe, expect, it } from 'vitest';
import { checkStateFits, createState, normSquared } from '../../src/sim/stateVector.js';
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
