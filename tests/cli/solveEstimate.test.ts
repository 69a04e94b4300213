import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli, tempDir, writeFiles } from '../helpers.js';

const HEIS6 = 'qubits 6\n' + [0, 1, 2, 3, 4, 5].flatMap((i) => ['X', 'Y', 'Z'].map((o) => `0.25 ${o}${i} ${o}${(i + 1) % 6}`)).join('\n') + '\n';
const SAMPLES = 'bitstring,count\n010101,20\n101010,18\n011001,3\n100110,4\n001011,2\n110001,1\n011010,3\n';
// Six-site ring, Sz = 0 sector: E0 = −2.8027756377 (Σ S·S, exact diagonalisation, from memory;
// the --exact runs below recompute it over the whole sector).
const E6 = -2.8027756377;

describe('bitspan solve --estimate (CLI)', () => {
  it('solve --estimate adds variance, pt2 and bounds {upper, weinstein, katoTemple with --gap} to the JSON', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS6, 's.csv': SAMPLES });
    const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.csv']!, '--weight', '3', '--estimate', '--gap', '0.5', '--exact', '--json']);
    expect(r.status).toBe(0);
    const o = JSON.parse(r.stdout);
    expect(typeof o.variance).toBe('number');
    expect(typeof o.pt2).toBe('number');
    expect(o.variance).toBeGreaterThan(0);
    expect(o.pt2).toBeLessThan(0);
    expect(o.bounds.upper).toBe(o.energies[0]);
    const [lo, hi] = o.bounds.weinstein;
    closeEnough(hi - o.energies[0], Math.sqrt(o.variance));
    closeEnough(o.energies[0] - lo, Math.sqrt(o.variance));
    expect(o.reference.energy).toBeCloseTo(E6, 8);
    expect(o.error.absolute).toBeCloseTo(o.energies[0] - E6, 8);
    expect(o.sampling.groups).toHaveLength(1);
    // The six-site gap (singlet–triplet, about 0.70 in Σ S·S units) exceeds 2σ here only if the state
    // is good: either a Kato–Temple interval containing E0 or a note why not.
    if (o.bounds.katoTemple) expect(o.bounds.katoTemple[0]).toBeLessThanOrEqual(E6 + 1e-9);
    else expect(o.bounds.katoTempleNote).toMatch(/gap/);
  });

  it('solve --expand 1 on the full sector gives an exact eigenvector: variance 0 and a Kato–Temple interval of width 0', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS6, 's.csv': SAMPLES });
    const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.csv']!, '--weight', '3', '--expand', '3', '--estimate', '--gap', '0.5', '--json']);
    const o = JSON.parse(r.stdout);
    expect(o.dimension).toBe(20); // C(6,3): expansion reached the whole sector
    expect(o.expansion.mode).toBe('connected');
    expect(o.energies[0]).toBeCloseTo(E6, 9);
    expect(o.variance).toBeLessThan(1e-16);
    expect(o.bounds.katoTemple[1] - o.bounds.katoTemple[0]).toBeLessThan(1e-15);
  });

  it('solve --save-state writes a state that --start-state restarts from; --observables prints the caveat; --plot writes a PNG', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS6, 's.csv': SAMPLES, 'obs.txt': '1 Z0 Z1\n1 X0 X1\n' });
    const state = join(dir, 'state.csv');
    const plot = join(dir, 'z.png');
    // The shipped 16-qubit quick-start case (D = 3000): a restart from the saved ground state needs
    // fewer matrix-vector products than a random start (one Lanczos block instead of several).
    const qs = ['--hamiltonian', 'fixtures/quickstart/heisenberg.txt', '--samples', 'fixtures/quickstart/samples.csv', '--weight', '8'];
    const first = await runCli(['solve', ...qs, '--save-state', state, '--json']);
    const a = JSON.parse(first.stdout);
    expect(readFileSync(state, 'utf8').split('\n')[0]).toBe('bitstring,re,im,probability');
    const second = await runCli(['solve', ...qs, '--start-state', state, '--json']);
    const b = JSON.parse(second.stdout);
    expect(b.startState.used).toBe(true);
    expect(b.energies[0]).toBeCloseTo(a.energies[0], 9);
    expect(b.matvecs).toBeLessThan(a.matvecs);
    const text = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.csv']!, '--weight', '3', '--observables', f['obs.txt']!, '--plot', plot]);
    expect(text.status).toBe(0);
    expect(text.stdout).toMatch(/caveat: .*off-diagonal/);
    expect(text.stdout).toMatch(/<1 X0 X1> = .*\(off-diagonal\)/);
    expect(readFileSync(plot).subarray(1, 4).toString()).toBe('PNG');
  });

  it('solve --batches reports the spread of seeded batch energies, each at or above the full-subspace energy', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS6, 's.csv': SAMPLES });
    const r = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.csv']!, '--weight', '3', '--batches', '4', '--batch-size', '4', '--json']);
    const o = JSON.parse(r.stdout);
    expect(o.batches.energies).toHaveLength(4);
    expect(o.batches.dimensions).toEqual([4, 4, 4, 4]);
    // Interlacing: a sub-basis cannot go below the full subspace's lowest energy.
    for (const e of o.batches.energies) expect(e).toBeGreaterThanOrEqual(o.energies[0] - 1e-10);
    expect(o.batches.std).toBeGreaterThanOrEqual(0);
  });

  it('solve exits 2 with one line for inconsistent analysis flags and bad observables', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': HEIS6, 's.csv': SAMPLES, 'obs.txt': '1 Z9\n', 'bad.txt': '1 W0\n' });
    const base = ['solve', '--hamiltonian', f['h.txt']!, '--samples', f['s.csv']!, '--weight', '3'];
    const cases: Array<[string[], RegExp]> = [
      [['--batches', '3'], /go together/],
      [['--expand-threshold', '0.1'], /need --expand/],
      [['--observables', f['obs.txt']!], /obs\.txt:1: .*qubit 9/],
      [['--observables', f['bad.txt']!], /bad\.txt:1: /],
      [['--plot', join(dir, 'z.gif')], /\.svg or \.png/],
      [['--start-state', f['s.csv']!], /'bitstring' and 're'/],
    ];
    for (const [extra, msg] of cases) {
      const r = await runCli([...base, ...extra]);
      expect(r.status, extra.join(' ')).toBe(2);
      expect(r.stderr).toMatch(msg);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
  });
});

function closeEnough(a: number, b: number): void {
  expect(Math.abs(a - b)).toBeLessThan(1e-12 * (1 + Math.abs(b)));
}
