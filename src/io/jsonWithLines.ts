import { BitspanError, type BitspanErrorCode } from '../errors.js';

/** A path into a JSON document: object keys and array indices, e.g. `['jobs', 3, 'maxDim']`. */
export type JsonPath = ReadonlyArray<string | number>;

/** A parsed document and the 1-based line where each value (or object member) starts. */
export interface JsonWithLines {
  value: unknown;
  /** Line of the value at `path`, or of its nearest ancestor that has one. */
  lineOf(path: JsonPath): number | undefined;
}

/** Deeper nesting than this is refused rather than risking the call stack on hostile input. */
const MAX_DEPTH = 200;

/**
 * Parse strict JSON (RFC 8259) and remember the line of every value, so errors found later can
 * point at the line. Duplicate keys are refused (JSON.parse would keep the last one silently); a
 * leading byte-order mark is skipped.
 * @throws BitspanError with `code`, the file and the line of the first syntax error
 */
export function parseJsonWithLines(text: string, file: string, code: BitspanErrorCode): JsonWithLines {
  const lines = new Map<string, number>();
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;

  const fail = (what: string, hint = 'check brackets, commas and quotes'): never => {
    throw new BitspanError(code, `invalid JSON: ${what}`, hint, { file, line });
  };
  const found = (): string => (pos >= text.length ? 'end of file' : JSON.stringify(text.slice(pos, pos + 12)));

  const skipSpace = (): void => {
    for (;;) {
      const c = text.charCodeAt(pos);
      if (c === 0x0a) line++;
      else if (c !== 0x20 && c !== 0x09 && c !== 0x0d) return;
      pos++;
    }
  };

  const parseString = (): string => {
    // pos is on the opening quote.
    pos++;
    let out = '';
    let start = pos;
    for (;;) {
      if (pos >= text.length) fail('a string is not closed');
      const c = text.charCodeAt(pos);
      if (c === 0x22) {
        out += text.slice(start, pos);
        pos++;
        return out;
      }
      if (c < 0x20) fail(c === 0x0a ? 'a string runs past the end of its line' : 'a control character inside a string', 'escape it, e.g. \\n or \\t');
      if (c === 0x5c) {
        out += text.slice(start, pos);
        const e = text[pos + 1];
        const simple: Record<string, string> = { '"': '"', '\\': '\\', '/': '/', b: '\b', f: '\f', n: '\n', r: '\r', t: '\t' };
        if (e !== undefined && simple[e] !== undefined) {
          out += simple[e];
          pos += 2;
        } else if (e === 'u' && /^[0-9a-fA-F]{4}$/.test(text.slice(pos + 2, pos + 6))) {
          out += String.fromCharCode(parseInt(text.slice(pos + 2, pos + 6), 16));
          pos += 6;
        } else {
          fail(`bad escape ${JSON.stringify(text.slice(pos, pos + 2))} in a string`, 'use \\", \\\\, \\n, \\t or \\uXXXX');
        }
        start = pos;
        continue;
      }
      pos++;
    }
  };

  const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;

  const parseValue = (path: Array<string | number>, depth: number): unknown => {
    skipSpace();
    if (depth > MAX_DEPTH) fail(`nesting deeper than ${MAX_DEPTH} levels`, 'flatten the document');
    lines.set(JSON.stringify(path), line);
    const c = text[pos];
    if (c === '{') {
      pos++;
      const obj: Record<string, unknown> = {};
      skipSpace();
      if (text[pos] === '}') {
        pos++;
        return obj;
      }
      for (;;) {
        skipSpace();
        if (text[pos] !== '"') fail(`expected a quoted key, found ${found()}`);
        const keyLine = line;
        const key = parseString();
        if (Object.prototype.hasOwnProperty.call(obj, key)) fail(`key ${JSON.stringify(key)} appears twice in one object`, 'keep one of them');
        skipSpace();
        if (text[pos] !== ':') fail(`expected ':' after key ${JSON.stringify(key)}, found ${found()}`);
        pos++;
        const childPath = [...path, key];
        // defineProperty: a key named __proto__ must stay an ordinary member, as with JSON.parse.
        Object.defineProperty(obj, key, { value: parseValue(childPath, depth + 1), enumerable: true, writable: true, configurable: true });
        lines.set(JSON.stringify(childPath), keyLine);
        skipSpace();
        if (text[pos] === ',') {
          pos++;
          continue;
        }
        if (text[pos] === '}') {
          pos++;
          return obj;
        }
        fail(`expected ',' or '}' after the value of ${JSON.stringify(key)}, found ${found()}`);
      }
    }
    if (c === '[') {
      pos++;
      const arr: unknown[] = [];
      skipSpace();
      if (text[pos] === ']') {
        pos++;
        return arr;
      }
      for (;;) {
        arr.push(parseValue([...path, arr.length], depth + 1));
        skipSpace();
        if (text[pos] === ',') {
          pos++;
          continue;
        }
        if (text[pos] === ']') {
          pos++;
          return arr;
        }
        fail(`expected ',' or ']' in a list, found ${found()}`);
      }
    }
    if (c === '"') return parseString();
    for (const [word, v] of [['true', true], ['false', false], ['null', null]] as const) {
      if (text.startsWith(word, pos)) {
        pos += word.length;
        return v;
      }
    }
    NUMBER.lastIndex = pos;
    const m = NUMBER.exec(text);
    if (m) {
      pos += m[0].length;
      return Number(m[0]);
    }
    return fail(`expected a value, found ${found()}`);
  };

  const value = parseValue([], 0);
  skipSpace();
  if (pos < text.length) fail(`unexpected ${found()} after the end of the document`);
  return {
    value,
    lineOf(path: JsonPath): number | undefined {
      for (let n = path.length; n >= 0; n--) {
        const l = lines.get(JSON.stringify(path.slice(0, n)));
        if (l !== undefined) return l;
      }
      return undefined;
    },
  };
}
