/**
 * Receives each parsed sample row: the packed configuration (scratch, copy if kept), its count,
 * and the 1-based line it came from (for errors the sink raises, e.g. counts that overflow).
 * `addMany`, when present, takes `n` rows at once (configurations back to back in `words`) with
 * the same effect as `n` calls to `add` in order.
 */
export interface SampleSink {
  add(words: Uint32Array, count: number, line: number): void;
  addMany?(words: Uint32Array, counts: Float64Array, lines: Int32Array, n: number): void;
}
