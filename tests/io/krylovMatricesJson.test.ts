import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { krylovMatricesJson } from '../../src/io/krylovMatricesJson.js';
import { readKrylovMatrices } from '../../src/io/krylovMatrices.js';
import { complexMatrix } from '../../src/solvers/complexMatrix.js';
import { tempDir, writeFiles } from '../helpers.js';

describe('krylovMatricesJson', () => {
  it('krylovMatricesJson round-trips bit for bit through readKrylovMatrices, errors and extra keys included', async () => {
    const n = 3;
    const [h, s, he, se] = [complexMatrix(n), complexMatrix(n), complexMatrix(n), complexMatrix(n)];
    for (let i = 0; i < n * n; i++) {
      // Values whose shortest decimal form has 17 digits, so any rounding would show.
      h.re[i] = Math.PI * (i + 1) / 7;
      h.im[i] = -Math.E / (i + 3);
      s.re[i] = 1 / (i + 1);
      s.im[i] = i === 0 ? -0 : Math.SQRT2 / (i + 10);
      he.re[i] = 1e-3 * (i + 1);
      he.im[i] = 2e-3;
      se.re[i] = 1e-4;
      se.im[i] = 5e-5 * i;
    }
    const text = krylovMatricesJson({ h, s, hErr: he, sErr: se, info: { times: [0, 0.5, 1], matrixShots: 100 } });
    const f = writeFiles(tempDir(), { 'k.json': text });
    const back = await readKrylovMatrices({ matrices: f['k.json']! });
    expect(Array.from(back.h.re)).toEqual(Array.from(h.re));
    expect(Array.from(back.h.im)).toEqual(Array.from(h.im));
    expect(Array.from(back.s.re)).toEqual(Array.from(s.re));
    // −0 is written as 0 (JSON has no negative zero to speak of).
    expect(Array.from(back.s.im)).toEqual(Array.from(s.im).map((x) => (Object.is(x, -0) ? 0 : x)));
    expect(Array.from(back.hErr!.re)).toEqual(Array.from(he.re));
    expect(Array.from(back.sErr!.im)).toEqual(Array.from(se.im));
    // Valid JSON (JSON.parse, the platform's reference parser) with the extra keys after the matrices.
    const doc = JSON.parse(readFileSync(join(f['k.json']!), 'utf8'));
    expect(doc.times).toEqual([0, 0.5, 1]);
    expect(doc.matrixShots).toBe(100);
    expect(doc.h).toHaveLength(n);
  });

  it('krylovMatricesJson omits hErr and sErr when there are none', () => {
    const doc = JSON.parse(krylovMatricesJson({ h: complexMatrix(1), s: complexMatrix(1) }));
    expect(Object.keys(doc)).toEqual(['h', 's']);
  });
});
