import { promises as fsp } from 'node:fs';
import { BitspanError } from '../errors.js';
import type { BitstringParser } from './bitstringParser.js';
import { MAX_LINE_CHARS, parseCount } from './lines.js';
import type { SampleSink } from './sampleSink.js';
import { headerColumns } from './samplesCsv.js';

/** Thrown when the file needs the full CSV grammar (quoted fields); the caller re-reads with csv-parse. */
export class NeedsFullCsv extends Error {}

/** Bytes read at a time; the quote check runs per chunk, so this also fixes when the reader defers. */
const CHUNK_BYTES = 1 << 20;

/** Rows handed to the sink at once by the specialised loop. */
const BATCH_ROWS = 64;

/**
 * Read a plain CSV dump (no quoted fields) straight from bytes: split lines and fields on the
 * buffer, pack 0/1 bytes into words without building strings. This is the hot path for dumps of
 * millions of rows; anything unusual (a quote character) defers to the general reader.
 */
export async function readSamplesCsvFast(file: string, parser: BitstringParser, sink: SampleSink): Promise<number> {
  let bitCol = -1;
  let countCol = -1;
  let width = 0;
  let headerDone = false;
  // Rows laid out as `bits,count` or `bits` alone take the specialised loop (`plainRows`), which
  // hands them to the sink in batches; the batch is flushed before any other line is looked at, so
  // rows reach the sink (and its errors arise) in file order.
  let plainLayout = false;
  const st: ReadState = { line: 0, rows: 0, pending: 0, words: new Uint32Array(0), counts: new Float64Array(BATCH_ROWS), lines: new Int32Array(BATCH_ROWS) };
  const flush = (): void => {
    const n = st.pending;
    st.pending = 0;
    handOver(sink, parser, st, n);
  };
  const handleLine = (buf: Buffer, start: number, end: number): void => {
    const line = ++st.line;
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
      plainLayout = bitCol === 0 && ((width === 1 && countCol < 0) || (width === 2 && countCol === 1));
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
    const words = packField(buf, view, bitStart, bitEnd, parser, file, line);
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
    st.rows++;
  };

  // One buffer for the whole file: the unfinished line of the previous chunk is moved to its front
  // and the next chunk read behind it, so nothing is concatenated or reallocated per chunk.
  const buf = Buffer.allocUnsafe(MAX_LINE_CHARS + CHUNK_BYTES);
  const view = new DataView(buf.buffer, buf.byteOffset, buf.length);
  let carry = 0;
  let handle: fsp.FileHandle | undefined;
  try {
    handle = await fsp.open(file, 'r');
    for (;;) {
      const { bytesRead } = await handle.read(buf, carry, CHUNK_BYTES, null);
      if (bytesRead === 0) break;
      // Quoted fields need the full grammar; one scan per chunk keeps this check cheap.
      if (buf.subarray(carry, carry + bytesRead).indexOf(34) >= 0) throw new NeedsFullCsv();
      const data = buf.subarray(0, carry + bytesRead);
      const limit = data.length;
      let start = 0;
      while (start < limit) {
        if (plainLayout && parser.qubits > 0) {
          start = plainRows(data, view, start, st, parser, countCol === 1, sink);
          if (start >= limit) break;
        }
        const nl = data.indexOf(10, start);
        if (nl < 0) break;
        flush();
        handleLine(data, start, nl);
        start = nl + 1;
      }
      if (limit - start > MAX_LINE_CHARS) {
        flush();
        throw new BitspanError('bad-samples', `line longer than ${MAX_LINE_CHARS} characters`, 'check that this is a CSV dump', { file, line: st.line + 1 });
      }
      buf.copyWithin(0, start, limit);
      carry = limit - start;
    }
  } catch (e) {
    if (e instanceof NeedsFullCsv) throw e;
    // Rows before the failure come first, as if each had been handed over when read.
    flush();
    if (e instanceof BitspanError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new BitspanError('file-unreadable', `cannot read file (${code ?? String(e)})`, 'check the path and permissions', { file });
  } finally {
    await handle?.close();
  }
  flush();
  if (carry > 0) handleLine(buf, 0, carry);
  if (!headerDone) throw new BitspanError('file-empty', 'sample file is empty', "give a CSV with a 'bitstring' header and at least one row", { file });
  return st.rows;
}

/** Line and row counters of a read, and the batch of rows not yet handed to the sink. */
interface ReadState {
  line: number;
  rows: number;
  pending: number;
  words: Uint32Array;
  counts: Float64Array;
  lines: Int32Array;
}

/**
 * The specialised loop: take rows `bits,count` (or `bits` alone, when `!withCount`) with nothing
 * else on the line (CRLF allowed) from `data[start..]`, batching them in `st`; stop at the first
 * line of any other shape, or without a line end, and return where it starts. That line goes to
 * the general handler, which owns every error message.
 */
function plainRows(data: Buffer, view: DataView, start: number, st: ReadState, parser: BitstringParser, withCount: boolean, sink: SampleSink): number {
  const limit = data.length;
  const n = parser.qubits;
  const nWords = parser.nWords;
  const right = parser.qubit0 === 'right';
  if (st.words.length !== BATCH_ROWS * nWords) st.words = new Uint32Array(BATCH_ROWS * nWords);
  const { words, counts, lines } = st;
  let { line, rows, pending } = st;
  while (start + n < limit) {
    let j = start + n;
    let ok = packBinary(data, view, start, n, words, pending * nWords, nWords, right);
    let count = 1;
    if (ok && withCount) {
      if (data[j] === 44) {
        const d0 = ++j;
        count = 0;
        for (; j < limit && j - d0 < 16; j++) {
          const d = data[j]! - 48;
          if (d < 0 || d > 9) break;
          count = count * 10 + d;
        }
        ok = j > d0 && j - d0 <= 15;
      } else ok = false;
    }
    if (ok && j < limit && data[j] === 13) j++;
    if (!ok || j >= limit || data[j] !== 10) break;
    counts[pending] = count;
    lines[pending] = ++line;
    rows++;
    start = j + 1;
    if (++pending === BATCH_ROWS) {
      st.line = line;
      st.rows = rows;
      st.pending = 0;
      handOver(sink, parser, st, pending);
      pending = 0;
    }
  }
  st.line = line;
  st.rows = rows;
  st.pending = pending;
  return start;
}

/** Give the first `n` batched rows of `st` to the sink. */
function handOver(sink: SampleSink, parser: BitstringParser, st: ReadState, n: number): void {
  if (n === 0) return;
  if (sink.addMany) {
    sink.addMany(st.words, st.counts, st.lines, n);
    return;
  }
  const nWords = parser.nWords;
  const words = parser.words;
  for (let r = 0; r < n; r++) {
    for (let k = 0; k < nWords; k++) words[k] = st.words[r * nWords + k]!;
    sink.add(words, st.counts[r]!, st.lines[r]!);
  }
}

/**
 * Pack the `n` bytes at `buf[a..]` as a 0/1 bitstring into `words[at..]` (qubit 0 is the last
 * character when `right`, else the first); false when a byte is neither '0' nor '1'. `view` sees
 * the same bytes as `buf` (index for index) and serves four characters per read.
 */
function packBinary(buf: Buffer, view: DataView, a: number, n: number, words: Uint32Array, at: number, nWords: number, right: boolean): boolean {
  // Bytes 0x30/0x31 leave nothing but bit 0 of each byte after masking and xor with '0'.
  let bad = 0;
  for (let w = 0; w < nWords; w++) {
    let v = 0;
    if (right) {
      // Word w holds characters n-32w-32 .. n-32w-1, the last of them in bit 0.
      const hi = a + n - 32 * w;
      let i = Math.max(a, hi - 32);
      for (const lead = i + ((hi - i) & 3); i < lead; i++) {
        const c = buf[i]! ^ 48;
        bad |= c;
        v = (v << 1) | c;
      }
      for (; i < hi; i += 4) {
        const x = view.getUint32(i, true);
        bad |= (x & 0xfefefefe) ^ 0x30303030;
        // Gathers bit 0 of bytes 0..3 into bits 3..0 of the top byte (no carries below it).
        v = (v << 4) | (Math.imul(x & 0x01010101, 0x08040201) >>> 24);
      }
    } else {
      // Word w holds characters 32w .. 32w+31, the first of them in bit 0.
      const end = Math.min(a + n, a + 32 * w + 32);
      let i = a + 32 * w;
      let shift = 0;
      for (; i + 4 <= end; i += 4, shift += 4) {
        const x = view.getUint32(i, true);
        bad |= (x & 0xfefefefe) ^ 0x30303030;
        // Gathers bit 0 of bytes 0..3 into bits 0..3 of the top byte.
        v |= (Math.imul(x & 0x01010101, 0x01020408) >>> 24) << shift;
      }
      for (; i < end; i++, shift++) {
        const c = buf[i]! ^ 48;
        bad |= c;
        v |= c << shift;
      }
    }
    words[at + w] = v;
  }
  return (bad & ~1) === 0;
}

/** Pack a 0/1 field from bytes; non-binary text (hex, bad characters) goes through the parser for its checks and messages. */
function packField(buf: Buffer, view: DataView, a: number, b: number, parser: BitstringParser, file: string, line: number): Uint32Array {
  const n = b - a;
  if (n === 0 || n !== parser.qubits || (n > 1 && buf[a] === 48 && (buf[a + 1]! | 32) === 120)) {
    return parser.parse(buf.toString('latin1', a, b), file, line);
  }
  const w = parser.words;
  if (packBinary(buf, view, a, n, w, 0, parser.nWords, parser.qubit0 === 'right')) return w;
  return parser.parse(buf.toString('utf8', a, b), file, line);
}
