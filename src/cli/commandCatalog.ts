import type { Command, Option } from 'commander';
import type { CommandCatalog, CommandSpec, OptionSpec } from '../batch/commandSpec.js';

/** Option placeholders that name files or folders (`--samples <files...>`). */
const PATH_PLACEHOLDERS = new Set(['file', 'files', 'path', 'paths', 'dir', 'dirs', 'folder', 'folders']);
/** Keys that are input files even if a command names their placeholder otherwise. */
export const PATH_KEYS = ['hamiltonian', 'samples', 'integrals', 'observables', 'matrices', 'start', 'state'];
/** Keys of options that write files (refused in manifests), besides those whose help says they write. */
export const OUTPUT_KEYS = ['out', 'output', 'plot', 'csv', 'svg', 'png'];
/** Commands a manifest cannot name: they run or gather manifests themselves. */
const NOT_BATCHABLE = new Set(['batch', 'collect']);

/**
 * The commands a manifest may run, read from the program's commander definitions: every command
 * with a `--json` option (batch itself and collect excepted), each option with its flag, kind,
 * parser and whether it names files.
 */
export function commandCatalog(program: Command): CommandCatalog {
  const catalog = new Map<string, CommandSpec>();
  for (const cmd of program.commands) {
    const options = cmd.options as readonly Option[];
    if (NOT_BATCHABLE.has(cmd.name()) || !options.some((o) => o.long === '--json')) continue;
    catalog.set(cmd.name(), { name: cmd.name(), options: optionSpecs(options) });
  }
  return catalog;
}

function optionSpecs(options: readonly Option[]): Map<string, OptionSpec> {
  const specs = new Map<string, OptionSpec>();
  for (const o of options) {
    if (!o.long || o.long === '--json') continue;
    const key = o.attributeName();
    if (o.negate) {
      const pos = specs.get(key);
      if (pos) pos.negateFlag = o.long;
      else specs.set(key, { key, flag: '', negateFlag: o.long, kind: 'boolean', required: false, path: false, writesOutput: false });
      continue;
    }
    const placeholder = /[<[]([A-Za-z-]+)(?:\.\.\.)?[>\]]/.exec(o.flags)?.[1]?.toLowerCase() ?? '';
    const kind = o.isBoolean() ? 'boolean' : o.variadic ? 'list' : 'value';
    const names = kind !== 'boolean' && (PATH_PLACEHOLDERS.has(placeholder) || PATH_KEYS.includes(key));
    // An option that writes a file of its own (e.g. --out) would write outside batch's control.
    const writesOutput = kind !== 'boolean' && (OUTPUT_KEYS.includes(key) || (names && /\b(write|writes|written|save|saves|saved|export|exports)\b/i.test(o.description)));
    const prior = specs.get(key);
    specs.set(key, {
      key,
      flag: o.long,
      negateFlag: prior?.negateFlag,
      kind,
      required: o.mandatory,
      path: names && !writesOutput,
      writesOutput,
      parse: o.parseArg ? (v, prev) => o.parseArg!(v, prev) : undefined,
      defaultValue: o.defaultValue,
    });
  }
  return specs;
}
