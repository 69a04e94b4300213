import { isAbsolute, relative, resolve, sep } from 'node:path';
import { BitspanError, type BitspanErrorCode } from '../errors.js';

/**
 * The path of `name` inside `folder`, refusing names that would land elsewhere: absolute paths,
 * `..` segments that climb out, NUL bytes, and empty names. Throws a BitspanError with `code`
 * ('bad-argument' for a flag, 'bad-manifest' for a name read from a manifest) and `place`.
 */
export function resolveInside(folder: string, name: string, code: Extract<BitspanErrorCode, 'bad-argument' | 'bad-manifest'> = 'bad-argument', place: { file?: string; line?: number } = {}): string {
  const refuse = (why: string): never => {
    throw new BitspanError(code, `output name '${printable(name)}' ${why}`, `give a plain name or a relative path inside ${folder}`, place);
  };
  if (name.length === 0 || name.trim().length === 0) refuse('is empty');
  if (name.includes('\0')) refuse('contains a NUL character');
  // Both separators count on every platform: a manifest written on Windows is read anywhere.
  if (isAbsolute(name) || /^[a-zA-Z]:/.test(name) || name.startsWith('\\') || name.startsWith('/')) refuse('is an absolute path');
  if (name.split(/[\\/]/).includes('..')) refuse("climbs out of the output folder with '..'");
  const base = resolve(folder);
  const full = resolve(base, name);
  const rel = relative(base, full);
  if (rel === '' || rel.startsWith('..') || isAbsolute(rel)) refuse('does not name a file inside the output folder');
  return base.endsWith(sep) ? base + rel : `${base}${sep}${rel}`;
}

function printable(s: string): string {
  const t = s.replace(/[\u0000-\u001f\u007f]/g, (c) => `\\x${c.charCodeAt(0).toString(16).padStart(2, '0')}`);
  return t.length > 60 ? `${t.slice(0, 57)}...` : t;
}
