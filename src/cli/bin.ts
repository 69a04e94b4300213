#!/usr/bin/env node
import { runCliSupervised } from './signals.js';

process.exitCode = await runCliSupervised(process.argv.slice(2));
