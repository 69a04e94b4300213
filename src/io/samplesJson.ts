import { createReadStream } from 'node:fs';
import { BitspanError } from '../errors.js';
import type { BitstringParser } from './bitstringParser.js';
import { MAX_LINE_CHARS, parseCount } from './lines.js';
import type { SampleSink } from './sampleSink.js';

// Scanner states for the flat object {"bits": count, ...}.
const enum S {
  Start,
  KeyOrClose,
  Key,
  Colon,
  ValueStart,
  Value,
  CommaOrClose,
  KeyAfterComma,
  Done,
}

/**
 * Stream a JSON counts object `{"0110": 17, ...}` with a character scanner, so a dump of many
 * gigabytes never becomes one string; errors carry the line of the offending token.
 */
export async function readSamplesJson(file: string, parser: BitstringParser, sink: SampleSink): Promise<number> {
  let state = S.Start;
  let line = 1;
  let tokenLine = 1;
  let key = '';
  let value = '';
  let rows = 0;
  let first = true;
  const fail = (what: string, hint = 'the file must be one JSON object mapping bitstrings to counts, e.g. {"0110": 17}'): never => {
    throw new BitspanError('bad-samples', what, hint, { file, line });
  };
  const finishValue = (): void => {
    const count = parseCount(value, file, tokenLine);
    sink.add(parser.parse(key.trim(), file, tokenLine), count, tokenLine);
    rows++;
  };
  try {
    for await (const chunk of createReadStream(file, { encoding: 'utf8', highWaterMark: 1 << 20 }) as AsyncIterable<string>) {
      let i = 0;
      if (first && chunk.charCodeAt(0) === 0xfeff) i = 1;
      first = false;
      for (; i < chunk.length; i++) {
        const c = chunk.charCodeAt(i);
        if (state === S.Key) {
          if (c === 34) {
            state = S.Colon;
          } else if (c === 92 || c === 10) {
            fail(c === 10 ? 'line break inside a key' : 'escape sequence in a bitstring key', 'keys are plain bitstrings');
          } else {
            key += chunk[i];
            if (key.length > MAX_LINE_CHARS) fail('key too long');
          }
          continue;
        }
        if (state === S.Value) {
          if ((c >= 48 && c <= 57) || c === 43 || c === 45 || c === 46 || c === 101 || c === 69) {
            value += chunk[i];
            if (value.length > 64) fail('count too long');
            continue;
          }
          finishValue();
          state = S.CommaOrClose as S;
        }
        if (c === 10) {
          line++;
          continue;
        }
        if (c === 32 || c === 9 || c === 13) continue;
        switch (state) {
          case S.Start:
            if (c !== 123) fail(`expected '{' but found '${chunk[i]}'`);
            state = S.KeyOrClose;
            break;
          case S.KeyOrClose:
          case S.KeyAfterComma:
            if (c === 125 && state === S.KeyOrClose) {
              state = S.Done;
            } else if (c === 34) {
              key = '';
              tokenLine = line;
              state = S.Key;
            } else fail(`expected a quoted bitstring key but found '${chunk[i]}'`);
            break;
          case S.Colon:
            if (c !== 58) fail(`expected ':' after key but found '${chunk[i]}'`);
            state = S.ValueStart;
            break;
          case S.ValueStart:
            if ((c >= 48 && c <= 57) || c === 43 || c === 45 || c === 46) {
              value = chunk[i]!;
              state = S.Value;
            } else fail(`expected a numeric count but found '${chunk[i]}'`, 'counts are non-negative numbers, not strings');
            break;
          case S.CommaOrClose:
            if (c === 44) state = S.KeyAfterComma;
            else if (c === 125) state = S.Done;
            else fail(`expected ',' or '}' but found '${chunk[i]}'`);
            break;
          case S.Done:
            fail(`unexpected '${chunk[i]}' after the closing '}'`);
        }
      }
    }
  } catch (e) {
    if (e instanceof BitspanError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new BitspanError('file-unreadable', `cannot read file (${code ?? String(e)})`, 'check the path and permissions', { file });
  }
  // A value cut off at end of file still means the object was never closed.
  if (state === S.Value) state = S.CommaOrClose;
  if (state === S.Start) throw new BitspanError('file-empty', 'sample file is empty', 'give a JSON object mapping bitstrings to counts', { file });
  if (state !== S.Done) fail('file ends before the JSON object is closed', 'the file looks truncated');
  return rows;
}
