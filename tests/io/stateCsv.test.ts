import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { makeBasis } from '../../src/bits/basis.js';
import { formatStateCsv, readStateCsv } from '../../src/io/stateCsv.js';
import { stateOnBasis } from '../../src/analysis/stateOnBasis.js';
import { tempDir } from '../helpers.js';

describe('formatStateCsv', () => {
  it('formatStateCsv and readStateCsv round-trip amplitudes exactly, most probable first', async () => {
    const basis = makeBasis(5, 1, Uint32Array.from([3, 17, 8, 30]), 4);
    const psi = Float64Array.from([0.1, -0.2, 0.3, 0.4, -0.5, 0.6, 0.05, -0.11]);
    const text = formatStateCsv(basis, psi, true);
    const lines = text.trim().split('\n');
    expect(lines[0]).toBe('bitstring,re,im,probability');
    const probs = lines.slice(1).map((l) => Number(l.split(',')[3]));
    expect(probs).toEqual([...probs].sort((a, b) => b - a));
    const dir = tempDir();
    const f = join(dir, 's.csv');
    writeFileSync(f, text);
    const back = await readStateCsv(f);
    expect(back.count).toBe(4);
    const v = stateOnBasis(back, basis, true)!;
    expect(Array.from(v)).toEqual(Array.from(psi));
  });

  it('readStateCsv refuses a file without amplitude columns (bad-state)', async () => {
    const dir = tempDir();
    const f = join(dir, 's.csv');
    writeFileSync(f, 'bitstring,count\n0101,3\n');
    await expect(readStateCsv(f)).rejects.toMatchObject({ code: 'bad-state', line: 1 });
    writeFileSync(f, 'bitstring,re\n0101,abc\n');
    await expect(readStateCsv(f)).rejects.toMatchObject({ code: 'bad-state', line: 2 });
  });
});
