/**
 * Receives each parsed sample row: the packed configuration (scratch, copy if kept), its count,
 * and the 1-based line it came from (for errors the sink raises, e.g. counts that overflow).
 */
export interface SampleSink {
  add(words: Uint32Array, count: number, line: number): void;
}
