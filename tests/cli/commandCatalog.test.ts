import { describe, expect, it } from 'vitest';
import { Command } from 'commander';
import { commandCatalog } from '../../src/cli/commandCatalog.js';
import { batchCommand } from '../../src/cli/commands/batch.js';
import { collectCommand } from '../../src/cli/commands/collect.js';
import { solveCommand } from '../../src/cli/commands/solve.js';
import type { CliIo } from '../../src/cli/io.js';

const io: CliIo = { stdout: () => undefined, stderr: () => undefined, stderrIsTTY: false, env: {} };

describe('commandCatalog', () => {
  const program = new Command('bitspan')
    .addCommand(solveCommand(io))
    .addCommand(batchCommand(io))
    .addCommand(collectCommand(io))
    .addCommand(new Command('plain').option('--x <y>', 'no json here'))
    .addCommand(new Command('scan').option('--plot <file>', 'plot of E against the axis').option('--notes <file>', 'saves notes to FILE').option('--json', 'json'));
  const catalog = commandCatalog(program);

  it('commandCatalog offers the commands that print JSON, except batch and collect', () => {
    expect([...catalog.keys()]).toEqual(['solve', 'scan']);
  });

  it('commandCatalog reads each option of solve: key, flag, kind, whether it is required or names files', () => {
    const o = catalog.get('solve')!.options;
    expect(o.get('hamiltonian')).toMatchObject({ flag: '--hamiltonian', kind: 'value', required: false, path: true, writesOutput: false });
    expect(o.get('samples')).toMatchObject({ flag: '--samples', kind: 'list', required: true, path: true });
    expect(o.get('maxDim')).toMatchObject({ flag: '--max-dim', kind: 'value', required: false, path: false });
    expect(o.get('weight')).toMatchObject({ flag: '--weight', kind: 'value', path: false });
    expect(o.get('out')).toMatchObject({ writesOutput: true, path: false });
    expect(o.has('json')).toBe(false);
    // The command's own parser comes along, so a manifest value is checked as the CLI would.
    expect(() => o.get('maxDim')!.parse!('0', undefined)).toThrow(expect.objectContaining({ code: 'bad-argument' }));
  });

  it('commandCatalog treats file options named like outputs or described as writing as outputs', () => {
    const o = catalog.get('scan')!.options;
    expect(o.get('plot')!.writesOutput).toBe(true);
    expect(o.get('notes')!.writesOutput).toBe(true);
  });
});
