import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { BitspanError } from '../../src/errors.js';
import { formatBitstring } from '../../src/bits/packed.js';
import { formatPauliOps, type PauliSum } from '../../src/operators/pauliSum.js';
import { BitstringParser } from '../../src/io/bitstringParser.js';
import { readHamiltonian } from '../../src/io/readHamiltonian.js';
import { readSamples, type SampleFormat } from '../../src/io/readSamples.js';
import { readSamplesCsv } from '../../src/io/samplesCsv.js';
import { NeedsFullCsv, readSamplesCsvFast } from '../../src/io/samplesCsvFast.js';
import { MAX_LINE_CHARS } from '../../src/io/lines.js';
import { closeTo } from '../helpers.js';
import { fuzzReader, longLine, mutateLine, noisyBytes, readUnderContract, truncated, withLineEnds, type ReaderUnderTest, type ReadOutcome } from './fuzzHarness.js';

type Counts = Map<string, number>;

/** A sample reader seen as file → {bitstring: count}, so parses compare with a plain Map built by the test. */
function samplesReader(format: Exclude<SampleFormat, 'auto'>, ext: string): ReaderUnderTest<Counts> {
  return {
    name: `readSamples(${format})`,
    ext,
    read: async (file) => {
      const s = await readSamples([file], { format });
      const t = s.groups[0]!.table;
      const m: Counts = new Map();
      for (let i = 0; i < t.size; i++) m.set(formatBitstring(t.states, i * t.nWords, s.qubits), t.counts[i]!);
      return m;
    },
  };
}

/** One of the two CSV paths on its own, with a sink collecting counts. */
function csvPathReader(path: 'fast' | 'csv-parse'): ReaderUnderTest<Counts> {
  return {
    name: path === 'fast' ? 'readSamplesCsvFast' : 'readSamplesCsv',
    ext: '.csv',
    read: async (file) => {
      const parser = new BitstringParser();
      const m: Counts = new Map();
      const sink = { add: (w: Uint32Array, c: number) => { const k = formatBitstring(w, 0, parser.qubits); m.set(k, (m.get(k) ?? 0) + c); } };
      await (path === 'fast' ? readSamplesCsvFast : readSamplesCsv)(file, parser, sink);
      return m;
    },
    isDeferral: (e) => e instanceof NeedsFullCsv,
  };
}

// Every Hamiltonian error but an empty file names a line (JSON structure errors: where the value starts).
const hamiltonianReader = (ext: string): ReaderUnderTest<PauliSum> => ({ name: `readHamiltonian(${ext})`, ext, read: readHamiltonian, needsLine: (e) => e.code === 'bad-hamiltonian' });

// ---- valid sample dumps with an independent expectation ----

interface Row {
  bits: string;
  count: number;
}
const rowsArb = (n: number): fc.Arbitrary<Row[]> =>
  fc.array(
    fc.record({
      bits: fc.array(fc.constantFrom('0', '1'), { minLength: n, maxLength: n }).map((a) => a.join('')),
      count: fc.oneof(fc.integer({ min: 0, max: 1_000_000 }), fc.integer({ min: 0, max: 4000 }).map((k) => k / 8)),
    }),
    { minLength: 1, maxLength: 40 },
  );
const dumpArb = fc.integer({ min: 1, max: 70 }).chain((n) => rowsArb(n));

function expectedCounts(rows: Row[], withCount: boolean): Counts {
  const m: Counts = new Map();
  for (const r of rows) m.set(r.bits, (m.get(r.bits) ?? 0) + (withCount ? r.count : 1));
  return m;
}

function expectParsed(outcome: ReadOutcome<Counts>, expected: Counts): void {
  if (outcome.ok !== true) throw new Error(`valid file refused: ${outcome.ok === false ? outcome.error.toLine() : 'deferred'}`);
  expect(outcome.value.size).toBe(expected.size);
  for (const [k, v] of expected) closeTo(outcome.value.get(k) ?? NaN, v, 1e-9 * Math.max(1, v), `count of ${k}`);
}

