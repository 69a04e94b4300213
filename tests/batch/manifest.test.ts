import { describe, expect, it } from 'vitest';
import { Command } from 'commander';
import { join } from 'node:path';
import { BitspanError } from '../../src/errors.js';
import { isSafeJobName, MAX_JOBS, parseManifest, readManifest } from '../../src/batch/manifest.js';
import { commandCatalog } from '../../src/cli/commandCatalog.js';
import { solveCommand } from '../../src/cli/commands/solve.js';
import { collect as collectFlag, positiveNumber } from '../../src/cli/parse.js';
import type { CliIo } from '../../src/cli/io.js';
import { tempDir, writeFiles, errorOf } from '../helpers.js';
import { ringManifest } from './fixture.js';

const io: CliIo = { stdout: () => undefined, stderr: () => undefined, stderrIsTTY: false, env: {} };

/** A stand-in for a second batchable command, with every option shape commander offers. */
function scanCommand(): Command {
  return new Command('scan')
    .requiredOption('--hamiltonian <file>', 'model')
    .option('--values <v...>', 'values to scan', (v: string, prev: number[] | undefined) => [...(prev ?? []), positiveNumber('--values')(v)])
    .option('--tag <t>', 'repeatable tag', collectFlag)
    .option('--shift <x>', 'a signed number')
    .option('--estimate', 'also estimate')
    .option('--no-progress', 'no progress bar')
    .option('--plot <file>', 'write a plot to FILE')
    .option('--json', 'print JSON');
}

const catalog = commandCatalog(new Command('bitspan').addCommand(solveCommand(io)).addCommand(scanCommand()));
const FILE = '/data/study/m.json';
const parse = (doc: unknown, text = JSON.stringify(doc, null, 2)) => parseManifest(text, FILE, catalog);

