/**
 * Run a full garbage collection now, so the large typed arrays a finished stage dropped (the sample
 * tables, the build's pieces) give their pages back before the next stage allocates. V8 otherwise
 * collects them only under pressure on its own heap, which typed arrays barely add to, and the
 * process's peak then holds both stages. Works where V8's `gc` hook is exposed: the CLI exposes it
 * for its command thread (see `runCliSupervised`); elsewhere (a library caller without
 * `node --expose-gc`) this does nothing.
 */
export function collectGarbage(): void {
  const gc = (globalThis as { gc?: () => void }).gc;
  // Dropped backing stores are freed by a concurrent sweeper after a collection; a second
  // collection first waits for that sweep, so the pages are back before the caller allocates.
  gc?.();
  gc?.();
}
