import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { spawnSync } from 'node:child_process';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli, tempDir, writeFiles } from '../helpers.js';
import { noisyBytes } from '../io/fuzzHarness.js';

const HEIS4 = 'qubits 4\n' + [0, 1, 2, 3].flatMap((i) => ['X', 'Y', 'Z'].map((o) => `0.25 ${o}${i} ${o}${(i + 1) % 4}`)).join('\n') + '\n';
const GOOD_CSV = 'bitstring,count\n0101,5\n1010,5\n0011,2\n';
const EARLIER = '{"earlier": true}\n';

/** Malformed inputs a user could hand over: [file name, content]; the other input is valid. */
const BAD_SAMPLES: Array<[string, string]> = [
  ['neg.csv', 'bitstring,count\n0101,-3\n'],
  ['frac-neg.csv', 'bitstring,count\n0101,-0.5\n'],
  ['nan.csv', 'bitstring,count\n0101,NaN\n'],
  ['huge.csv', 'bitstring,count\n0101,1e999\n'],
  ['hex.csv', 'bitstring,count\n0101,0x10\n'],
  ['dup.csv', 'bitstring,bitstring,count\n0101,0101,1\n'],
  ['nocol.csv', 'shots,count\n0101,1\n'],
  ['header.csv', 'bitstring,count\r\n'],
  ['ragged.csv', 'bitstring,count\n0101,1,2\n'],
  ['quote.csv', 'bitstring,count\n"0101,1\n'],
  ['bom-bad.csv', '\ufeffbitstring,count\n01z1,1\n'],
  ['len.txt', '0101\r\n01010\n'],
  ['long.txt', '0'.repeat((1 << 20) + 5)],
  ['empty.txt', ''],
  ['trunc.json', '{"0101": 3, "1010"'],
  ['str.json', '{"0101": "3"}'],
  ['arr.json', '[["0101", 3]]'],
  ['formula.csv', 'bitstring,count\n=HYPERLINK("x"),1\n'],
];
const BAD_HAMILTONIANS: Array<[string, string]> = [
  ['nan.txt', 'qubits 4\nNaN Z0\n'],
  ['inf.txt', 'Infinity Z0\n'],
  ['expr.txt', 'Math.PI Z0\n'],
  ['frac.txt', '1/2 Z0\n'],
  ['idx.txt', '1 X99999999999999999999\n'],
  ['idx2.txt', 'qubits 4\n1 X4\n'],
  ['twice.txt', '1 X0 X0\n'],
  ['overflow.txt', '1.7e308 Z1\n1.7e308 Z1\n'],
  ['bytes.txt', '\u0000\u0001\u0002'],
  ['trunc.json', '{"qubits": 4, "terms": [{"coeff": 1, "ops": "Z0"'],
  ['complex.json', '{"terms": [{"coeff": [1, 2], "ops": "Z0"}]}'],
  ['empty.json', ''],
];

function expectOneLineFailure(r: { status: number; stdout: string; stderr: string }, what: string): void {
  expect(r.status, `${what}: ${r.stderr}`).toBe(2);
  expect(r.stderr.trim().split('\n'), what).toHaveLength(1);
  expect(r.stderr, what).toMatch(/^bitspan: error: /);
  expect(r.stderr, what).not.toMatch(/\n\s+at |internal error/);
  expect(r.stdout, what).toBe('');
}

