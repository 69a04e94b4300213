import { BitspanError } from '../errors.js';

/** Option value parsers that fail with `bad-argument` and say what was expected. */
export function positiveInt(flag: string): (v: string) => number {
  return (v) => {
    if (!/^\d+$/.test(v.trim()) || Number(v) < 1 || !Number.isSafeInteger(Number(v))) {
      throw new BitspanError('bad-argument', `${flag} '${v}' is not a positive whole number`, `e.g. ${flag} 4`);
    }
    return Number(v);
  };
}

export function nonNegativeInt(flag: string): (v: string) => number {
  return (v) => {
    if (!/^\d+$/.test(v.trim()) || !Number.isSafeInteger(Number(v))) {
      throw new BitspanError('bad-argument', `${flag} '${v}' is not a non-negative whole number`, `e.g. ${flag} 0`);
    }
    return Number(v);
  };
}

export function positiveNumber(flag: string): (v: string) => number {
  return (v) => {
    const x = Number(v);
    if (v.trim() === '' || !Number.isFinite(x) || x <= 0) throw new BitspanError('bad-argument', `${flag} '${v}' is not a positive number`, `e.g. ${flag} 1e-8`);
    return x;
  };
}

export function nonNegativeNumber(flag: string): (v: string) => number {
  return (v) => {
    const x = Number(v);
    if (v.trim() === '' || !Number.isFinite(x) || x < 0) throw new BitspanError('bad-argument', `${flag} '${v}' is not a non-negative number`, `e.g. ${flag} 2`);
    return x;
  };
}

export function realNumber(flag: string): (v: string) => number {
  return (v) => {
    const x = Number(v);
    if (v.trim() === '' || !Number.isFinite(x)) throw new BitspanError('bad-argument', `${flag} '${v}' is not a number`, `e.g. ${flag} -1.5`);
    return x;
  };
}

export function oneOf<T extends string>(flag: string, values: readonly T[]): (v: string) => T {
  return (v) => {
    if (!(values as readonly string[]).includes(v)) throw new BitspanError('bad-argument', `${flag} '${v}' is not one of ${values.join(', ')}`, `e.g. ${flag} ${values[0]}`);
    return v as T;
  };
}

/** Collect a repeatable option into a list. */
export function collect(v: string, prev: string[] | undefined): string[] {
  return [...(prev ?? []), v];
}