/** CSV text of rows, with extra columns, a random column order and (optionally) quoted cells. */
const csvArb = (quote: boolean): fc.Arbitrary<{ text: string; rows: Row[]; withCount: boolean }> =>
  fc.tuple(dumpArb, fc.boolean(), fc.integer({ min: 0, max: 2 }), fc.integer({ min: 0, max: 3 }), fc.constantFrom('\n', '\r\n'), fc.boolean(), fc.constantFrom('bitstring', 'Bitstring', ' BITSTRING ')).map(
    ([rows, withCount, extra, rot, eol, bom, bitName]) => {
      const names = [bitName, ...(withCount ? ['count'] : []), ...Array.from({ length: extra }, (_, i) => `extra${i}`)];
      const order = names.map((_, i) => (i + rot) % names.length);
      const q = (s: string, i: number): string => (quote && i % 2 === 0 ? `"${s}"` : s);
      const lines = [order.map((i) => names[i]!).join(',')];
      rows.forEach((r, k) => {
        const cells = [r.bits, ...(withCount ? [String(r.count)] : []), ...Array.from({ length: extra }, (_, i) => `x${k}-${i}`)];
        lines.push(order.map((i, j) => q(cells[i]!, j + k)).join(','));
      });
      return { text: (bom ? '\ufeff' : '') + lines.join(eol) + eol, rows, withCount };
    },
  );

