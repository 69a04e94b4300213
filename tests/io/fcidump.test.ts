import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { BitspanError } from '../../src/errors.js';
import { readFcidump } from '../../src/io/fcidump.js';
import { formatFcidump } from '../../src/io/formatFcidump.js';
import { eriIndex } from '../../src/operators/integrals.js';
import { randomIntegrals } from '../denseFermions.js';
import { tempDir, writeFiles } from '../helpers.js';

const dir = tempDir('bitspan-fcidump-');

async function readText(text: string, name = 'x.fcidump') {
  return readFcidump(writeFiles(dir, { [name]: text })[name]!);
}

async function failure(text: string): Promise<BitspanError> {
  try {
    await readText(text, `bad-${Math.random().toString(36).slice(2)}.fcidump`);
  } catch (e) {
    if (e instanceof BitspanError) return e;
    throw e;
  }
  throw new Error('expected a BitspanError');
}

describe('readFcidump', () => {
  it('readFcidump reads the namelist header and fills the 8-fold symmetric tensor (FCIDUMP conventions, common practice)', async () => {
    const d = await readText(` &FCI NORB=  3,NELEC=4,MS2=0,
  ORBSYM=1,1,2,
  ISYM=1,
 &END
  0.5 1 2 3 1
  0.25D+00 3 3 0 0
 -1.5 1 1 0 0
 -0.75 2 0 0 0
  2.5 0 0 0 0
`);
    const m = 3;
    expect(d.integrals.orbitals).toBe(3);
    expect(d.electrons).toBe(4);
    expect(d.ms2).toBe(0);
    expect(d.orbsym).toEqual([1, 1, 2]);
    expect(d.isym).toBe(1);
    expect(d.integrals.core).toBe(2.5);
    expect(d.integrals.h1[2 * m + 2]).toBe(0.25);
    expect(d.integrals.h1[0]).toBe(-1.5);
    // (12|31) in 1-based chemists' notation = (01|20) 0-based, and its seven partners for real orbitals.
    for (const [p, q, r, s] of [[0, 1, 2, 0], [1, 0, 2, 0], [0, 1, 0, 2], [1, 0, 0, 2], [2, 0, 0, 1], [0, 2, 0, 1], [2, 0, 1, 0], [0, 2, 1, 0]] as const) {
      expect(d.integrals.eri[eriIndex(m, p, q, r, s)]).toBe(0.5);
    }
    let nonzero = 0;
    for (const v of d.integrals.eri) if (v !== 0) nonzero++;
    expect(nonzero).toBe(8);
  });

  it('readFcidump tolerates free formatting: lower case, keys across lines, / terminator, repeat counts, no MS2', async () => {
    const d = await readText(`&fci norb=4,
 nelec=2, orbsym=2*1,
   2*3, isym=1, uhf=.false.
/
 1.0 1 1 1 1
`);
    expect(d.integrals.orbitals).toBe(4);
    expect(d.electrons).toBe(2);
    expect(d.ms2).toBe(0);
    expect(d.orbsym).toEqual([1, 1, 3, 3]);
    expect(d.integralLines).toBe(1);
  });

  it('readFcidump round-trips formatFcidump output exactly (random integrals)', async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 1, max: 4 }), fc.integer({ min: 1, max: 1000 }), async (m, seed) => {
        const ints = randomIntegrals(m, seed);
        const back = await readText(formatFcidump(ints, { electrons: m }), `rt-${m}-${seed}.fcidump`);
        expect(Array.from(back.integrals.h1)).toEqual(Array.from(ints.h1));
        expect(Array.from(back.integrals.eri)).toEqual(Array.from(ints.eri));
        expect(back.integrals.core).toBe(ints.core);
      }),
      { seed: 3, numRuns: 15 },
    );
  });

  const header = ' &FCI NORB=2,NELEC=2,MS2=0, &END\n';
  const bad: Array<[string, string, string, number | undefined]> = [
    ['UHF files', ' &FCI NORB=2,NELEC=2,MS2=0,\n UHF=.TRUE.\n &END\n 1.0 1 1 1 1\n', 'bad-integrals', 2],
    ['a missing header', ' 1.0 1 1 1 1\n', 'bad-integrals', 1],
    ['an unclosed header', ' &FCI NORB=2,NELEC=2,\n 1.0 1 1 1 1\n', 'bad-integrals', 1],
    ['a missing NORB', ' &FCI NELEC=2 &END\n 1.0 1 1 1 1\n', 'bad-integrals', 1],
    ['a non-integer NORB', ' &FCI NORB=2.5 &END\n 1.0 1 1 1 1\n', 'bad-integrals', 1],
    ['too many electrons', ' &FCI NORB=2,NELEC=5 &END\n 1.0 1 1 1 1\n', 'bad-integrals', 1],
    ['ORBSYM of the wrong length', ' &FCI NORB=2,NELEC=2,\n ORBSYM=1,1,1 &END\n 1.0 1 1 1 1\n', 'bad-integrals', 2],
    ['an index above NORB', header + ' 1.0 1 1 1 1\n 0.5 1 3 0 0\n', 'bad-integrals', 3],
    ['a line with four fields', header + ' 1.0 1 1 1\n', 'bad-integrals', 2],
    ['a value that is not a number', header + ' abc 1 1 1 1\n', 'bad-integrals', 2],
    ['an impossible index pattern', header + ' 1.0 1 0 1 0\n', 'bad-integrals', 2],
    ['permutations that disagree', header + ' 0.5 1 2 1 1\n 0.6 2 1 1 1\n', 'bad-integrals', 3],
    ['a header with no integrals', header, 'bad-integrals', 1],
    ['an empty file', '', 'file-empty', undefined],
    ['blank lines only', '\n\n', 'file-empty', undefined],
  ];
  for (const [what, text, code, line] of bad) {
    it(`readFcidump refuses ${what} with code ${code}${line ? ` at line ${line}` : ''}`, async () => {
      const e = await failure(text);
      expect(e.code).toBe(code);
      expect(e.line).toBe(line);
      expect(e.toLine()).not.toMatch(/\n/);
    });
  }

  it('readFcidump refuses a missing file with file-unreadable', async () => {
    await expect(readFcidump(`${dir}/nope.fcidump`)).rejects.toMatchObject({ code: 'file-unreadable' });
  });
});
