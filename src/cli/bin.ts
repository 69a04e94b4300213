#!/usr/bin/env node
import { runCliSupervised } from './signals.js';

const status = await runCliSupervised(process.argv.slice(2));
// Exit once stdout and stderr are flushed (an empty write calls back after the writes before it),
// without waiting for the CLI thread and its workers to tear down their heaps.
await Promise.all([process.stdout, process.stderr].map((s) => new Promise((done) => s.write('', done))));
process.exit(status);
