import { describe, expect, it } from 'vitest';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import type { ComplexMatrix } from '../../src/solvers/complexMatrix.js';
import { addHermitianNoise, closeTo, heisenbergKrylov, runCli, tempDir, writeFiles } from '../helpers.js';

const fx = await heisenbergKrylov(4, 0.3, 8);
const noisyH = addHermitianNoise(fx.h, 9e-4, 1);
const noisyS = addHermitianNoise(fx.s, 1e-4, 2);
const pairs = (a: ComplexMatrix): number[][][] => Array.from({ length: a.n }, (_, j) => Array.from({ length: a.n }, (_, k) => [a.re[j * a.n + k]!, a.im[j * a.n + k]!]));
const csvOf = (a: ComplexMatrix): string => pairs(a).map((row) => row.flat().join(',')).join('\n') + '\n';
const errs = (n: number, x: number): number[][] => Array.from({ length: n }, () => new Array<number>(n).fill(x));

function files(): Record<string, string> {
  return writeFiles(tempDir(), {
    'k.json': JSON.stringify({ h: pairs(noisyH), s: pairs(noisyS), hErr: errs(8, 9e-4), sErr: errs(8, 1e-4) }),
    'h.csv': csvOf(noisyH),
    's.csv': 'header,is,allowed,here,and,ignored,x,y,a,b,c,d,e,f,g,h\n' + csvOf(noisyS),
    'he.csv': errs(8, 9e-4).map((r) => r.join(',')).join('\n') + '\n',
    'se.csv': errs(8, 1e-4).map((r) => r.join(',')).join('\n') + '\n',
  });
}

describe('bitspan krylov', () => {
  it('krylov --json prints the contract keys; CSV input gives the same answer as JSON', async () => {
    const f = files();
    const a = await runCli(['krylov', '--matrices', f['k.json']!, '--json', '--scan', '--eigs', '2', '--bootstrap', '50']);
    expect(a.status, a.stderr).toBe(0);
    const r = JSON.parse(a.stdout);
    for (const key of ['energies', 'residuals', 'keptDimension', 'threshold', 'scan', 'plateau', 'bootstrap', 'dimensionScan', 'unregularised', 'condition']) expect(r).toHaveProperty(key);
    expect(r.energies.length).toBe(2);
    expect(r.plateau).toHaveProperty('threshold');
    expect(r.plateau).toHaveProperty('energy');
    expect(r.scan.length).toBeGreaterThan(100);
    expect(r.scan[0]).toHaveProperty('keptDimension');
    expect(r.dimensionScan.map((d: { dimension: number }) => d.dimension)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    // Within the bootstrap spread of the exact value (ml-matrix eigenvalue of the mathjs-built H).
    closeTo(r.energies[0], fx.exactGround, 4 * r.bootstrap.std, 'E0');
    const b = await runCli(['krylov', '--h', f['h.csv']!, '--s', f['s.csv']!, '--h-err', f['he.csv']!, '--s-err', f['se.csv']!, '--json']);
    expect(b.status, b.stderr).toBe(0);
    const rb = JSON.parse(b.stdout);
    expect(rb.energies[0]).toBe(r.energies[0]);
    expect(rb.threshold).toBe(r.threshold);
    expect(rb).not.toHaveProperty('scan'); // only with --scan
  });

  it('krylov prints every energy with its residual and the subspace it came from', async () => {
    const f = files();
    const out = await runCli(['krylov', '--matrices', f['k.json']!, '--threshold', '1e-3']);
    expect(out.status, out.stderr).toBe(0);
    const energyLines = out.stdout.split('\n').filter((l) => /E\d = /.test(l));
    expect(energyLines.length).toBeGreaterThanOrEqual(2); // thresholded and unregularised
    for (const l of energyLines) expect(l).toMatch(/residual \S+ +subspace \d+ of 8 Krylov directions/);
  });

  it('krylov --scan-out and --plot write the scan as CSV/JSON and the plot as SVG/PNG', async () => {
    const f = files();
    const dir = tempDir();
    const out = await runCli(['krylov', '--matrices', f['k.json']!, '--scan-out', join(dir, 'scan.csv'), '--plot', join(dir, 'scan.svg'), '--out', join(dir, 'r.json')]);
    expect(out.status, out.stderr).toBe(0);
    const rows = parse(readFileSync(join(dir, 'scan.csv'), 'utf8'), { columns: true }) as Array<Record<string, string>>;
    expect(rows.length).toBeGreaterThan(100);
    const svg = readFileSync(join(dir, 'scan.svg'), 'utf8');
    expect(svg).toContain('>threshold on the eigenvalues of S (absolute)</text>');
    expect(svg).toContain('>energy</text>');
    const report = JSON.parse(readFileSync(join(dir, 'r.json'), 'utf8'));
    expect(report.plateau.energy).toBe(report.energies[0]);
    const png = await runCli(['krylov', '--matrices', f['k.json']!, '--scan-out', join(dir, 'scan.json'), '--plot', join(dir, 'scan.png')]);
    expect(png.status, png.stderr).toBe(0);
    expect(Array.from(readFileSync(join(dir, 'scan.png')).subarray(1, 4))).toEqual([80, 78, 71]); // "PNG"
    expect(JSON.parse(readFileSync(join(dir, 'scan.json'), 'utf8')).scan.length).toBe(rows.length);
  });

  it('krylov reports bad input on one line with file and line, exit 2, and writes nothing', async () => {
    const bad = writeFiles(tempDir(), {
      'h.csv': '1,0,0.5,0.1\n0.5,0.1,2,0\n', // (0,1) = 0.5+0.1i but conj((1,0)) = 0.5−0.1i
      's.csv': '1,0,0,0\n0,0,1,0\n',
    });
    const dir = tempDir();
    const out = await runCli(['krylov', '--h', bad['h.csv']!, '--s', bad['s.csv']!, '--out', join(dir, 'r.json'), '--plot', join(dir, 'p.svg')]);
    expect(out.status).toBe(2);
    expect(out.stderr.trim().split('\n').length).toBe(1);
    expect(out.stderr).toContain(`${bad['h.csv']}:1:`);
    expect(out.stderr).toMatch(/not Hermitian/);
    expect(readdirSync(dir)).toEqual([]);
  });

  it('krylov rejects inconsistent flags with exit 2', async () => {
    const f = files();
    for (const argv of [
      ['krylov'],
      ['krylov', '--matrices', f['k.json']!, '--h', f['h.csv']!],
      ['krylov', '--matrices', f['k.json']!, '--relative'],
      ['krylov', '--matrices', f['k.json']!, '--threshold', '-1'],
      ['krylov', '--matrices', f['k.json']!, '--threshold', '2', '--relative'],
      ['krylov', '--h', f['h.csv']!, '--s', f['s.csv']!, '--bootstrap', '10'],
    ]) {
      const out = await runCli(argv);
      expect(out.status, argv.join(' ')).toBe(2);
      expect(out.stderr).toMatch(/bitspan: error|error:/);
    }
    expect(existsSync(f['k.json']!)).toBe(true);
  });
});