describe('sample readers under fuzzing', () => {
  it('readSamples(csv) parses valid dumps to the expected counts on both CSV paths', async () => {
    for (const quote of [false, true]) {
      await fuzzReader(samplesReader('csv', '.csv'), csvArb(quote).map((c) => c.text), quote ? 11 : 12, undefined, 1);
      await fc.assert(
        fc.asyncProperty(csvArb(quote), async ({ text, rows, withCount }) => {
          expectParsed(await readUnderContract(samplesReader('csv', '.csv'), text), expectedCounts(rows, withCount));
          // The path on its own: the fast reader defers on quotes, csv-parse takes everything.
          const fast = await readUnderContract(csvPathReader('fast'), text);
          if (quote && text.includes('"')) expect(fast.ok).toBe('deferred');
          else expectParsed(fast, expectedCounts(rows, withCount));
          expectParsed(await readUnderContract(csvPathReader('csv-parse'), text), expectedCounts(rows, withCount));
        }),
        { seed: quote ? 21 : 22, numRuns: 80 },
      );
    }
  });

  it('readSamples(json) and readSamples(text) parse valid dumps to the expected counts', async () => {
    await fc.assert(
      fc.asyncProperty(dumpArb, fc.constantFrom('\n', '\r\n', ' '), fc.boolean(), async (rows, sep, bom) => {
        const unique = [...expectedCounts(rows, true).entries()];
        const json = (bom ? '\ufeff' : '') + '{' + sep + unique.map(([b, c]) => `"${b}": ${c}`).join(',' + sep) + sep + '}';
        expectParsed(await readUnderContract(samplesReader('json', '.json'), json), new Map(unique));
        const text = (bom ? '\ufeff' : '') + rows.map((r, i) => (i % 5 === 4 ? `# note\n\n${r.bits}` : r.bits)).join(sep === ' ' ? '\n' : sep) + (sep === ' ' ? '' : sep);
        expectParsed(await readUnderContract(samplesReader('text', '.txt'), text), expectedCounts(rows, false));
      }),
      { seed: 31, numRuns: 100 },
    );
  });

  const readers: Array<ReaderUnderTest<Counts>> = [samplesReader('csv', '.csv'), csvPathReader('fast'), csvPathReader('csv-parse'), samplesReader('json', '.json'), samplesReader('text', '.txt')];

  it('readSamples keeps the contract on random bytes for every sample format', async () => {
    let seed = 40;
    for (const r of readers) await fuzzReader(r, noisyBytes(), seed++, undefined, 150);
  });

  it('readSamples keeps the contract on truncated valid files', async () => {
    await fuzzReader(samplesReader('csv', '.csv'), truncated(csvArb(false).map((c) => c.text)), 50);
    await fuzzReader(csvPathReader('csv-parse'), truncated(csvArb(true).map((c) => c.text)), 51);
    const json = dumpArb.map((rows) => '{\n' + rows.map((r) => `"${r.bits}": ${r.count}`).join(',\n') + '\n}');
    await fuzzReader(samplesReader('json', '.json'), truncated(json), 52, (input, o) => {
      // A JSON object cut before its closing brace must never pass as complete.
      if (!input.trimEnd().endsWith('}')) expect(o.ok).toBe(false);
    });
  });

  it('readSamples refuses hostile cells with a located error and never parses them silently', async () => {
    const hostileCount = fc.constantFrom('-1', '-0.5', 'NaN', 'Infinity', '-Infinity', '1e400', '0x10', 'abc', '', '1,5', '1/2', '+-1', '1e', '٣');
    const hostileBits = fc.constantFrom('', '0102', '01 01', '0b0101', '0x', '0xzz', 'NaN', '01010', '010', '=1+1', longLine(9000));
    const base = ['bitstring,count', '0101,3', '1010,2', '0011,1'];
    await fuzzReader(
      samplesReader('csv', '.csv'),
      fc.oneof(
        fc.tuple(fc.integer({ min: 1, max: 3 }), hostileCount).map(([i, c]) => base.map((l, k) => (k === i ? `${l.split(',')[0]},${c}` : l)).join('\n')),
        fc.tuple(fc.integer({ min: 1, max: 3 }), hostileBits).map(([i, b]) => base.map((l, k) => (k === i ? `${b},1` : l)).join('\n')),
      ),
      60,
      (_input, o) => {
        expect(o.ok).toBe(false);
        if (o.ok === false) expect(['bad-samples', 'bad-bitstring', 'inconsistent-length']).toContain(o.error.code);
      },
      60,
    );
    await fuzzReader(
      samplesReader('json', '.json'),
      hostileCount.filter((c) => c !== '' && c !== '1,5').map((c) => `{"0101": 3,\n"1010": ${c}}`),
      61,
      (_input, o) => expect(o.ok).toBe(false),
      30,
    );
  });

  it('readSamples keeps the contract on header-level damage: missing, duplicate, header-only, ragged rows, long lines', async () => {
    const variants = fc.constantFrom(
      'bitstring,count\n',
      'bitstring,count',
      'count\n5\n',
      'bitstring,bitstring\n0101,0101\n',
      'bitstring,count,count\n0101,1,1\n',
      'bitstring,count\n0101\n',
      'bitstring,count\n0101,1,7\n',
      '\n\n\n',
      'bitstring,count\n0101,1\n' + longLine(MAX_LINE_CHARS + 10) + '\n',
      'bitstring,count\n0101,1\n"' + longLine(MAX_LINE_CHARS + 10) + '",1\n',
      'bitstring,count\n"0101,1\n',
      'bitstring,count\n0101,1\r1010,1\r',
    );
    await fuzzReader(samplesReader('csv', '.csv'), fc.tuple(variants, fc.boolean()).map(([v, bom]) => (bom ? '\ufeff' : '') + v), 70, (input, o) => {
      if (input.includes('count\n5') || input.includes('bitstring,bitstring') || input.includes('count,count') || input.includes(longLine(MAX_LINE_CHARS))) expect(o.ok).toBe(false);
    }, 40);
    await fuzzReader(samplesReader('text', '.txt'), fc.constantFrom('', '\n\n', '# only a comment\n', longLine(MAX_LINE_CHARS + 5), '0101\n' + longLine(MAX_LINE_CHARS + 5, 'x')), 71, undefined, 20);
    await fuzzReader(samplesReader('json', '.json'), fc.constantFrom('', '{}', '[]', '{"' + longLine(MAX_LINE_CHARS + 5) + '": 1}', '{"0101": ' + longLine(100, '9') + '}', '{"01\\u0030": 1}', '{"0101": 1} {"0101": 1}'), 72, undefined, 20);
  });

  it('readSamples reads CSV with lone CR line ends through csv-parse and refuses them in text with a hint', async () => {
    const rows = [{ bits: '0101', count: 3 }, { bits: '1010', count: 2 }, { bits: '0101', count: 1 }];
    const csv = ['bitstring,count', ...rows.map((r) => `${r.bits},${r.count}`)].join('\r') + '\r';
    expectParsed(await readUnderContract(samplesReader('csv', '.csv'), csv), expectedCounts(rows, true));
    expect((await readUnderContract(csvPathReader('fast'), csv)).ok).toBe('deferred');
    const text = await readUnderContract(samplesReader('text', '.txt'), '0101\r1010\r');
    expect(text.ok).toBe(false);
    if (text.ok === false) expect([text.error.code, text.error.line, text.error.hint]).toEqual(['bad-samples', 1, 'save the file with LF or CRLF line ends']);
  });

  it('readSamples refuses counts whose total overflows the double range, on the row that overflows', async () => {
    for (const [r, text] of [
      [samplesReader('csv', '.csv'), 'bitstring,count\n01,1e308\n10,1e308\n'],
      [samplesReader('json', '.json'), '{"01": 1e308,\n "01": 1e308}'],
    ] as const) {
      const o = await readUnderContract(r, text);
      expect(o.ok).toBe(false);
      if (o.ok === false) expect([o.error.code, o.error.line]).toEqual(['bad-samples', r.ext === '.csv' ? 3 : 2]);
    }
  });

  it('readSamples accepts mixed LF and CRLF line ends with a BOM in every format', async () => {
    await fc.assert(
      fc.asyncProperty(dumpArb.chain((rows) => fc.tuple(fc.constant(rows), withLineEnds(['bitstring,count', ...rows.map((r) => `${r.bits},${r.count}`)]), withLineEnds(rows.map((r) => r.bits)))), async ([rows, csv, text]) => {
        expectParsed(await readUnderContract(samplesReader('csv', '.csv'), csv), expectedCounts(rows, true));
        expectParsed(await readUnderContract(samplesReader('text', '.txt'), text), expectedCounts(rows, false));
      }),
      { seed: 80, numRuns: 60 },
    );
  });
});

