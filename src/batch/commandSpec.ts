/**
 * How one long option of a command behaves, as far as a manifest needs to know. The CLI builds
 * these from its commander definitions, so the manifest accepts exactly what the command does.
 */
export interface OptionSpec {
  /** Manifest key: the long option name in camelCase (`maxDim` for `--max-dim`). */
  key: string;
  /** `--max-dim`. */
  flag: string;
  /** `--no-x` for a boolean that can be switched off, if the command has one. */
  negateFlag?: string;
  /** `boolean`: a bare flag; `value`: one value (a list repeats the flag, if the option collects); `list`: several values after one flag. */
  kind: 'boolean' | 'value' | 'list';
  /** The command refuses to run without it. */
  required: boolean;
  /** Its values are file or folder names, resolved against the manifest's folder and hashed. */
  path: boolean;
  /** The option writes a file of its own: refused in manifests, since batch writes every output. */
  writesOutput: boolean;
  /**
   * The command's own value parser, `(value, previous) => parsed`, called as the CLI would so a
   * manifest value is checked before any job runs. Throws on a bad value.
   */
  parse?: (value: string, previous: unknown) => unknown;
  /** The value the command starts from (the `previous` of the first `parse` call). */
  defaultValue?: unknown;
}

/** One command a manifest may name: its options by manifest key. */
export interface CommandSpec {
  name: string;
  options: ReadonlyMap<string, OptionSpec>;
}

/** The commands a manifest may name, by command name. */
export type CommandCatalog = ReadonlyMap<string, CommandSpec>;
