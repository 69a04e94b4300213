import { Command, CommanderError } from 'commander';
import { BitspanError, exitStatusFor } from '../errors.js';
import { ERROR_FORMAT_ENV } from '../batch/runJob.js';
import type { CliIo } from './io.js';
import { closeMatvecWorkers } from '../parallel/matvecTeam.js';

/** Commands in the order `--help` lists them, by name, each defined by its own module. */
export const COMMANDS: ReadonlyArray<readonly [name: string, load: () => Promise<(io: CliIo) => Command>]> = [
  ['solve', async () => (await import('./commands/solve.js')).solveCommand],
  ['sweep', async () => (await import('./commands/sweep.js')).sweepCommand],
  ['model', async () => (await import('./commands/model.js')).modelCommand],
  ['simulate', async () => (await import('./commands/simulate.js')).simulateCommand],
  ['exact', async () => (await import('./commands/exact.js')).exactCommand],
  ['demo', async () => (await import('./commands/demo.js')).demoCommand],
  ['krylov', async () => (await import('./commands/krylov.js')).krylovCommand],
  ['batch', async () => (await import('./commands/batch.js')).batchCommand],
  ['collect', async () => (await import('./commands/collect.js')).collectCommand],
];

/** Commands that read every command's options (manifests name them), so they need the whole program. */
const NEEDS_ALL = new Set(['batch', 'collect']);

/**
 * The command definitions a run needs: only the command `argv` names, so a run loads one command's
 * modules; all of them for help, the version, batch, collect and a mistyped name (suggestions).
 */
async function commandsFor(argv: string[]): Promise<Array<(io: CliIo) => Command>> {
  const named = COMMANDS.filter(([name]) => name === argv[0] && !NEEDS_ALL.has(name));
  return Promise.all((named.length ? named : COMMANDS).map(([, load]) => load()));
}

/**
 * Run the CLI on `argv` (without node and script) and return the exit status: 0 success,
 * 2 bad input or usage, 1 internal fault. Errors are caught here and nowhere else.
 */
export async function main(argv: string[], io: CliIo): Promise<number> {
  const program = new Command('bitspan')
    .description('ground-state energies from sampled bitstring subspaces')
    .version('0.1.0')
    .exitOverride()
    .configureOutput({ writeOut: (s) => io.stdout(s), writeErr: (s) => io.stderr(s) })
    .showSuggestionAfterError(true);
  for (const make of await commandsFor(argv)) {
    const cmd = make(io);
    cmd.exitOverride().configureOutput({ writeOut: (s) => io.stdout(s), writeErr: (s) => io.stderr(s) });
    program.addCommand(cmd);
  }
  try {
    await program.parseAsync(argv, { from: 'user' });
    return 0;
  } catch (e) {
    return reportError(e, io);
  } finally {
    closeMatvecWorkers();
  }
}

function reportError(e: unknown, io: CliIo): number {
  if (e instanceof CommanderError) {
    // Commander has already printed its message; help and version exit 0.
    if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version' || e.code === 'commander.help') return 0;
    return 2;
  }
  const err = outOfMemory(unwrap(e)) ?? unwrap(e);
  // Under `bitspan batch` the one error line is JSON, so the batch can record code and place.
  const asJson = io.env[ERROR_FORMAT_ENV] === 'json';
  if (err instanceof BitspanError) {
    io.stderr(asJson ? `${JSON.stringify({ bitspanError: err.toJSON() })}\n` : `bitspan: error: ${err.toLine()}\n`);
    return exitStatusFor(err.code);
  }
  const msg = e instanceof Error ? e.message : String(e);
  if (asJson) io.stderr(`${JSON.stringify({ bitspanError: { code: 'internal', message: msg.replace(/\s+/g, ' ') } })}\n`);
  io.stderr(`bitspan: internal error: ${msg.replace(/\s+/g, ' ')} (please report this with the command you ran)\n`);
  if (process.env.BITSPAN_DEBUG && e instanceof Error && e.stack) io.stderr(e.stack + '\n');
  return 1;
}

// Commander wraps errors thrown by argument parsers in its own InvalidArgumentError message only
// for InvalidArgumentError; ours pass through, but a cause chain may wrap them elsewhere.
function unwrap(e: unknown): unknown {
  let cur = e;
  for (let i = 0; i < 5 && cur instanceof Error && !(cur instanceof BitspanError) && cur.cause; i++) cur = cur.cause;
  return cur;
}

/**
 * A typed-array allocation the memory plan did not foresee (e.g. while deduplicating dumps) as a
 * `too-large` refusal naming the options that help, instead of an internal fault.
 */
export function outOfMemory(e: unknown): BitspanError | undefined {
  if (!(e instanceof RangeError) || !/allocation failed|Invalid (typed )?array (buffer )?length|Array buffer allocation/i.test(e.message)) return undefined;
  return new BitspanError('too-large', `not enough memory (${e.message})`, 'lower --max-dim, use --matrix-free, or set --memory below what the machine can give');
}
