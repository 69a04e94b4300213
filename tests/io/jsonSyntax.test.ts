import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { jsonPathLine } from '../../src/io/jsonSyntax.js';

const MARK = '@@value-here@@';

/** A random JSON document and a path to one of its values (object keys or array indices). */
const docWithPath = fc
  .letrec<{ value: unknown }>((tie) => ({
    value: fc.oneof(
      { maxDepth: 4 },
      fc.oneof(fc.integer(), fc.string({ maxLength: 6 }), fc.constant(null), fc.boolean()),
      fc.array(tie('value'), { minLength: 1, maxLength: 4 }),
      fc.dictionary(fc.string({ maxLength: 4 }), tie('value'), { minKeys: 1, maxKeys: 4 }),
    ),
  }))
  .value.chain((doc) => {
    // Walk down a random number of steps to pick a path.
    const paths: Array<Array<string | number>> = [[]];
    const walk = (v: unknown, path: Array<string | number>): void => {
      if (Array.isArray(v)) v.forEach((x, i) => (paths.push([...path, i]), walk(x, [...path, i])));
      else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) (paths.push([...path, k]), walk(x, [...path, k]));
    };
    walk(doc, []);
    return fc.tuple(fc.constant(doc), fc.constantFrom(...paths), fc.constantFrom(0, 1, 2, '\t'));
  });

function replaceAt(doc: unknown, path: Array<string | number>, value: unknown): unknown {
  if (path.length === 0) return value;
  const [head, ...rest] = path;
  if (Array.isArray(doc)) return doc.map((x, i) => (i === head ? replaceAt(x, rest, value) : x));
  // fromEntries keeps a key such as "__proto__" an own property.
  return Object.fromEntries(Object.entries(doc as Record<string, unknown>).map(([k, x]) => [k, k === head ? replaceAt(x, rest, value) : x]));
}

describe('jsonPathLine', () => {
  it('jsonPathLine finds the line where JSON.stringify put the value at a path', () => {
    fc.assert(
      fc.property(docWithPath, ([doc, path, indent]) => {
        // The independent expectation: put a marker at the path and look for the line holding it.
        const marked = JSON.stringify(replaceAt(doc, path, MARK), null, indent);
        const want = marked.split('\n').findIndex((l) => l.includes(MARK)) + 1;
        expect(jsonPathLine(marked, path)).toBe(want);
      }),
      { seed: 17, numRuns: 300 },
    );
  });

  it('jsonPathLine gives undefined for a path that is not there, and takes the last of repeated keys', () => {
    expect(jsonPathLine('{"a": [1, 2]}', ['a', 5])).toBeUndefined();
    expect(jsonPathLine('{"a": 1}', ['b'])).toBeUndefined();
    expect(jsonPathLine('[1]', ['a'])).toBeUndefined();
    expect(jsonPathLine('{"a": 1,\n"a": 2}', ['a'])).toBe(2);
    expect(jsonPathLine('\ufeff\n\n{"a": "x\\"\\n,}"\n, "b": 3}', ['b'])).toBe(4);
  });
});
