import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { BitspanError } from '../../src/errors.js';
import { errorOf } from '../helpers.js';
import { parseJsonWithLines } from '../../src/io/jsonWithLines.js';

const parse = (text: string) => parseJsonWithLines(text, 'm.json', 'bad-manifest');

/** True when our parser's only objection is a repeated key (JSON.parse keeps the last one instead). */
function hasDuplicateKey(text: string): boolean {
  try {
    parse(text);
    return false;
  } catch (e) {
    return e instanceof BitspanError && /appears twice/.test(e.message);
  }
}

describe('parseJsonWithLines', () => {
  it('parseJsonWithLines agrees with JSON.parse (the reference) on documents JSON.stringify writes', () => {
    fc.assert(
      fc.property(fc.jsonValue(), fc.constantFrom(undefined, 2, '\t'), (v, indent) => {
        const text = JSON.stringify(v, null, indent);
        expect(parse(text).value).toStrictEqual(JSON.parse(text));
      }),
      { seed: 6, numRuns: 300 },
    );
  });

  it('parseJsonWithLines accepts exactly what JSON.parse accepts, on mangled documents', () => {
    // Mutations of valid JSON hit the edges: truncation, stray characters, bad escapes.
    const mangled = fc
      .tuple(fc.jsonValue(), fc.nat(), fc.constantFrom('', ',', '}', ']', '"', '\\', '\n', '01', '-', '1e', 'tru', '\u0001', '\ufeff'))
      .map(([v, at, ins]) => {
        const t = JSON.stringify(v, null, 1);
        const i = at % (t.length + 1);
        return t.slice(0, i) + ins + t.slice(i + (at % 3 === 0 ? 1 : 0));
      });
    fc.assert(
      fc.property(mangled, (text) => {
        let ref: { ok: true; value: unknown } | { ok: false };
        try {
          ref = { ok: true, value: JSON.parse(text) };
        } catch {
          ref = { ok: false };
        }
        let ours: { ok: true; value: unknown } | { ok: false; code: string };
        try {
          ours = { ok: true, value: parse(text).value };
        } catch (e) {
          expect(e).toBeInstanceOf(BitspanError);
          ours = { ok: false, code: (e as BitspanError).code };
        }
        // A leading BOM is the one thing we accept that JSON.parse refuses.
        if (text.startsWith('\ufeff')) return;
        if (ref.ok && !hasDuplicateKey(text)) expect(ours).toStrictEqual({ ok: true, value: ref.value });
        if (!ref.ok) expect(ours).toStrictEqual({ ok: false, code: 'bad-manifest' });
      }),
      { seed: 7, numRuns: 1000 },
    );
  });

  it('parseJsonWithLines never throws anything but BitspanError on random text', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 200 }), (text) => {
        try {
          parse(text);
        } catch (e) {
          expect(e).toBeInstanceOf(BitspanError);
          expect((e as BitspanError).line).toBeGreaterThanOrEqual(1);
        }
      }),
      { seed: 8, numRuns: 1000 },
    );
  });

  it('parseJsonWithLines gives the line of each value and of each object member', () => {
    const doc = parse('{\n  "jobs": [\n    {"name": "a"},\n    {\n      "name": "b",\n      "maxDim": 5\n    }\n  ]\n}\n');
    expect(doc.lineOf([])).toBe(1);
    expect(doc.lineOf(['jobs'])).toBe(2);
    expect(doc.lineOf(['jobs', 0, 'name'])).toBe(3);
    expect(doc.lineOf(['jobs', 1])).toBe(4);
    expect(doc.lineOf(['jobs', 1, 'maxDim'])).toBe(6);
    // A path that does not exist falls back to its nearest ancestor.
    expect(doc.lineOf(['jobs', 1, 'nothing'])).toBe(4);
  });

  it('parseJsonWithLines reports the line of a syntax error', () => {
    const e = errorOf(() => parse('{\n  "a": 1,\n  "b": 2\n  "c": 3\n}'));
    expect(e.code).toBe('bad-manifest');
    expect(e.line).toBe(4);
    expect(e.file).toBe('m.json');
  });

  it('parseJsonWithLines refuses duplicate keys and keeps __proto__ an ordinary key', () => {
    expect(errorOf(() => parse('{"a": 1,\n"a": 2}')).line).toBe(2);
    const v = parse('{"__proto__": {"polluted": true}}').value as Record<string, unknown>;
    expect(Object.getPrototypeOf(v)).toBe(Object.prototype);
    expect(Object.keys(v)).toEqual(['__proto__']);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it('parseJsonWithLines refuses nesting deeper than 200 levels instead of overflowing the stack', () => {
    expect(errorOf(() => parse('['.repeat(100_000))).code).toBe('bad-manifest');
    expect(parse('['.repeat(150) + ']'.repeat(150)).value).toBeInstanceOf(Array);
  });
});
