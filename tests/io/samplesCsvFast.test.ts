import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { readSamplesCsvFast } from '../../src/io/samplesCsvFast.js';
import { readSamplesCsv } from '../../src/io/samplesCsv.js';
import { readSamples } from '../../src/io/readSamples.js';
import { BitstringParser } from '../../src/io/bitstringParser.js';
import { formatBitstring } from '../../src/bits/packed.js';
import { BitspanError } from '../../src/errors.js';
import { seededUniform } from '../../src/util/random.js';
import { tempDir } from '../helpers.js';

type Row = { bits: string; count: number; line: number };

/**
 * A CSV dump of several MiB (so lines straddle the reader's 1 MiB chunks) mixing the plain
 * `bits,count` layout with lines the specialised loop hands to the general one: CRLF, blanks,
 * padding, long and decimal counts.
 */
function bigDump(qubits: number, rows: number, seed: number): { text: string; rows: Row[] } {
  const rng = seededUniform(seed);
  const pool = Array.from({ length: 500 }, () => Array.from({ length: qubits }, () => (rng.next() < 0.5 ? '0' : '1')).join(''));
  const lines = ['\ufeffbitstring,count'];
  const out: Row[] = [];
  for (let i = 0; i < rows; i++) {
    const bits = pool[Math.floor(rng.next() * pool.length)]!;
    const u = rng.next();
    let count = Math.floor(rng.next() * 1000);
    let text = `${bits},${count}`;
    if (u < 0.02) text += '\r';
    else if (u < 0.03) text = ` ${bits} , ${count}\t`;
    else if (u < 0.04) {
      count = 12345678901234567; // 17 digits: past the integer fast path
      text = `${bits},${count}`;
    } else if (u < 0.05) {
      count = 2.5;
      text = `${bits},2.5`;
    } else if (u < 0.06) lines.push('');
    lines.push(text);
    out.push({ bits, count, line: lines.length });
  }
  return { text: lines.join('\n') + '\n', rows: out };
}

async function countsOf(read: typeof readSamplesCsvFast, file: string, withMany: boolean): Promise<{ rows: number; seen: Row[] }> {
  const parser = new BitstringParser();
  const seen: Row[] = [];
  const add = (w: Uint32Array, count: number, line: number): void => {
    seen.push({ bits: formatBitstring(w, 0, parser.qubits), count, line });
  };
  const sink = withMany
    ? {
        add,
        addMany: (w: Uint32Array, counts: Float64Array, lines: Int32Array, n: number) => {
          for (let r = 0; r < n; r++) add(w.subarray(r * parser.nWords), counts[r]!, lines[r]!);
        },
      }
    : { add };
  return { rows: await read(file, parser, sink), seen };
}

