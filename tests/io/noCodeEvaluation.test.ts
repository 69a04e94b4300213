import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { BitspanError } from '../../src/errors.js';
import { parseCoefficient } from '../../src/io/hamiltonianText.js';
import { parseCount } from '../../src/io/lines.js';

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    return statSync(p).isDirectory() ? sources(p) : p.endsWith('.ts') ? [p] : [];
  });
}

describe('no input is evaluated as code', () => {
  it('src/ and workers/ contain no eval, new Function or string timers', () => {
    const offenders: string[] = [];
    for (const file of [...sources('src'), ...sources('workers')]) {
      const text = readFileSync(file, 'utf8');
      if (/\beval\s*\(|new\s+Function\s*\(|\bFunction\s*\(\s*['"`]|set(Timeout|Interval)\s*\(\s*['"`]|\bvm\.run|from 'node:vm'/.test(text)) offenders.push(file);
    }
    expect(offenders).toEqual([]);
  });

  it('parseCoefficient reads decimals only: 1e3 is a number, 0x10, 1/2, Math.PI and friends are refused', () => {
    expect(parseCoefficient('1e3', 'h.txt', 1)).toBe(1000);
    expect(parseCoefficient('-.5', 'h.txt', 1)).toBe(-0.5);
    expect(parseCoefficient('+2.50E-1', 'h.txt', 1)).toBe(0.25);
    for (const text of ['0x10', '0b1', '0o7', '1/2', 'Math.PI', 'pi', '2**3', '1_000', 'NaN', 'Infinity', '1e400', '(1)', '1,5', '١', 'process.exit(1)', '${1}']) {
      let code = 'no error';
      try {
        parseCoefficient(text, 'h.txt', 4);
      } catch (e) {
        expect(e).toBeInstanceOf(BitspanError);
        code = (e as BitspanError).code;
        expect((e as BitspanError).line).toBe(4);
      }
      expect(code, text).toBe('bad-hamiltonian');
    }
  });

  it('parseCount reads non-negative decimals only', () => {
    expect(parseCount('12', 's.csv', 2)).toBe(12);
    expect(parseCount('2.5e1', 's.csv', 2)).toBe(25);
    for (const text of ['-1', '0x10', '1/2', 'Infinity', 'NaN', '1e400', '', ' ', '1_0']) {
      expect(() => parseCount(text, 's.csv', 2), text).toThrow(BitspanError);
    }
  });
});
