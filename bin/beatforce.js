#!/usr/bin/env node
// Runs the compiled command line (built by `npm run build`, which `npm ci` runs through `prepare`).
import '../dist/cli/bin.js';
