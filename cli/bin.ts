#!/usr/bin/env node
import { main } from './main.js';

// A reader that stops early (`beatforce forces x.json | head`) closes the pipe: end quietly, as
// other command-line tools do, instead of with an EPIPE stack trace.
process.stdout.on('error', (e: NodeJS.ErrnoException) => {
  if (e.code !== 'EPIPE') throw e;
  process.exit(process.exitCode ?? 0);
});

process.exitCode = main(process.argv.slice(2));