describe('readSamplesCsvFast', () => {
  it('readSamplesCsvFast hands over every row with its line, in order, across chunk boundaries (both sink kinds)', async () => {
    const dir = tempDir();
    for (const qubits of [7, 64, 100]) {
      const { text, rows } = bigDump(qubits, Math.ceil((3 << 20) / (qubits + 5)), qubits);
      const file = join(dir, `d${qubits}.csv`);
      writeFileSync(file, text);
      for (const withMany of [true, false]) {
        const got = await countsOf(readSamplesCsvFast, file, withMany);
        expect(got.rows).toBe(rows.length);
        expect(got.seen).toEqual(rows);
      }
      // csv-parse (a library we did not write) reads the same rows from the same file.
      expect((await countsOf(readSamplesCsv, file, false)).seen.map((r) => [r.bits, r.count])).toEqual(rows.map((r) => [r.bits, r.count]));
    }
  });

  it('readSamplesCsvFast packs both qubit orders and a bitstring-only layout like the parser does', async () => {
    const dir = tempDir();
    const rng = seededUniform(9);
    const rows = Array.from({ length: 3000 }, () => Array.from({ length: 45 }, () => (rng.next() < 0.3 ? '1' : '0')).join(''));
    const file = join(dir, 'bits.csv');
    writeFileSync(file, 'bitstring\r\n' + rows.join('\r\n') + '\r\n');
    for (const qubit0 of ['right', 'left'] as const) {
      const parser = new BitstringParser({ qubit0 });
      const reference = new BitstringParser({ qubit0 });
      const seen: string[] = [];
      let batched = 0;
      const n = await readSamplesCsvFast(file, parser, {
        add: (w, count) => {
          expect(count).toBe(1);
          seen.push(Array.from(w).join(':'));
        },
        addMany: (w, counts, _lines, k) => {
          batched += k;
          for (let r = 0; r < k; r++) {
            expect(counts[r]).toBe(1);
            seen.push(Array.from(w.subarray(r * 2, r * 2 + 2)).join(':'));
          }
        },
      });
      expect(n).toBe(rows.length);
      // The first row is parsed by the general path (it learns the register size); the rest by the loop.
      expect(batched).toBe(rows.length - 1);
      expect(seen).toEqual(rows.map((b, i) => Array.from(reference.parse(b, 'x', i + 2)).join(':')));
    }
  });

  it('readSamples keeps row order with keepOrder and refuses a bad row after the first chunk at its line', async () => {
    const dir = tempDir();
    const { text, rows } = bigDump(64, Math.ceil((2 << 20) / 69), 4);
    const file = join(dir, 'ok.csv');
    writeFileSync(file, text);
    const s = await readSamples([file], { keepOrder: true });
    const g = s.groups[0]!;
    expect(g.rows).toBe(rows.length);
    expect(g.order!.length).toBe(rows.length);
    rows.forEach((r, i) => {
      expect(formatBitstring(g.table.states, g.order!.index[i]! * 2, 64)).toBe(r.bits);
      expect(g.order!.count[i]).toBe(r.count);
    });
    expect(g.shots).toBe(rows.reduce((a, r) => a + r.count, 0));

    const lines = text.split('\n');
    const at = lines.findIndex((l, i) => i > lines.length / 2 && /^[01]+,\d+$/.test(l));
    lines[at] = lines[at]!.replace(/^(\d)/, (d) => (d === '0' ? '2' : '3'));
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, lines.join('\n'));
    const e = await readSamples([bad]).then(() => undefined, (x: unknown) => x);
    expect([(e as BitspanError).code, (e as BitspanError).line]).toEqual(['bad-bitstring', at + 1]);
  });

  it('readSamples refuses a total count beyond the double range at the row that overflows', async () => {
    const dir = tempDir();
    const bits = '01'.repeat(20);
    const file = join(dir, 'big.csv');
    writeFileSync(file, ['bitstring,count', ...Array.from({ length: 200 }, () => `${bits},7`), `${bits},1e308`, `${bits},7`, `${bits},1e308`, `${bits},7`].join('\n') + '\n');
    const e = await readSamples([file]).then(() => undefined, (x: unknown) => x);
    expect([(e as BitspanError).code, (e as BitspanError).line]).toEqual(['bad-samples', 204]);
  });
  it('readSamples refuses a non-binary byte anywhere in a plain row, at its line, for both qubit orders (property)', async () => {
    const dir = tempDir();
    let serial = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 1, max: 70 }),
        fc.nat(),
        // Single-byte characters: a multi-byte one changes the byte length and is refused as such.
        fc.constantFrom('2', '/', 'a', ' ', '\t', '\u007f', 'x', '\u0000'),
        fc.constantFrom<'right' | 'left'>('right', 'left'),
        async (qubits, at, bad, qubit0) => {
          const row = (i: number): string => Array.from({ length: qubits }, (_, q) => String((i >> q % 5) & 1)).join('');
          const rows = Array.from({ length: 150 }, (_, i) => `${row(i)},${i}`);
          const k = 2 + (at % 140);
          const pos = at % qubits;
          rows[k] = rows[k]!.slice(0, pos) + bad + rows[k]!.slice(pos + 1);
          const file = join(dir, `bad${serial++}.csv`);
          writeFileSync(file, 'bitstring,count\n' + rows.join('\n') + '\n');
          const e = await readSamples([file], { qubit0 }).then(() => undefined, (x: unknown) => x);
          // Whitespace at either end of the cell is trimmed (common practice in CSV readers), which shortens it.
          const code = (bad === ' ' || bad === '\t') && (pos === 0 || pos === qubits - 1) ? 'inconsistent-length' : 'bad-bitstring';
          expect([(e as BitspanError).code, (e as BitspanError).line]).toEqual([code, k + 2]);
        },
      ),
      { seed: 17, numRuns: 120 },
    );
  });
  it('readSamples starts the row order afresh when a quote past the first chunk sends the file to csv-parse', async () => {
    const dir = tempDir();
    const { text, rows } = bigDump(64, Math.ceil((2 << 20) / 69), 8);
    const lines = text.split('\n');
    const at = lines.findIndex((l, i) => i > (lines.length * 3) / 4 && /^[01]+,\d+$/.test(l));
    const [bits, count] = lines[at]!.split(',');
    lines[at] = `"${bits}",${count}`;
    const file = join(dir, 'quoted.csv');
    writeFileSync(file, lines.join('\n'));
    const g = (await readSamples([file], { keepOrder: true })).groups[0]!;
    expect(g.rows).toBe(rows.length);
    expect(g.order!.length).toBe(rows.length);
    rows.forEach((r, i) => expect(formatBitstring(g.table.states, g.order!.index[i]! * 2, 64)).toBe(r.bits));
  });
});
