import { describe, expect, it } from 'vitest';
import { initialConfiguration } from '../../src/sim/initialState.js';
import { BitspanError } from '../../src/errors.js';

describe('initialConfiguration', () => {
  it('initialConfiguration names simple states with qubit 0 as the lowest bit', () => {
    expect(initialConfiguration('neel', 6).toString(2)).toBe('101010');
    expect(initialConfiguration('neel-even', 6).toString(2)).toBe('10101');
    expect(initialConfiguration('zeros', 5)).toBe(0);
    expect(initialConfiguration('ones', 5)).toBe(31);
    expect(initialConfiguration('half', 6)).toBe(0b000111);
    // A bitstring is read with qubit 0 rightmost, as solve reads dumps.
    expect(initialConfiguration('0011', 4)).toBe(3);
  });

  it('initialConfiguration refuses malformed or mis-sized bitstrings with bad-argument', () => {
    for (const spec of ['01a1', '010', 'nell']) {
      try {
        initialConfiguration(spec, 4);
        expect.unreachable();
      } catch (e) {
        expect((e as BitspanError).code).toBe('bad-argument');
      }
    }
  });
});
