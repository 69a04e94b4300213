/**
 * A zeroed buffer of `bytes` bytes: a SharedArrayBuffer when worker threads will read it (arrays
 * cross to them without a copy), else a plain one. At least 8 bytes, so views over empty arrays
 * must be given their length.
 */
export function newBuffer(bytes: number, shared: boolean): ArrayBufferLike {
  return shared ? new SharedArrayBuffer(Math.max(8, bytes)) : new ArrayBuffer(Math.max(8, bytes));
}
