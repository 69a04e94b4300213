import { BitspanError, type BitspanErrorCode } from '../errors.js';

/**
 * Parse JSON text, and on a syntax error throw a BitspanError with the 1-based line of the first
 * offending character (Node's own message carries no position on every version).
 */
export function parseJsonLocated(text: string, file: string, code: BitspanErrorCode, hint: string): unknown {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  try {
    return JSON.parse(body);
  } catch (e) {
    const at = firstSyntaxError(body);
    const line = body.slice(0, at).split('\n').length;
    const near = body.slice(at, at + 20).replace(/\s+/g, ' ');
    const what = at >= body.length ? 'JSON ends early' : `invalid JSON near '${near}'`;
    throw new BitspanError(code, what, hint, { file, line });
  }
}

/** Offset of the first character where a strict JSON reader must stop (text.length if it ends early). */
export function firstSyntaxError(text: string): number {
  let i = 0;
  const ws = (): void => {
    while (i < text.length && ' \t\r\n'.includes(text[i]!)) i++;
  };
  const fail = (): never => {
    throw i;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') {
        i++;
        return;
      }
      for (;;) {
        ws();
        if (text[i] !== '"') fail();
        string();
        ws();
        if (text[i] !== ':') fail();
        i++;
        value();
        ws();
        if (text[i] === ',') i++;
        else if (text[i] === '}') {
          i++;
          return;
        } else fail();
      }
    } else if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') {
        i++;
        return;
      }
      for (;;) {
        value();
        ws();
        if (text[i] === ',') i++;
        else if (text[i] === ']') {
          i++;
          return;
        } else fail();
      }
    } else if (c === '"') string();
    else if (c !== undefined && /[-0-9]/.test(c)) {
      const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i, i + 400));
      if (!m) fail();
      i += m![0].length;
    } else {
      for (const lit of ['true', 'false', 'null']) {
        if (text.startsWith(lit, i)) {
          i += lit.length;
          return;
        }
      }
      fail();
    }
  };
  const string = (): void => {
    i++;
    while (i < text.length) {
      const c = text[i]!;
      if (c === '"') {
        i++;
        return;
      }
      if (c === '\\') i += 2;
      else if (c.charCodeAt(0) < 32) fail();
      else i++;
    }
    fail();
  };
  try {
    value();
    ws();
    return i < text.length ? i : text.length;
  } catch (pos) {
    return typeof pos === 'number' ? pos : 0;
  }
}

/**
 * The 1-based line where the value at `path` (object keys and array indices) starts in valid JSON
 * `text`, so errors about a document's structure can name a line too; undefined if the path is
 * absent. For a repeated key the last one counts, as in JSON.parse.
 */
export function jsonPathLine(text: string, path: ReadonlyArray<string | number>): number | undefined {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let i = 0;
  const ws = (): void => {
    while (i < body.length && ' \t\r\n'.includes(body[i]!)) i++;
  };
  const skipString = (): void => {
    i++;
    while (i < body.length && body[i] !== '"') i += body[i] === '\\' ? 2 : 1;
    i++;
  };
  const skipValue = (): void => {
    ws();
    const c = body[i];
    if (c === '"') return skipString();
    if (c !== '{' && c !== '[') {
      while (i < body.length && !',]} \t\r\n'.includes(body[i]!)) i++;
      return;
    }
    let depth = 0;
    do {
      const d = body[i];
      if (d === '"') {
        skipString();
        continue;
      }
      if (d === '{' || d === '[') depth++;
      else if (d === '}' || d === ']') depth--;
      i++;
    } while (depth > 0 && i < body.length);
  };
  for (const step of path) {
    ws();
    if (typeof step === 'number') {
      if (body[i] !== '[') return undefined;
      i++;
      for (let k = 0; ; k++) {
        ws();
        if (body[i] === ']' || i >= body.length) return undefined;
        if (k === step) break;
        skipValue();
        ws();
        if (body[i] === ',') i++;
      }
    } else {
      if (body[i] !== '{') return undefined;
      i++;
      let at = -1;
      for (;;) {
        ws();
        if (body[i] !== '"') break;
        const start = i;
        skipString();
        const key = JSON.parse(body.slice(start, i)) as string;
        ws();
        i++; // the colon
        ws();
        if (key === step) at = i;
        skipValue();
        ws();
        if (body[i] === ',') i++;
      }
      if (at < 0) return undefined;
      i = at;
    }
  }
  ws();
  let line = 1;
  for (let k = 0; k < i && k < body.length; k++) if (body.charCodeAt(k) === 10) line++;
  return line;
}
