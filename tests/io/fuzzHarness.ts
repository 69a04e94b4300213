import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { expect } from 'vitest';
import { BitspanError } from '../../src/errors.js';
import { tempDir } from '../helpers.js';

/**
 * The reader contract of issue 7, reusable by every reader (later ones too): on any input a reader
 * either returns a value or throws a BitspanError naming the file (and the line where one makes
 * sense); it never throws anything else and never hangs.
 */
export interface ReaderUnderTest<T> {
  /** Shown in failure messages. */
  name: string;
  /** File extension the reader chooses its format by, e.g. '.csv'. */
  ext: string;
  read(file: string): Promise<T>;
  /** Whether this error must carry a line number (default: every code except file-level ones). */
  needsLine?(e: BitspanError): boolean;
  /** Errors that are not BitspanErrors but are part of the reader's protocol (e.g. a deferral to another reader). */
  isDeferral?(e: unknown): boolean;
}

/** Codes that describe a whole file or the run, where no single line is to blame. */
export const FILE_LEVEL_CODES = new Set(['file-empty', 'file-unreadable', 'too-large', 'empty-subspace', 'qubit-mismatch', 'bad-argument']);

/** What one run of a reader on one input gave. */
export type ReadOutcome<T> = { ok: true; value: T } | { ok: false; error: BitspanError } | { ok: 'deferred' };

/**
 * Milliseconds a reader may take on one small fuzz input before it counts as hung. This catches
 * stalls in asynchronous reading (a stream never ending, a promise never settling); a synchronous
 * endless loop would hold the test process itself and is left to vitest's timeouts.
 */
export const HANG_MS = 10_000;

let dir: string | undefined;
let serial = 0;

/** Write `input` to a fresh file with the reader's extension and run the reader under the contract. */
export async function readUnderContract<T>(reader: ReaderUnderTest<T>, input: string | Uint8Array): Promise<ReadOutcome<T>> {
  dir ??= tempDir('bitspan-fuzz-');
  const file = join(dir, `in${serial++}${reader.ext}`);
  writeFileSync(file, input);
  let timer: NodeJS.Timeout | undefined;
  const hang = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`${reader.name} did not finish within ${HANG_MS} ms`)), HANG_MS);
  });
  try {
    return { ok: true, value: await Promise.race([reader.read(file), hang]) };
  } catch (e) {
    if (reader.isDeferral?.(e)) return { ok: 'deferred' };
    if (!(e instanceof BitspanError)) {
      throw new Error(`${reader.name} threw a non-BitspanError on ${describe(input)}: ${e instanceof Error ? e.stack : String(e)}`);
    }
    expect(e.file, `${reader.name}: error without a file: ${e.message}`).toBe(file);
    const needsLine = reader.needsLine ?? ((err: BitspanError) => !FILE_LEVEL_CODES.has(err.code));
    if (needsLine(e)) {
      expect(e.line, `${reader.name}: '${e.code}' error without a line: ${e.message} on ${describe(input)}`).toBeGreaterThanOrEqual(1);
    }
    expect(e.toLine()).not.toMatch(/[\r\n]/);
    return { ok: false, error: e };
  } finally {
    clearTimeout(timer);
  }
}

/** Seeded property options; bounded so each property runs in seconds. */
export function fuzzOptions(seed: number, numRuns = 150): fc.Parameters<unknown> {
  return { seed, numRuns, endOnFailure: true };
}

/**
 * Run `reader` on every input `inputs` generates and assert the contract; `check` may further
 * assert a successful parse (e.g. against an independent expectation) or a failure.
 */
export async function fuzzReader<T, I extends string | Uint8Array>(
  reader: ReaderUnderTest<T>,
  inputs: fc.Arbitrary<I>,
  seed: number,
  check?: (input: I, outcome: ReadOutcome<T>) => void,
  numRuns?: number,
): Promise<void> {
  await fc.assert(
    fc.asyncProperty(inputs, async (input) => {
      const outcome = await readUnderContract(reader, input);
      check?.(input, outcome);
    }),
    fuzzOptions(seed, numRuns),
  );
}

// ---- generators shared by the reader fuzz tests ----

/** Arbitrary bytes, biased towards the characters the formats care about. */
export function noisyBytes(maxLength = 400): fc.Arbitrary<Uint8Array> {
  const special = fc.constantFrom(...Array.from('01,\n\r"{}:#xXYZ.-+eE \t\\', (c) => c.charCodeAt(0)), 0, 0xef, 0xbb, 0xbf, 0xff);
  return fc.array(fc.oneof(fc.integer({ min: 0, max: 255 }), special), { maxLength }).map((a) => Uint8Array.from(a));
}

/** Every prefix-cut of a valid file: `text` truncated at a random point. */
export function truncated(text: fc.Arbitrary<string>): fc.Arbitrary<string> {
  return text.chain((t) => fc.integer({ min: 0, max: t.length }).map((n) => t.slice(0, n)));
}

/** A text file's lines re-joined with random line ends (LF, CRLF, lone CR) and optionally a BOM. */
export function withLineEnds(lines: string[]): fc.Arbitrary<string> {
  return fc.tuple(fc.array(fc.constantFrom('\n', '\r\n'), { minLength: lines.length, maxLength: lines.length }), fc.boolean()).map(
    ([ends, bom]) => (bom ? '\ufeff' : '') + lines.map((l, i) => l + ends[i]).join(''),
  );
}

/** Mutations that hostile or broken files commonly show, applied to one line of a valid file. */
export function mutateLine(lines: string[], replacements: fc.Arbitrary<string>): fc.Arbitrary<string[]> {
  return fc.tuple(fc.integer({ min: 0, max: Math.max(0, lines.length - 1) }), replacements).map(([i, r]) => lines.map((l, k) => (k === i ? r : l)));
}

/** A line of `n` characters of `c` (very long lines around the caps). */
export function longLine(n: number, c = '0'): string {
  return c.repeat(n);
}

function describe(input: string | Uint8Array): string {
  const s = typeof input === 'string' ? input : Buffer.from(input).toString('latin1');
  return JSON.stringify(s.length > 200 ? s.slice(0, 200) + '...' : s);
}
