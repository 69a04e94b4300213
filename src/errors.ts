/**
 * Stable codes for everything bitspan reports as a user-facing failure. Input codes map to exit
 * status 2 in the CLI; `internal` maps to 1; `interrupted` to 130/143; `incomplete` (batch jobs
 * that failed, or are missing when collected) to 3.
 */
export type BitspanErrorCode =
  | 'bad-argument'
  | 'file-unreadable'
  | 'file-empty'
  | 'bad-hamiltonian'
  | 'bad-samples'
  | 'inconsistent-length'
  | 'bad-bitstring'
  | 'qubit-mismatch'
  | 'empty-subspace'
  | 'too-large'
  | 'bad-integrals'
  | 'bad-matrices'
  | 'bad-manifest'
  | 'bad-observables'
  | 'bad-state'
  | 'output-unwritable'
  | 'interrupted'
  | 'incomplete'
  | 'internal';

/** Where an input error happened: a file and, when known, a 1-based line. */
export interface ErrorPlace {
  file?: string;
  line?: number;
}

/**
 * The one error class of the library: a stable `code`, a `hint` saying what to do, and the place.
 * `message` is what went wrong (expected vs found) without the place; `toLine()` joins them.
 */
export class BitspanError extends Error {
  readonly code: BitspanErrorCode;
  readonly hint: string;
  readonly file: string | undefined;
  readonly line: number | undefined;

  constructor(code: BitspanErrorCode, message: string, hint = '', place: ErrorPlace = {}) {
    super(message);
    this.name = 'BitspanError';
    this.code = code;
    this.hint = hint;
    this.file = place.file;
    this.line = place.line;
  }

  /** One line for a terminal: `file:line: message; hint` with newlines folded. */
  toLine(): string {
    const where = this.file ? `${this.file}${this.line !== undefined ? `:${this.line}` : ''}: ` : '';
    const hint = this.hint ? ` (${this.hint})` : '';
    return `${where}${this.message}${hint}`.replace(/\s*[\r\n]+\s*/g, ' ');
  }

  /** A plain object that survives `postMessage` from a worker thread. */
  toJSON(): { code: BitspanErrorCode; message: string; hint: string; file?: string; line?: number } {
    return { code: this.code, message: this.message, hint: this.hint, file: this.file, line: this.line };
  }

  /** Rebuild an error that crossed a thread boundary as `toJSON()` output. */
  static fromJSON(o: { code: BitspanErrorCode; message: string; hint?: string; file?: string; line?: number }): BitspanError {
    return new BitspanError(o.code, o.message, o.hint ?? '', { file: o.file, line: o.line });
  }
}

/** Exit status the CLI uses for an error code. */
export function exitStatusFor(code: BitspanErrorCode): number {
  if (code === 'internal') return 1;
  if (code === 'interrupted') return 130;
  if (code === 'incomplete') return 3;
  return 2;
}
