import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { readSamples } from '../../src/io/readSamples.js';
import { BitstringParser } from '../../src/io/bitstringParser.js';
import { formatBitstring } from '../../src/bits/packed.js';
import { BitspanError } from '../../src/errors.js';
import { codeOf, tempDir, writeFiles } from '../helpers.js';


describe('readSamples', () => {
  it('readSamples reads CSV, JSON and text dumps into the same deduplicated counts', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, {
      'a.csv': 'shot_id,bitstring,count\n1,0110,3\n2,1001,2\n3,0110,1\n',
      'b.json': '{"0110": 4,\n "1001": 2}',
      'c.txt': '0110\n1001\r\n0110\n\n0110\n# comment\n0110\n1001\n',
    });
    for (const file of Object.values(f)) {
      const s = await readSamples([file]);
      const g = s.groups[0]!;
      expect(s.qubits).toBe(4);
      expect(g.shots).toBe(6);
      expect(g.table.size).toBe(2);
      const byString = new Map<string, number>();
      for (let i = 0; i < g.table.size; i++) byString.set(formatBitstring(g.table.states, i, 4), g.table.counts[i]!);
      expect(Object.fromEntries(byString)).toEqual({ '0110': 4, '1001': 2 });
    }
  });

  it('readSamples packs long bitstrings across words (qubit 0 rightmost by default)', async () => {
    const dir = tempDir();
    const bits = '1' + '0'.repeat(98) + '1'; // qubits 0 and 99 set
    const f = writeFiles(dir, { 's.csv': `bitstring\n${bits}\n` });
    const s = await readSamples([f['s.csv']!]);
    expect(s.qubits).toBe(100);
    expect(s.nWords).toBe(4);
    expect(Array.from(s.groups[0]!.table.states.subarray(0, 4))).toEqual([1, 0, 0, 1 << 3]);
  });

  it('BitstringParser round-trips both qubit orders and hexadecimal (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.boolean(), { minLength: 1, maxLength: 200 }), fc.constantFrom<'right' | 'left'>('right', 'left'), (bits, qubit0) => {
        const text = bits.map((b) => (b ? '1' : '0')).join('');
        const p = new BitstringParser({ qubit0 });
        const w = p.parse(text, 'x', 1);
        expect(formatBitstring(w, 0, text.length, qubit0)).toBe(text);
        // Qubit q is character n−1−q (right) or q (left).
        const q = bits.length - 1;
        const charOfQubitLast = qubit0 === 'right' ? text[0] : text[q];
        expect(((w[q >>> 5]! >>> (q & 31)) & 1).toString()).toBe(charOfQubitLast);
        // Hexadecimal spells the same binary string.
        const hex = '0x' + BigInt('0b' + text).toString(16);
        const ph = new BitstringParser({ qubits: text.length, qubit0 });
        expect(Array.from(ph.parse(hex, 'x', 1))).toEqual(Array.from(w));
      }),
      { seed: 3, numRuns: 200 },
    );
  });

  it('readSamples refuses bad dumps with located errors', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, {
      'ragged.csv': 'bitstring,count\n0101,1\n011,2\n',
      'badchar.csv': 'bitstring,count\n0101,1\n01a1,2\n',
      'nohdr.csv': '0101,1\n',
      'badcount.csv': 'bitstring,count\n0101,-3\n',
      'fields.csv': 'bitstring,count\n0101,1,9\n',
      'quote.csv': 'bitstring,count\n"0101,1\n',
      'empty.csv': '',
      'hdronly.csv': 'bitstring,count\n',
      'trunc.json': '{"0101": 3, "1010"',
      'strcount.json': '{"0101": "3"}',
      'hex.txt': '0x1f\n',
    });
    expect(await codeOf(readSamples([f['ragged.csv']!]))).toBe('inconsistent-length');
    expect(await codeOf(readSamples([f['badchar.csv']!]))).toBe('bad-bitstring');
    expect(await codeOf(readSamples([f['nohdr.csv']!]))).toBe('bad-samples');
    expect(await codeOf(readSamples([f['badcount.csv']!]))).toBe('bad-samples');
    expect(await codeOf(readSamples([f['fields.csv']!]))).toBe('bad-samples');
    expect(await codeOf(readSamples([f['quote.csv']!]))).toBe('bad-samples');
    expect(await codeOf(readSamples([f['empty.csv']!]))).toBe('file-empty');
    expect(await codeOf(readSamples([f['hdronly.csv']!]))).toBe('file-empty');
    expect(await codeOf(readSamples([f['trunc.json']!]))).toBe('bad-samples');
    expect(await codeOf(readSamples([f['strcount.json']!]))).toBe('bad-samples');
    expect(await codeOf(readSamples([f['hex.txt']!]))).toBe('bad-bitstring');
    expect(await codeOf(readSamples([join(dir, 'missing.csv')]))).toBe('file-unreadable');
    try {
      await readSamples([f['badchar.csv']!]);
    } catch (e) {
      expect((e as BitspanError).line).toBe(3);
      expect((e as BitspanError).file).toBe(f['badchar.csv']);
    }
  });

  it('readSamples holds every dump to the first dump’s register size', async () => {
    const dir = tempDir();
    writeFileSync(join(dir, 'a.txt'), '0101\n');
    writeFileSync(join(dir, 'b.txt'), '01010\n');
    expect(await codeOf(readSamples([join(dir, 'a.txt'), join(dir, 'b.txt')]))).toBe('inconsistent-length');
  });
});
