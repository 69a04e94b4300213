import { describe, expect, it } from 'vitest';
import { COMMANDS, outOfMemory } from '../../src/cli/main.js';
import { runCli } from '../helpers.js';

function thrown(f: () => unknown): unknown {
  try {
    f();
  } catch (e) {
    return e;
  }
  throw new Error('nothing thrown');
}

describe('outOfMemory', () => {
  it('outOfMemory turns a failed typed-array allocation into a too-large refusal with the helpful options', () => {
    // A real V8 error: a typed array longer than the engine allows.
    const err = outOfMemory(thrown(() => new Float64Array(2 ** 40)));
    expect(err?.code).toBe('too-large');
    expect(err?.hint).toContain('--max-dim');
    expect(err?.hint).toContain('--matrix-free');
  });

  it('outOfMemory leaves other errors alone (they stay internal faults)', () => {
    expect(outOfMemory(thrown(() => (1).toFixed(200)))).toBeUndefined();
    expect(outOfMemory(new TypeError('Array buffer allocation failed'))).toBeUndefined();
    expect(outOfMemory('allocation failed')).toBeUndefined();
  });
});

describe('main', () => {
  const io = { stdout: () => undefined, stderr: () => undefined, stderrIsTTY: false, env: {} };

  it('main finds each command of COMMANDS by the name its module gives it', async () => {
    for (const [name, load] of COMMANDS) expect((await load())(io).name()).toBe(name);
  });

  it('main --help lists every command, in the order of COMMANDS', async () => {
    const r = await runCli(['--help']);
    expect(r.status).toBe(0);
    const listed = COMMANDS.map(([name]) => r.stdout.search(new RegExp(`^  ${name}\\b`, 'm')));
    expect(listed.every((at) => at >= 0)).toBe(true);
    expect([...listed].sort((a, b) => a - b)).toEqual(listed);
  });

  it('main runs a named command with only its own definition loaded (its help and its errors are unchanged)', async () => {
    const help = await runCli(['solve', '--help']);
    expect(help.status).toBe(0);
    expect(help.stdout).toContain('Usage: bitspan solve [options]');
    const missing = await runCli(['solve']);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toContain("required option '--samples <files...>' not specified");
  });

  it('main suggests the nearest command for a mistyped name (commander suggestions need every command)', async () => {
    const r = await runCli(['sovle']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('(Did you mean solve?)');
  });
});
