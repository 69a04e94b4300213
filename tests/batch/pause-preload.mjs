// Test-only preload (node --import) that freezes a job mid-run, so fault tests can kill it at a
// known point without timing: a `solve` process with an argument equal to BITSPAN_TEST_PAUSE_MATCH
// writes half of its JSON report to stdout, drops a marker file `paused-<pid>` in
// BITSPAN_TEST_PAUSE_DIR, and then blocks until it is killed.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';

const dir = process.env.BITSPAN_TEST_PAUSE_DIR;
const match = process.env.BITSPAN_TEST_PAUSE_MATCH ?? '';
if (dir && process.argv.includes('solve') && process.argv.includes(match)) {
  const write = process.stdout.write.bind(process.stdout);
  process.stdout.write = (chunk) => {
    const text = String(chunk);
    // Writes to a pipe are synchronous on Linux, so the half is with the reader before we block.
    write(text.slice(0, text.length >> 1));
    writeFileSync(join(dir, `paused-${process.pid}`), '');
    const cell = new Int32Array(new SharedArrayBuffer(4));
    for (;;) Atomics.wait(cell, 0, 0, 1000);
  };
}
