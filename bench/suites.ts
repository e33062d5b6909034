/**
 * The bench suites that `npm run bench` runs, in order.
 *
 * To add a suite: write bench/NAME.ts exporting a `Suite` (see bench/run.ts: `{ name, run(ctx) }`
 * returning rows `{ name, perEval, target?, baseline?, note? }`; time with `ctx.measure(fn)`, and
 * measure the baseline in the same run), then add ONE import line and ONE entry below. Nothing else
 * needs to change; `npm run bench -- NAME` runs only the suites whose name contains NAME.
 */
import type { Suite } from './run.js';
import { coreSuite } from './core.js';
import { sensingSuite } from './sensing.js';
import { serviceSuite } from './service.js';
import { turnSuite } from './turn.js';

export const SUITES: readonly Suite[] = [
  coreSuite,
  sensingSuite,
  turnSuite,
  serviceSuite,
];
