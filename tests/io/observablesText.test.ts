import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { readObservables } from '../../src/io/observablesText.js';
import { tempDir } from '../helpers.js';

describe('readObservables', () => {
  it('readObservables keeps one observable per line (no combining) with masks', async () => {
    const dir = tempDir();
    const f = join(dir, 'o.txt');
    writeFileSync(f, '# correlations\n1 Z0 Z1\n1 Z0 Z1\n0.5 X0 Y2\n2\n');
    const r = await readObservables(f);
    expect(r.observables.map((o) => o.ops)).toEqual(['Z0 Z1', 'Z0 Z1', 'X0 Y2', '']);
    const xy = r.observables[2]!;
    expect(xy.x[0]).toBe(0b101);
    expect(xy.z[0]).toBe(0b100);
    expect(xy.line).toBe(4);
  });

  it('readObservables reports bad lines with the file, the line and code bad-observables', async () => {
    const dir = tempDir();
    const f = join(dir, 'o.txt');
    writeFileSync(f, '1 Z0\n1 Q3\n');
    await expect(readObservables(f)).rejects.toMatchObject({ code: 'bad-observables', file: f, line: 2 });
    writeFileSync(f, '1 Z0 Z0\n');
    await expect(readObservables(f)).rejects.toMatchObject({ code: 'bad-observables', line: 1 });
    writeFileSync(f, '# nothing\n');
    await expect(readObservables(f)).rejects.toMatchObject({ code: 'file-empty' });
  });
});