describe('parseManifest', () => {
  it('parseManifest indexes listed jobs first, then grid combinations with the first vary key slowest', () => {
    const m = parse({
      output: 'out',
      defaults: { command: 'solve', hamiltonian: 'h.txt', samples: ['t.csv'] },
      jobs: [{ name: 'first' }, { name: 'second', eigs: 3 }],
      grids: [{ name: 'g-{maxDim}-{parity}', vary: { maxDim: [10, 20], parity: ['even', 'odd'] } }],
    });
    expect(m.jobs.map((j) => [j.index, j.name])).toEqual([
      [0, 'first'],
      [1, 'second'],
      [2, 'g-10-even'],
      [3, 'g-10-odd'],
      [4, 'g-20-even'],
      [5, 'g-20-odd'],
    ]);
    expect(m.output).toBe('/data/study/out');
    expect(m.jobs[5]!.params).toEqual({ hamiltonian: 'h.txt', samples: ['t.csv'], maxDim: 20, parity: 'odd' });
  });

  it('parseManifest maps keys to flags: lists after one flag for variadic options, repeated flags for collecting ones, bare booleans', () => {
    const m = parse({
      output: 'out',
      jobs: [
        { name: 's', command: 'solve', hamiltonian: 'h.txt', samples: ['a.csv', '/abs/b.csv'], weight: ['0-3=2', '4-7=2'], maxDim: 100, tol: 1e-9 },
        { name: 'c', command: 'scan', hamiltonian: 'h.txt', values: [0.5, 2], tag: ['x', 'y'], shift: -1.5, estimate: true, progress: false },
      ],
    });
    expect(m.jobs[0]!.argv).toEqual([
      'solve',
      '--hamiltonian', '/data/study/h.txt',
      '--samples', '/data/study/a.csv', '/abs/b.csv',
      '--weight', '0-3=2', '--weight', '4-7=2',
      '--max-dim', '100',
      '--tol', '1e-9',
    ]);
    expect(m.jobs[0]!.inputs).toEqual(['/data/study/h.txt', '/data/study/a.csv', '/abs/b.csv']);
    // A value that looks like an option is glued to its flag.
    expect(m.jobs[1]!.argv).toEqual(['scan', '--hamiltonian', '/data/study/h.txt', '--values', '0.5', '2', '--tag', 'x', '--tag', 'y', '--shift=-1.5', '--estimate', '--no-progress']);
  });

  it('parseManifest argv parses back through the real command to the same options', async () => {
    const m = parse(ringManifest());
    for (const job of m.jobs) {
      let seen: Record<string, unknown> | undefined;
      const cmd = solveCommand(io).exitOverride();
      cmd.action((f: Record<string, unknown>) => void (seen = f));
      await cmd.parseAsync(job.argv.slice(1), { from: 'user' });
      expect(seen!.hamiltonian).toBe(join('/data/study', 'ring.txt'));
      expect(seen!.samples).toEqual(['/data/study/t0.csv', '/data/study/t1.csv']);
      expect(seen!.weight).toEqual(((job.params.weight ?? []) as unknown[]).map(String));
      if (job.params.maxDim !== undefined) expect(seen!.maxDim).toBe(job.params.maxDim);
    }
  });

  it('parseManifest fills {#key} with the position of the value, so paths can vary', () => {
    const m = parse({ output: 'o', defaults: { command: 'solve', hamiltonian: 'h.txt' }, grids: [{ name: 'run{#samples}', vary: { samples: [['d/a.csv'], ['d/a.csv', 'd/b.csv']] } }] });
    expect(m.jobs.map((j) => j.name)).toEqual(['run0', 'run1']);
    expect(m.jobs[1]!.argv).toContain('/data/study/d/b.csv');
  });

  it('parseManifest skips a default that only another command knows, and refuses one nobody knows', () => {
    const m = parse({ output: 'o', defaults: { hamiltonian: 'h.txt', samples: ['t.csv'], values: [1, 2] }, jobs: [{ name: 'a', command: 'solve' }, { name: 'b', command: 'scan' }] });
    expect(m.jobs[0]!.argv).not.toContain('--values');
    expect(m.jobs[1]!.argv).toContain('--values');
    const e = errorOf(() => parse({ output: 'o', defaults: { hamiltonan: 'h.txt' }, jobs: [{ name: 'a', command: 'solve' }] }));
    expect(e.code).toBe('bad-manifest');
    expect(e.message).toContain('"hamiltonan"');
    expect(e.hint).toContain('did you mean "hamiltonian"');
  });

  describe('parseManifest refusals name the job, the key and the line', () => {
    const base = { output: 'out', defaults: { command: 'solve', hamiltonian: 'h.txt', samples: ['t.csv'] } };
    // [what, manifest, message, text on the line the error must point at]
    const cases: Array<[string, unknown, RegExp, string]> = [
      ['a value the command refuses', { ...base, jobs: [{ name: 'a' }, { name: 'b', maxDim: 0 }] }, /job 'b' \(jobs\[1\]\): "maxDim": --max-dim '0' is not a positive whole number/, '"maxDim": 0'],
      ['an unknown key', { ...base, jobs: [{ name: 'a', maxdim: 5 }] }, /job 'a' \(jobs\[0\]\): "maxdim" is not an option of solve/, '"maxdim": 5'],
      ['a list for a one-value option', { ...base, jobs: [{ name: 'a', eigs: [1, 2] }] }, /"eigs" is a list, but --eigs takes one value/, '"eigs": ['],
      ['a missing required option', { output: 'o', jobs: [{ name: 'a', command: 'solve', hamiltonian: 'h.txt' }] }, /job 'a' \(jobs\[0\]\) has no "samples"/, '"jobs": [\n    {'],
      ['an option that writes its own file', { ...base, jobs: [{ name: 'a', out: '../elsewhere.json' }] }, /"out" \(--out\) writes its own file/, '"out": "../'],
      ['an unknown command', { ...base, jobs: [{ name: 'a', command: 'sovle' }] }, /unknown command "sovle"/, '"command": "sovle"'],
      ['a boolean given a string', { output: 'o', jobs: [{ name: 'a', command: 'scan', hamiltonian: 'h', estimate: 'yes' }] }, /"estimate" is "yes", not true or false/, '"estimate"'],
      ['an object value', { ...base, jobs: [{ name: 'a', maxDim: { n: 1 } }] }, /"maxDim" is \{"n":1\}/, '"maxDim"'],
      ['a job without a name', { ...base, jobs: [{ eigs: 2 }] }, /jobs\[0\] has no "name"/, '"jobs": [\n    {'],
      ['an empty vary list', { ...base, grids: [{ name: 'g-{maxDim}', vary: { maxDim: [] } }] }, /vary.maxDim is not a non-empty list/, '"maxDim": []'],
      ['a key both fixed and varied', { ...base, grids: [{ name: 'g-{maxDim}', maxDim: 3, vary: { maxDim: [1] } }] }, /"maxDim" is both fixed and varied/, '"maxDim": 3'],
      ['an unknown placeholder', { ...base, grids: [{ name: 'g-{maxdim}', vary: { maxDim: [1] } }] }, /placeholder \{maxdim\} names no key/, '"name": "g-'],
      ['a grid whose names collide', { ...base, grids: [{ name: 'g', vary: { maxDim: [1, 2] } }] }, /job name 'g' is used twice/, '"name": "g"'],
      ['names differing only in case', { ...base, jobs: [{ name: 'Run' }, { name: 'run' }] }, /'Run' \(jobs\[0\]\) and 'run' \(jobs\[1\]\) differ only in case/, '"name": "run"'],
      ['an unknown top-level key', { ...base, job: [] }, /unknown top-level key "job"/, '"job": []'],
      ['no jobs at all', { output: 'o' }, /has no jobs/, '{'],
    ];
    for (const [what, doc, pattern, needle] of cases) {
      it(`parseManifest refuses ${what}`, () => {
        const text = JSON.stringify(doc, null, 2);
        expect(text, 'test needle').toContain(needle);
        const at = text.indexOf(needle) + (needle.includes('\n') ? needle.lastIndexOf('\n') + 1 : 0);
        const e = errorOf(() => parse(doc, text));
        expect(e.code).toBe('bad-manifest');
        expect(e.message).toMatch(pattern);
        expect(e.file).toBe(FILE);
        expect(e.line).toBe(text.slice(0, at).split('\n').length);
      });
    }
  });

  it('parseManifest refuses names that are not one plain file name', () => {
    for (const name of ['../x', 'a/b', 'a\\b', '', '.hidden', '..', 'x.error', '-flag', 'a b', 'x'.repeat(121), 'trailing.']) {
      const e = errorOf(() => parse({ output: 'o', defaults: { command: 'solve', hamiltonian: 'h', samples: ['t'] }, jobs: [{ name }] }));
      expect(e.code, name).toBe('bad-manifest');
    }
    // Grid names are checked after filling: a value with a slash cannot lead out of the folder.
    const e = errorOf(() => parse({ output: 'o', defaults: { command: 'solve', hamiltonian: 'h', samples: ['t'] }, grids: [{ name: 'g-{parity}', vary: { parity: ['../../etc'] } }] }));
    expect(e.code).toBe('bad-manifest');
    for (const name of ['a', 'scan-1000', 'run_2.5', '0', 'x.error2']) expect(isSafeJobName(name), name).toBe(true);
  });

  it('parseManifest refuses a grid that would expand past the job limit before expanding it', () => {
    const big = Array.from({ length: 1000 }, (_, i) => i + 1);
    const e = errorOf(() => parse({ output: 'o', defaults: { command: 'solve', hamiltonian: 'h', samples: ['t'] }, grids: [{ name: 'g-{maxDim}-{eigs}', vary: { maxDim: big, eigs: big } }] }));
    expect(e.message).toContain(`limit of ${MAX_JOBS}`);
  });

  it('parseManifest refuses malformed JSON with its line, and an empty file', () => {
    const e = errorOf(() => parse(null, '{\n  "output": "o",\n  "jobs": [\n    {"name": "a",}\n  ]\n}'));
    expect(e.code).toBe('bad-manifest');
    expect(e.line).toBe(4);
    expect(errorOf(() => parse(null, ' \n')).code).toBe('file-empty');
  });
});

describe('readManifest', () => {
  it('readManifest resolves paths against the manifest folder, whatever the working directory', async () => {
    const dir = tempDir();
    writeFiles(dir, { 'm.json': JSON.stringify(ringManifest('results')) });
    const m = await readManifest(join(dir, 'm.json'), catalog);
    expect(m.output).toBe(join(dir, 'results'));
    expect(m.jobs[0]!.inputs).toEqual([join(dir, 'ring.txt'), join(dir, 't0.csv'), join(dir, 't1.csv')]);
  });

  it('readManifest refuses a missing file with file-unreadable', async () => {
    await expect(readManifest('/nonexistent/m.json', catalog)).rejects.toMatchObject({ code: 'file-unreadable' });
  });
});
