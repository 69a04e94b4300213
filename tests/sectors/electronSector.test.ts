import { describe, expect, it } from 'vitest';
import { electronSector, electronsFromHeader, parseElectrons } from '../../src/sectors/electronSector.js';

describe('electronSector', () => {
  it('electronSector puts spin-up on qubits 0..M−1 and spin-down on M..2M−1', () => {
    expect(electronSector(5, 3, 2).weights).toEqual([
      { lo: 0, hi: 4, weight: 3 },
      { lo: 5, hi: 9, weight: 2 },
    ]);
    expect(() => electronSector(2, 3, 0)).toThrow(expect.objectContaining({ code: 'bad-argument' }));
  });

  it('parseElectrons reads A,B and refuses anything else', () => {
    expect(parseElectrons('5,4')).toEqual([5, 4]);
    expect(parseElectrons(' 1 , 0 ')).toEqual([1, 0]);
    for (const bad of ['5', '5,4,3', 'a,b', '-1,2', '1.5,1']) expect(() => parseElectrons(bad)).toThrow(expect.objectContaining({ code: 'bad-argument' }));
  });

  it('electronsFromHeader splits NELEC by MS2 (N↑ − N↓ = MS2, FCIDUMP convention)', () => {
    expect(electronsFromHeader(10, 0, 'f')).toEqual([5, 5]);
    expect(electronsFromHeader(7, 1, 'f')).toEqual([4, 3]);
    expect(electronsFromHeader(7, -1, 'f')).toEqual([3, 4]);
    for (const [n, ms2] of [[undefined, 0], [7, 0], [2, 4]] as const) expect(() => electronsFromHeader(n, ms2, 'f')).toThrow(expect.objectContaining({ code: 'bad-argument' }));
  });
});
