import { describe, expect, it } from 'vitest';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { simulate, dumpCsv, noisyMatricesPath } from '../../src/pipeline/simulate.js';
import { runCli, tempDir, writeFiles } from '../helpers.js';

const RING6 = 'qubits 6\n' + [0, 1, 2, 3, 4, 5].map((i) => { const j = (i + 1) % 6; return `0.25 X${Math.min(i, j)} X${Math.max(i, j)}\n0.25 Y${Math.min(i, j)} Y${Math.max(i, j)}\n0.25 Z${Math.min(i, j)} Z${Math.max(i, j)}\n`; }).join('');

function readDump(file: string): Map<string, number> {
  const lines = readFileSync(file, 'utf8').trim().split('\n');
  expect(lines[0]).toBe('bitstring,count');
  return new Map(lines.slice(1).map((l) => { const [b, c] = l.split(','); return [b!, Number(c)]; }));
}

describe('simulate', () => {
  it('simulate writes DIR/t0.csv … t<R−1>.csv in the format solve reads, per the command-line contract', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': RING6 });
    const out = join(dir, 'dumps');
    const r = await runCli(['simulate', '--hamiltonian', f['h.txt']!, '--initial', 'neel', '--dt', '0.3', '--steps', '4', '--shots', '500', '--evolution', 'trotter2', '--trotter-steps', '2', '--readout-error', '0.01,0.02', '--flip-noise', '0.001', '--seed', '5', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    for (let k = 0; k < 4; k++) {
      const d = readDump(join(out, `t${k}.csv`));
      expect([...d.values()].reduce((a, b) => a + b, 0)).toBe(500);
      for (const b of d.keys()) expect(b).toMatch(/^[01]{6}$/);
    }
    expect(existsSync(join(out, 't4.csv'))).toBe(false);
    const manifest = JSON.parse(readFileSync(join(out, 'simulate.json'), 'utf8'));
    expect(manifest.dumps.map((d: { time: number }) => d.time)).toEqual([0, 0.3, 0.6, 0.9]);
    expect(manifest.initial.bitstring).toBe('101010');
    const s = await runCli(['solve', '--hamiltonian', f['h.txt']!, '--samples', ...[0, 1, 2, 3].map((k) => join(out, `t${k}.csv`)), '--weight', '3', '--json']);
    expect(s.status, s.stderr).toBe(0);
    expect(JSON.parse(s.stdout).samples.groups).toHaveLength(4);
  });

  it('simulate without noise measures the initial bitstring at t = 0 only, and is reproducible per seed', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': RING6 });
    const run = (seed: string, out: string) => runCli(['simulate', '--hamiltonian', f['h.txt']!, '--initial', '110100', '--dt', '0.5', '--steps', '3', '--shots', '300', '--seed', seed, '--out', join(dir, out)]);
    expect((await run('9', 'a')).status).toBe(0);
    expect((await run('9', 'b')).status).toBe(0);
    expect((await run('10', 'c')).status).toBe(0);
    expect([...readDump(join(dir, 'a', 't0.csv'))]).toEqual([['110100', 300]]);
    const a2 = readFileSync(join(dir, 'a', 't2.csv'), 'utf8');
    expect(readFileSync(join(dir, 'b', 't2.csv'), 'utf8')).toBe(a2);
    expect(readFileSync(join(dir, 'c', 't2.csv'), 'utf8')).not.toBe(a2);
    // The Heisenberg ring conserves the number of up spins: every noiseless shot keeps weight 3.
    for (const b of readDump(join(dir, 'a', 't2.csv')).keys()) expect(b.split('1').length - 1).toBe(3);
  });

  it('simulate reports ⟨H⟩ with its spread, conserved by exact evolution', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': RING6 });
    const seen: number[] = [];
    const rep = await simulate({
      hamiltonian: f['h.txt']!,
      initial: 'neel',
      dt: 0.4,
      steps: 3,
      shots: 10,
      evolution: 'exact',
      seed: 1,
      out: join(dir, 'o'),
      energy: true,
      // The hook sees every evolved state with kernels that act on it.
      onState: (s, kernels) => {
        seen.push(s.k);
        expect(kernels.energyMoments(s.state).first).toBeCloseTo(-1.5, 10);
      },
    });
    expect(seen).toEqual([0, 1, 2]);
    // Néel on a 6-ring: ⟨H⟩ = −6/4, and ‖Hψ − ⟨H⟩ψ‖² = 6 flip-flop amplitudes of 1/2 (hand-derived).
    for (const d of rep.dumps) {
      expect(d.energy!).toBeCloseTo(-1.5, 10);
      expect(d.spread!).toBeCloseTo(Math.sqrt(6 * 0.25), 10);
    }
  });

  it('simulate refuses bad flags and inputs with exit status 2 and one line', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': RING6, 'big.txt': 'qubits 40\n1 Z0 Z39\n' });
    const base = ['simulate', '--hamiltonian', f['h.txt']!, '--dt', '0.1', '--steps', '2', '--shots', '10', '--seed', '1', '--out', join(dir, 'x')];
    for (const extra of [['--initial', '0101'], ['--initial', 'neel', '--readout-error', '0.1,2'], ['--initial', 'neel', '--evolution', 'trotter3'], ['--initial', 'neel', '--flip-noise', '-1']]) {
      const r = await runCli([...base, ...extra]);
      expect(r.status).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
    const big = await runCli(['simulate', '--hamiltonian', f['big.txt']!, '--initial', 'zeros', '--dt', '0.1', '--steps', '2', '--shots', '10', '--seed', '1', '--out', join(dir, 'y')]);
    expect(big.status).toBe(2);
    expect(big.stderr).toMatch(/at most 30 qubits/);
    await expect(simulate({ hamiltonian: f['big.txt']!, initial: 'zeros', dt: 0.1, steps: 2, shots: 1, evolution: 'exact', seed: 1, out: join(dir, 'z') })).rejects.toMatchObject({ code: 'too-large' });
  });
});

