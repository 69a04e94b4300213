import { createReadStream } from 'node:fs';
import { BitspanError } from '../errors.js';
import type { BitstringParser } from './bitstringParser.js';
import { MAX_LINE_CHARS, parseCount } from './lines.js';
import type { SampleSink } from './sampleSink.js';
import { headerColumns } from './samplesCsv.js';

/** Thrown when the file needs the full CSV grammar (quoted fields); the caller re-reads with csv-parse. */
export class NeedsFullCsv extends Error {}

/**
 * Read a plain CSV dump (no quoted fields) straight from bytes: split lines and fields on the
 * buffer, pack 0/1 bytes into words without building strings. This is the hot path for dumps of
 * millions of rows; anything unusual (a quote character) defers to the general reader.
 */
export async function readSamplesCsvFast(file: string, parser: BitstringParser, sink: SampleSink): Promise<number> {
  let bitCol = -1;
  let countCol = -1;
  let width = 0;
  let rows = 0;
  let line = 0;
  let headerDone = false;
  let carry: Buffer | null = null;
  const handleLine = (buf: Buffer, start: number, end: number): void => {
    line++;
    if (line === 1 && end - start >= 3 && buf[start] === 0xef && buf[start + 1] === 0xbb && buf[start + 2] === 0xbf) start += 3;
    while (end > start && (buf[end - 1] === 13 || buf[end - 1] === 32 || buf[end - 1] === 9)) end--;
    while (start < end && (buf[start] === 32 || buf[start] === 9)) start++;
    if (start === end) return;
    if (!headerDone) {
      // Lone CR line ends (old Mac files): csv-parse detects the record delimiter, this path does not.
      if (buf.subarray(start, end).indexOf(13) >= 0) throw new NeedsFullCsv();
      const cells = buf.toString('utf8', start, end).split(',');
      ({ bitCol, countCol } = headerColumns(cells, file, line));
      width = cells.length;
      headerDone = true;
      return;
    }
    // Locate the fields we need by scanning commas once.
    let field = 0;
    let fs = start;
    let bitStart = -1;
    let bitEnd = -1;
    let cntStart = -1;
    let cntEnd = -1;
    for (let i = start; i <= end; i++) {
      if (i === end || buf[i] === 44) {
        let a = fs;
        let b = i;
        while (a < b && (buf[a] === 32 || buf[a] === 9)) a++;
        while (b > a && (buf[b - 1] === 32 || buf[b - 1] === 9)) b--;
        if (field === bitCol) {
          bitStart = a;
          bitEnd = b;
        } else if (field === countCol) {
          cntStart = a;
          cntEnd = b;
        }
        field++;
        fs = i + 1;
      }
    }
    if (field !== width) {
      throw new BitspanError('bad-samples', `row has ${field} fields but the header has ${width}`, 'every row needs one field per header column', { file, line });
    }
    const words = packField(buf, bitStart, bitEnd, parser, file, line);
    let count = 1;
    if (countCol >= 0) {
      // Fast path for plain integers; anything else goes through the strict parser.
      count = 0;
      let ok = cntEnd > cntStart && cntEnd - cntStart <= 15;
      for (let i = cntStart; ok && i < cntEnd; i++) {
        const d = buf[i]! - 48;
        if (d < 0 || d > 9) ok = false;
        else count = count * 10 + d;
      }
      if (!ok) count = parseCount(buf.toString('utf8', cntStart, cntEnd), file, line);
    }
    sink.add(words, count, line);
    rows++;
  };
  try {
    for await (const chunk of createReadStream(file, { highWaterMark: 1 << 20 }) as AsyncIterable<Buffer>) {
      // Quoted fields need the full grammar; one scan per chunk keeps this check cheap.
      if (chunk.indexOf(34) >= 0) throw new NeedsFullCsv();
      let buf = chunk;
      if (carry) {
        buf = Buffer.concat([carry, chunk]);
        carry = null;
      }
      let start = 0;
      for (;;) {
        const nl = buf.indexOf(10, start);
        if (nl < 0) break;
        handleLine(buf, start, nl);
        start = nl + 1;
      }
      if (start < buf.length) {
        if (buf.length - start > MAX_LINE_CHARS) {
          throw new BitspanError('bad-samples', `line longer than ${MAX_LINE_CHARS} characters`, 'check that this is a CSV dump', { file, line: line + 1 });
        }
        carry = Buffer.from(buf.subarray(start));
      }
    }
  } catch (e) {
    if (e instanceof BitspanError || e instanceof NeedsFullCsv) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new BitspanError('file-unreadable', `cannot read file (${code ?? String(e)})`, 'check the path and permissions', { file });
  }
  if (carry && carry.length > 0) handleLine(carry, 0, carry.length);
  if (!headerDone) throw new BitspanError('file-empty', 'sample file is empty', "give a CSV with a 'bitstring' header and at least one row", { file });
  return rows;
}

/** Pack a 0/1 field from bytes; non-binary text (hex, bad characters) goes through the parser for its checks and messages. */
function packField(buf: Buffer, a: number, b: number, parser: BitstringParser, file: string, line: number): Uint32Array {
  const n = b - a;
  if (n === 0 || n !== parser.qubits || (n > 1 && buf[a] === 48 && (buf[a + 1]! | 32) === 120)) {
    return parser.parse(buf.toString('latin1', a, b), file, line);
  }
  const w = parser.words;
  w.fill(0);
  const right = parser.qubit0 === 'right';
  for (let i = 0; i < n; i++) {
    const c = buf[a + i];
    if (c === 49) {
      const q = right ? n - 1 - i : i;
      w[q >>> 5]! |= 1 << (q & 31);
    } else if (c !== 48) {
      return parser.parse(buf.toString('utf8', a, b), file, line);
    }
  }
  return w;
}