// ---- Hamiltonians ----

interface Term {
  coeff: number;
  ops: Array<['X' | 'Y' | 'Z' | 'I', number]>;
}
const termArb = (qubits: number): fc.Arbitrary<Term> =>
  fc.record({
    coeff: fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }),
    ops: fc.uniqueArray(fc.integer({ min: 0, max: qubits - 1 }), { maxLength: Math.min(qubits, 6) }).chain((qs) =>
      fc.array(fc.constantFrom<'X' | 'Y' | 'Z' | 'I'>('X', 'Y', 'Z', 'I'), { minLength: qs.length, maxLength: qs.length }).map((ps) => qs.map((q, i) => [ps[i]!, q] as ['X' | 'Y' | 'Z' | 'I', number])),
    ),
  });
const hamArb = fc.integer({ min: 1, max: 70 }).chain((n) => fc.tuple(fc.constant(n), fc.array(termArb(n), { minLength: 1, maxLength: 25 })));

/** Like terms combined by the test itself: key is the sorted non-identity factors. */
function expectedTerms(terms: Term[]): { constant: number; terms: Map<string, number> } {
  let constant = 0;
  const m = new Map<string, number>();
  for (const t of terms) {
    const key = t.ops.filter(([p]) => p !== 'I').sort((a, b) => a[1] - b[1]).map(([p, q]) => `${p}${q}`).join(' ');
    if (key === '') constant += t.coeff;
    else m.set(key, (m.get(key) ?? 0) + t.coeff);
  }
  return { constant, terms: m };
}

