import { createReadStream, promises as fsp } from 'node:fs';
import { BitspanError, type BitspanErrorCode } from '../errors.js';

/** Longest line any reader accepts; longer ones are refused rather than buffered without bound. */
export const MAX_LINE_CHARS = 1 << 20;

/**
 * Check that `file` exists, is a regular file and can be read; throw `file-unreadable` otherwise.
 * Returns its size in bytes.
 */
export async function checkReadable(file: string, what: string): Promise<number> {
  let st;
  try {
    st = await fsp.stat(file);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new BitspanError('file-unreadable', code === 'ENOENT' ? `${what} file not found` : `cannot read ${what} file (${code ?? 'error'})`, 'check the path', { file });
  }
  if (!st.isFile()) throw new BitspanError('file-unreadable', `${what} path is not a regular file`, 'give a file, not a folder', { file });
  try {
    await fsp.access(file, 4 /* R_OK */);
  } catch {
    throw new BitspanError('file-unreadable', `no permission to read ${what} file`, 'check file permissions', { file });
  }
  return st.size;
}

/**
 * Stream the lines of a UTF-8 text file with 1-based line numbers, without holding the file in
 * memory. Strips a leading BOM and the CR of CRLF line ends. A line over MAX_LINE_CHARS, or one
 * holding a lone CR, is refused with `code` (the error code of the format being read).
 */
export async function* readLines(file: string, code: BitspanErrorCode = 'bad-samples'): AsyncGenerator<{ text: string; line: number }> {
  const stream = createReadStream(file, { encoding: 'utf8', highWaterMark: 1 << 20 });
  let carry = '';
  let line = 0;
  let first = true;
  try {
    for await (const chunk of stream as AsyncIterable<string>) {
      let data = carry + chunk;
      if (first) {
        if (data.charCodeAt(0) === 0xfeff) data = data.slice(1);
        first = false;
      }
      let start = 0;
      for (;;) {
        const nl = data.indexOf('\n', start);
        if (nl < 0) break;
        line++;
        const end = nl > start && data.charCodeAt(nl - 1) === 13 ? nl - 1 : nl;
        const text = data.slice(start, end);
        if (text.includes('\r')) throw loneCr(file, line, code);
        yield { text, line };
        start = nl + 1;
      }
      carry = data.slice(start);
      if (carry.length > MAX_LINE_CHARS) {
        throw new BitspanError(code, `line longer than ${MAX_LINE_CHARS} characters`, 'check that this is a text file of the expected format', { file, line: line + 1 });
      }
    }
  } catch (e) {
    if (e instanceof BitspanError) throw e;
    const errno = (e as NodeJS.ErrnoException).code;
    throw new BitspanError('file-unreadable', `cannot read file (${errno ?? String(e)})`, 'check the path and permissions', { file });
  }
  if (carry.length > 0) {
    line++;
    const text = carry.endsWith('\r') ? carry.slice(0, -1) : carry;
    if (text.includes('\r')) throw loneCr(file, line, code);
    yield { text, line };
  }
}

function loneCr(file: string, line: number, code: BitspanErrorCode): BitspanError {
  return new BitspanError(code, 'line ends with a lone carriage return (CR) inside the line', 'save the file with LF or CRLF line ends', { file, line });
}

/** Strict non-negative decimal count: no hex, no Infinity, no empty string. */
export function parseCount(text: string, file: string, line: number): number {
  const t = text.trim();
  if (!/^\+?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) {
    throw new BitspanError('bad-samples', `count '${t.length > 30 ? t.slice(0, 27) + '...' : t}' is not a non-negative number`, 'counts are non-negative decimal numbers', { file, line });
  }
  const v = Number(t);
  if (!Number.isFinite(v)) {
    throw new BitspanError('bad-samples', `count '${t.slice(0, 30)}' is too large`, 'counts must be finite', { file, line });
  }
  return v;
}
