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
