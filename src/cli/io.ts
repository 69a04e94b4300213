/** Where the CLI writes; injected so tests run commands in-process. */
export interface CliIo {
  stdout(text: string): void;
  stderr(text: string): void;
  /** Whether stderr is a terminal (progress bars only then). */
  stderrIsTTY: boolean;
  env: Record<string, string | undefined>;
}

/** The real process streams. */
export function processIo(): CliIo {
  return {
    stdout: (t) => process.stdout.write(t),
    stderr: (t) => process.stderr.write(t),
    stderrIsTTY: Boolean(process.stderr.isTTY),
    env: process.env,
  };
}