describe('dumpCsv', () => {
  it('dumpCsv lists the most frequent configuration first, ties by bitstring', () => {
    const text = dumpCsv({ configs: Uint32Array.of(1, 2, 5), counts: Float64Array.of(3, 7, 3) }, 4);
    expect(text).toBe('bitstring,count\n0010,7\n0001,3\n0101,3\n');
  });
  it('simulate with --krylov-matrices and --matrix-shots writes the same dumps as without, and reports the files', async () => {
    const dir = tempDir();
    const f = writeFiles(dir, { 'h.txt': RING6 });
    const base = ['simulate', '--hamiltonian', f['h.txt']!, '--initial', 'neel', '--dt', '0.4', '--steps', '3', '--shots', '400', '--seed', '8'];
    expect((await runCli([...base, '--out', join(dir, 'a')])).status).toBe(0);
    const withMatrices = await runCli([...base, '--out', join(dir, 'b'), '--krylov-matrices', join(dir, 'k.json'), '--matrix-shots', '500', '--json']);
    expect(withMatrices.status, withMatrices.stderr).toBe(0);
    // The matrix noise has a stream of its own, so the dumps are byte for byte the same.
    for (let k = 0; k < 3; k++) expect(readFileSync(join(dir, 'b', `t${k}.csv`), 'utf8')).toBe(readFileSync(join(dir, 'a', `t${k}.csv`), 'utf8'));
    const report = JSON.parse(withMatrices.stdout);
    expect(report.krylovMatrices.file).toBe(join(dir, 'k.json'));
    expect(report.krylovMatrices.noisyFile).toBe(join(dir, 'k.noisy.json'));
    expect(report.krylovMatrices.matrixShots).toBe(500);
    // λ = Σ|c| = 18 terms × 0.25 for the ring.
    expect(report.krylovMatrices.pauliNorm).toBeCloseTo(4.5, 12);
    expect(existsSync(join(dir, 'k.noisy.json'))).toBe(true);
  });
  it('noisyMatricesPath puts .noisy before the extension, or at the end when there is none', () => {
    expect(noisyMatricesPath('out/krylov.json')).toBe('out/krylov.noisy.json');
    expect(noisyMatricesPath('out.d/krylov')).toBe('out.d/krylov.noisy');
  });
});
