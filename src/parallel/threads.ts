import { availableParallelism } from 'node:os';

/** Default thread count: the machine's cores. */
export function defaultThreads(): number {
  return Math.max(1, availableParallelism());
}
