/** Receives each parsed sample row: the packed configuration (scratch, copy if kept) and its count. */
export interface SampleSink {
  add(words: Uint32Array, count: number): void;
}
