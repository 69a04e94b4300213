import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { join, relative, resolve } from 'node:path';
import { BitspanError } from '../../src/errors.js';
import { resolveInside } from '../../src/io/safePath.js';

function codeOf(f: () => unknown): string {
  try {
    f();
    return 'no error';
  } catch (e) {
    if (e instanceof BitspanError) return e.code;
    throw e;
  }
}

describe('resolveInside', () => {
  const folder = resolve('/tmp/bitspan-out');

  it('resolveInside keeps plain names and relative sub-paths inside the folder', () => {
    expect(resolveInside(folder, 'run1.json')).toBe(join(folder, 'run1.json'));
    expect(resolveInside(folder, 'a/b/c.csv')).toBe(join(folder, 'a', 'b', 'c.csv'));
    expect(resolveInside(folder, './x..y.json')).toBe(join(folder, 'x..y.json'));
    expect(resolveInside(folder, 'a/./b.json')).toBe(join(folder, 'a', 'b.json'));
  });

  it('resolveInside refuses names that escape the folder with the caller\'s code and place', () => {
    for (const bad of ['../x', 'a/../../x', '..', '/etc/passwd', '\\\\server\\share', 'C:\\x', 'c:x', 'a\0b', '', '  ', '.', 'a/..', '..\\x']) {
      expect(codeOf(() => resolveInside(folder, bad)), JSON.stringify(bad)).toBe('bad-argument');
    }
    try {
      resolveInside(folder, '../x', 'bad-manifest', { file: 'm.json', line: 3 });
      throw new Error('not refused');
    } catch (e) {
      expect(e).toBeInstanceOf(BitspanError);
      expect([(e as BitspanError).code, (e as BitspanError).file, (e as BitspanError).line]).toEqual(['bad-manifest', 'm.json', 3]);
    }
  });

  it('resolveInside never returns a path outside the folder for any name', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom('..', '.', 'a', 'b..', '/', '\\', '\0', 'x.json', ''), { maxLength: 8 }).map((p) => p.join('')), (name) => {
        let out: string;
        try {
          out = resolveInside(folder, name, 'bad-manifest');
        } catch (e) {
          expect(e).toBeInstanceOf(BitspanError);
          expect((e as BitspanError).code).toBe('bad-manifest');
          return;
        }
        const rel = relative(folder, out);
        expect(rel.length).toBeGreaterThan(0);
        expect(rel.startsWith('..')).toBe(false);
      }),
      { seed: 3, numRuns: 500 },
    );
  });
});
