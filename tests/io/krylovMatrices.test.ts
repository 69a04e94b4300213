import { describe, expect, it } from 'vitest';
import { BitspanError } from '../../src/errors.js';
import { readKrylovMatrices, type KrylovSource } from '../../src/io/krylovMatrices.js';
import { tempDir, writeFiles } from '../helpers.js';

async function failure(source: KrylovSource): Promise<BitspanError> {
  try {
    await readKrylovMatrices(source);
  } catch (e) {
    if (e instanceof BitspanError) return e;
    throw e;
  }
  throw new Error('expected a BitspanError');
}

const h2 = [[[1, 0], [0.5, -0.25]], [[0.5, 0.25], [2, 0]]];
const s2 = [[[1, 0], [0.1, 0.2]], [[0.1, -0.2], [1, 0]]];

describe('readKrylovMatrices', () => {
  it('readKrylovMatrices reads JSON [re, im] pairs, plain reals and both error shapes', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, {
      'm.json': JSON.stringify({ h: [[1, [0.5, -0.25]], [[0.5, 0.25], 2]], s: s2, hErr: [[0.1, [0.2, 0.3]], [0.2, 0.1]] }),
    });
    const m = await readKrylovMatrices({ matrices: f['m.json']! });
    expect(m.h.n).toBe(2);
    expect(Array.from(m.h.re)).toEqual([1, 0.5, 0.5, 2]);
    expect(Array.from(m.h.im)).toEqual([0, -0.25, 0.25, 0]);
    expect(Array.from(m.s.im)).toEqual([0, 0.2, -0.2, 0]);
    expect(Array.from(m.hErr!.re)).toEqual([0.1, 0.2, 0.2, 0.1]);
    expect(Array.from(m.hErr!.im)).toEqual([0.1, 0.3, 0.2, 0.1]);
    expect(m.sErr).toBeNull();
    expect(m.origins.h.rowLines).toBeNull();
  });

  it('readKrylovMatrices reads CSV re,im pairs with an optional header and comments, same as JSON', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, {
      'm.json': JSON.stringify({ h: h2, s: s2 }),
      'h.csv': 're0,im0,re1,im1\n1,0,0.5,-0.25\n0.5,0.25,2,0\n',
      's.csv': '# overlaps\n\n1,0,0.1,0.2\n0.1,-0.2,1,0\n',
      'se.csv': '0,0.01\n0.01,0\n',
    });
    const fromCsv = await readKrylovMatrices({ h: f['h.csv']!, s: f['s.csv']!, sErr: f['se.csv']! });
    const fromJson = await readKrylovMatrices({ matrices: f['m.json']! });
    expect(fromCsv.h).toEqual(fromJson.h);
    expect(fromCsv.s).toEqual(fromJson.s);
    expect(fromCsv.origins.h.rowLines).toEqual([2, 3]);
    expect(fromCsv.origins.s.rowLines).toEqual([3, 4]);
    expect(Array.from(fromCsv.sErr!.im)).toEqual([0, 0.01, 0.01, 0]);
  });

  it('readKrylovMatrices rejects bad shapes and entries with bad-matrices and the place', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, {
      'ragged.json': JSON.stringify({ h: [[1, 2], [3]], s: [[1, 0], [0, 1]] }),
      'nos.json': JSON.stringify({ h: [[1]] }),
      'size.json': JSON.stringify({ h: [[1]], s: [[1, 0], [0, 1]] }),
      'text.json': JSON.stringify({ h: [['x']], s: [[1]] }),
      'neg.json': JSON.stringify({ h: [[1]], s: [[1]], sErr: [[-1]] }),
      'broken.json': '{"h": [[1]],\n "s": [[1]\n',
      'h.csv': '1,0,2,0\n3,0\n',
      'hbad.csv': '1,0,2,0\n3,0,abc,0\n',
      's.csv': '1,0,0,0\n0,0,1,0\n',
      's3.csv': '1,0,0,0,0,0\n0,0,1,0,0,0\n0,0,0,0,1,0\n',
      'err.csv': '0.1,0.1,0.1\n0.1,0.1,0.1\n',
    });
    const cases: Array<[KrylovSource, string, number | undefined, RegExp]> = [
      [{ matrices: f['ragged.json']! }, 'bad-matrices', undefined, /h\[1\] has 1 entries, expected 2/],
      [{ matrices: f['nos.json']! }, 'bad-matrices', undefined, /"s" is missing/],
      [{ matrices: f['size.json']! }, 'bad-matrices', undefined, /1×1 but "s" is 2×2/],
      [{ matrices: f['text.json']! }, 'bad-matrices', undefined, /h\[0\]\[0\]/],
      [{ matrices: f['neg.json']! }, 'bad-matrices', undefined, /negative/],
      [{ matrices: f['broken.json']! }, 'bad-matrices', 3, /invalid JSON/],
      [{ h: f['h.csv']!, s: f['s.csv']! }, 'bad-matrices', 2, /row 1 has 2 fields/],
      [{ h: f['hbad.csv']!, s: f['s.csv']! }, 'bad-matrices', 2, /'abc' is not a decimal/],
      [{ h: f['s.csv']!, s: f['s3.csv']! }, 'bad-matrices', undefined, /2×2.*3×3/],
      [{ h: f['s.csv']!, s: f['s.csv']!, hErr: f['err.csv']! }, 'bad-matrices', 1, /3 fields/],
      [{ matrices: `${dir}/missing.json` }, 'file-unreadable', undefined, /not found/],
    ];
    for (const [source, code, line, message] of cases) {
      const e = await failure(source);
      expect(e.code, e.message).toBe(code);
      expect(e.message).toMatch(message);
      expect(e.file).toBeDefined();
      if (line !== undefined) expect(e.line).toBe(line);
    }
  });

  it('readKrylovMatrices rejects empty files with file-empty', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'e.json': '', 'h.csv': 're,im\n', 's.csv': '1,0\n' });
    expect((await failure({ matrices: f['e.json']! })).code).toBe('file-empty');
    expect((await failure({ h: f['h.csv']!, s: f['s.csv']! })).code).toBe('file-empty');
  });
});