function expectHamiltonian(o: ReadOutcome<PauliSum>, terms: Term[], qubits: number): void {
  if (o.ok !== true) throw new Error(`valid Hamiltonian refused: ${o.ok === false ? o.error.toLine() : 'deferred'}`);
  const want = expectedTerms(terms);
  const scale = 1e-9 * Math.max(1, ...terms.map((t) => Math.abs(t.coeff)));
  closeTo(o.value.constant, want.constant, scale, 'constant');
  const got = new Map(o.value.terms.map((t) => [formatPauliOps(t), t.coeff]));
  for (const [k, c] of want.terms) if (c !== 0) closeTo(got.get(k) ?? 0, c, scale, `coefficient of ${k}`);
  for (const k of got.keys()) expect(want.terms.has(k), `unexpected term ${k}`).toBe(true);
  expect(o.value.qubits).toBe(qubits);
}

describe('Hamiltonian readers under fuzzing', () => {
  it('readHamiltonian parses valid text and JSON files to the expected terms', async () => {
    await fc.assert(
      fc.asyncProperty(hamArb, fc.boolean(), async ([n, terms], bom) => {
        const lines = [`qubits ${n}`, '# generated', ...terms.map((t) => [String(t.coeff), ...t.ops.map(([p, q]) => `${p}${q}`)].join(' '))];
        const text = await fc.sample(withLineEnds(lines), { seed: n, numRuns: 1 })[0]!;
        expectHamiltonian(await readUnderContract(hamiltonianReader('.txt'), text), terms, n);
        const json = (bom ? '\ufeff' : '') + JSON.stringify({ qubits: n, terms: terms.map((t) => ({ coeff: t.coeff, ops: t.ops.map(([p, q]) => `${p}${q}`).join(' ') })) }, null, 1);
        expectHamiltonian(await readUnderContract(hamiltonianReader('.json'), json), terms, n);
      }),
      { seed: 90, numRuns: 100 },
    );
  });

  it('readHamiltonian keeps the contract on random bytes and truncated files', async () => {
    await fuzzReader(hamiltonianReader('.txt'), noisyBytes(), 91);
    await fuzzReader(hamiltonianReader('.json'), noisyBytes(), 92);
    const text = hamArb.map(([n, terms]) => [`qubits ${n}`, ...terms.map((t) => [String(t.coeff), ...t.ops.map(([p, q]) => `${p}${q}`)].join(' '))].join('\n'));
    await fuzzReader(hamiltonianReader('.txt'), truncated(text), 93);
    const json = hamArb.map(([n, terms]) => JSON.stringify({ qubits: n, terms: terms.map((t) => ({ coeff: t.coeff, ops: t.ops.map(([p, q]) => `${p}${q}`).join(' ') })) }));
    await fuzzReader(hamiltonianReader('.json'), truncated(json), 94, (input, o) => {
      if (!input.endsWith('}')) expect(o.ok).toBe(false);
    });
  });

  it('readHamiltonian refuses NaN/Infinity/non-decimal coefficients and absurd qubit indices on the right line', async () => {
    const badCoeff = fc.constantFrom('NaN', 'Infinity', '-Infinity', 'inf', '1e400', '0x10', '1/2', 'Math.PI', '1+2j', '(1,0)', '1_000', '2**3', '', '--1', 'process.exit(3)');
    const badOps = fc.constantFrom('X99999999999999999999', 'X8192', 'Q0', 'X-1', 'X0 X0', 'x0', 'X', 'X1.5', 'Z' + '9'.repeat(400));
    const base = ['qubits 8', '0.5 X0 X1', '0.5 Y0 Y1', '-1 Z2'];
    await fuzzReader(
      hamiltonianReader('.txt'),
      fc.oneof(
        fc.tuple(badCoeff.filter((c) => c !== ''), fc.integer({ min: 1, max: 3 })).map(([c, i]) => ({ text: base.map((l, k) => (k === i ? `${c} Z0` : l)).join('\n'), line: i + 1 })),
        fc.tuple(badOps, fc.integer({ min: 1, max: 3 })).map(([ops, i]) => ({ text: base.map((l, k) => (k === i ? `0.5 ${ops}` : l)).join('\n'), line: i + 1 })),
      ).map((c) => c.text + `\n# line ${c.line}`),
      100,
      (input, o) => {
        expect(o.ok).toBe(false);
        if (o.ok === false) {
          expect(o.error.code).toBe('bad-hamiltonian');
          expect(o.error.line).toBe(Number(/# line (\d+)$/.exec(input)![1]));
        }
      },
      60,
    );
    await fuzzReader(
      hamiltonianReader('.json'),
      fc.oneof(
        badCoeff.map((c) => JSON.stringify({ terms: [{ coeff: 1, ops: 'Z0' }, { coeff: c, ops: 'X0' }] })),
        badOps.map((ops) => JSON.stringify({ qubits: 8, terms: [{ coeff: 1, ops }] })),
        fc.constantFrom('{"terms": [{"coeff": 1e999, "ops": "Z0"}]}', '{"terms": [{"coeff": [1, 0], "ops": "Z0"}]}', '{"qubits": 1e9, "terms": [{"coeff": 1, "ops": "Z0"}]}', '{"qubits": -3, "terms": []}', '{"terms": {}}', '[]', 'null', '{"terms": [null]}'),
      ),
      101,
      (_i, o) => expect(o.ok).toBe(false),
      60,
    );
  });

  it('readHamiltonian names the line of the offending term in a JSON Hamiltonian', async () => {
    const text = '{\n "qubits": 4,\n "terms": [\n  {"coeff": 1, "ops": "Z0"},\n  {"coeff": 1,\n   "ops": "X9"}\n ]\n}';
    const o = await readUnderContract(hamiltonianReader('.json'), text);
    expect(o.ok === false && [o.error.code, o.error.line]).toEqual(['bad-hamiltonian', 6]);
    const q = await readUnderContract(hamiltonianReader('.json'), '{\n "terms": [],\n\n "qubits": "4"}');
    expect(q.ok === false && [q.error.code, q.error.line]).toEqual(['bad-hamiltonian', 4]);
  });

  it('readHamiltonian refuses like terms whose coefficients sum beyond the double range', async () => {
    for (const [ext, text] of [
      ['.txt', '1.7e308 Z0\n1.7e308 Z0\n'],
      ['.txt', '1.7e308\n1.7e308\n'],
      ['.json', JSON.stringify({ terms: [{ coeff: 1.7e308, ops: 'X1' }, { coeff: 1.7e308, ops: 'X1' }] })],
    ] as const) {
      const o = await readUnderContract(hamiltonianReader(ext), text);
      expect(o.ok, text).toBe(false);
      if (o.ok === false) expect(o.error.code).toBe('bad-hamiltonian');
    }
  });

  it('readHamiltonian refuses a line over MAX_LINE_CHARS as a Hamiltonian error on that line', async () => {
    const o = await readUnderContract(hamiltonianReader('.txt'), '1 Z0\n' + longLine(MAX_LINE_CHARS + 10, ' ') + 'X1\n');
    expect(o.ok).toBe(false);
    if (o.ok === false) expect([o.error.code, o.error.line]).toEqual(['bad-hamiltonian', 2]);
  });

  it('readHamiltonian reads empty, comment-only and header-only files as file-empty', async () => {
    for (const [ext, text] of [['.txt', '\ufeff'], ['.txt', '# nothing\n\n'], ['.txt', 'qubits 4\r\n'], ['.json', '{"qubits": 4, "terms": []}'], ['.json', ' ']] as const) {
      const o = await readUnderContract(hamiltonianReader(ext), text);
      expect(o.ok, JSON.stringify(text)).toBe(false);
      if (o.ok === false) expect(['file-empty', 'bad-hamiltonian']).toContain(o.error.code);
    }
  });
});

// BitspanError import kept explicit: error outcomes are typed by it.
export type { BitspanError };