describe('bitspan solve on malformed input', () => {
  it('runCli exits 2 with one line and leaves the earlier --out file untouched for every malformed file', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS4, 'good.csv': GOOD_CSV });
    const out = join(dir, 'result.json');
    const cases: Array<[string, string[]]> = [
      ...BAD_SAMPLES.map(([name, text]): [string, string[]] => [name, ['--hamiltonian', f['h.txt']!, '--samples', writeFiles(dir, { [name]: text })[name]!]]),
      ...BAD_HAMILTONIANS.map(([name, text]): [string, string[]] => [name, ['--hamiltonian', writeFiles(dir, { [`h-${name}`]: text })[`h-${name}`]!, '--samples', f['good.csv']!]]),
    ];
    for (const [name, args] of cases) {
      writeFileSync(out, EARLIER);
      const r = await runCli(['solve', ...args, '--out', out]);
      expectOneLineFailure(r, name);
      expect(r.stderr, name).toContain(name);
      expect(readFileSync(out, 'utf8'), name).toBe(EARLIER);
    }
    expect(readdirSync(dir).filter((n) => n.includes('.tmp-'))).toEqual([]);
  });

  it('runCli on random sample bytes exits 0 or 2, never 1, and writes --out only on success', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS4 });
    let n = 0;
    await fc.assert(
      fc.asyncProperty(noisyBytes(200), fc.constantFrom('.csv', '.json', '.txt'), async (bytes, ext) => {
        const samples = join(dir, `s${n}${ext}`);
        const out = join(dir, `r${n++}.json`);
        writeFileSync(samples, bytes);
        writeFileSync(out, EARLIER);
        const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', samples, '--out', out, '--json']);
        if (r.status === 0) expect(JSON.parse(readFileSync(out, 'utf8')).dimension).toBeGreaterThan(0);
        else {
          expectOneLineFailure(r, JSON.stringify(Buffer.from(bytes).toString('latin1')));
          expect(readFileSync(out, 'utf8')).toBe(EARLIER);
        }
      }),
      { seed: 7, numRuns: 120 },
    );
  });

  it('runCli refuses a run over --memory with too-large and names the options that help', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS4, 'good.csv': GOOD_CSV });
    const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['good.csv']!, '--memory', '64']);
    expectOneLineFailure(r, '--memory 64');
    expect(r.stderr).toContain('--max-dim');
    expect(r.stderr).toContain('--memory');
    expect(r.stderr).toMatch(/over the 64 bytes budget/);
    for (const size of ['lots', '0', '0.1']) {
      const bad = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['good.csv']!, '--memory', size]);
      expectOneLineFailure(bad, `--memory ${size}`);
      expect(bad.stderr).toContain('--memory');
    }
  });

  it('runCli between the matrix-free and the stored footprint applies H matrix-free with the same energy', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS4, 'good.csv': GOOD_CSV });
    const stored = JSON.parse((await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['good.csv']!, '--json'])).stdout);
    expect(stored.storage).toBe('stored');
    // A budget just below the stored estimate but above the matrix-free one.
    const budget = stored.memory.estimatedBytes - 1;
    const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['good.csv']!, '--json', '--memory', String(budget)]);
    expect(r.status, r.stderr).toBe(0);
    const free = JSON.parse(r.stdout);
    expect(free.storage).toBe('matrix-free');
    expect(free.memory.reason).toContain('would exceed');
    expect(Math.abs(free.energies[0] - stored.energies[0])).toBeLessThan(1e-10);
  });

  it('bin.js (compiled, real process) exits 2 with one line and writes nothing on a malformed dump', () => {
    const bin = join(process.cwd(), 'dist/src/cli/bin.js');
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS4, 'bad.json': '{"0101": 3,\n"1010": -1}' });
    const out = join(dir, 'result.json');
    writeFileSync(out, EARLIER);
    const r = spawnSync(process.execPath, [bin, 'solve', '--hamiltonian', f['h.txt']!, '--samples', f['bad.json']!, '--out', out], { encoding: 'utf8' });
    expectOneLineFailure({ status: r.status ?? -1, stdout: r.stdout, stderr: r.stderr }, 'bad.json');
    expect(r.stderr).toContain('bad.json:2');
    expect(readFileSync(out, 'utf8')).toBe(EARLIER);
    expect(readdirSync(dir).sort()).toEqual(['bad.json', 'h.txt', 'result.json']);
  });
});
