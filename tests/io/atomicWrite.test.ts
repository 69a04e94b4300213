import { describe, expect, it } from 'vitest';
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { removePendingTemps, watchPendingTemps, writeFileAtomic } from '../../src/io/atomicWrite.js';
import { BitspanError } from '../../src/errors.js';
import { tempDir } from '../helpers.js';

describe('writeFileAtomic', () => {
  it('watchPendingTemps reports the temporary file when it starts and when it is renamed into place', async () => {
    const dir = tempDir();
    const out = join(dir, 'r.json');
    const seen: Array<[string, boolean]> = [];
    watchPendingTemps((tmp, pending) => seen.push([tmp, pending]));
    try {
      await writeFileAtomic(out, 'new\n');
    } finally {
      watchPendingTemps(undefined);
    }
    expect(seen).toHaveLength(2);
    const [[tmp, first], [same, second]] = seen as [[string, boolean], [string, boolean]];
    expect([first, second, same]).toEqual([true, false, tmp]);
    expect(dirname(tmp)).toBe(dir);
    expect(basename(tmp)).toMatch(/^\.r\.json\.tmp-/);
    expect(existsSync(tmp)).toBe(false);
    expect(readFileSync(out, 'utf8')).toBe('new\n');
  });

  it('writeFileAtomic leaves the earlier file untouched when the write fails', async () => {
    const dir = tempDir();
    const out = join(dir, 'r.json');
    writeFileSync(out, 'earlier\n');
    // A folder where the temporary file should go that does not exist: the rename never happens.
    const err = await writeFileAtomic(join(dir, 'missing', 'r.json'), 'x').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(BitspanError);
    expect((err as BitspanError).code).toBe('output-unwritable');
    expect(readFileSync(out, 'utf8')).toBe('earlier\n');
    removePendingTemps();
    expect(readdirSync(dir)).toEqual(['r.json']);
  });
});
