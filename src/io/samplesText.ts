import type { BitstringParser } from './bitstringParser.js';
import { readLines } from './lines.js';
import type { SampleSink } from './sampleSink.js';

/** Stream a plain-text dump: one bitstring per line, each line one shot; blank lines and `#` comments skipped. */
export async function readSamplesText(file: string, parser: BitstringParser, sink: SampleSink): Promise<number> {
  let rows = 0;
  for await (const { text, line } of readLines(file)) {
    const t = text.trim();
    if (t.length === 0 || t.charCodeAt(0) === 35 /* # */) continue;
    sink.add(parser.parse(t, file, line), 1, line);
    rows++;
  }
  return rows;
}
