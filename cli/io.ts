/** Shared command-line plumbing: reading a scenario, reporting issues, exit codes. */
import { readFileSync } from 'node:fs';
import type { Issue } from '../src/scenario.js';

export const EXIT = { ok: 0, usage: 1, invalid: 2, limit: 3 } as const;

export interface Io {
  out: (text: string) => void;
  err: (text: string) => void;
  stdin: () => string;
}

export const processIo: Io = {
  out: (t) => process.stdout.write(t),
  err: (t) => process.stderr.write(t),
  stdin: () => readFileSync(0, 'utf8'),
};

export class UsageError extends Error {}

/** Read and JSON-parse FILE (or standard input for "-"). */
export function readDocument(file: string | undefined, io: Io, what = 'scenario'): { doc: unknown } | { issues: Issue[] } {
  if (!file) throw new UsageError(`a ${what} FILE (or - for standard input) is required`);
  let text: string;
  try {
    text = file === '-' ? io.stdin() : readFileSync(file, 'utf8');
  } catch (e) {
    return { issues: [{ path: '(file)', message: `cannot read ${file}: ${(e as NodeJS.ErrnoException).code ?? String(e)}` }] };
  }
  try {
    return { doc: JSON.parse(text) };
  } catch (e) {
    return { issues: [{ path: '(document)', message: `is not valid JSON: ${(e as Error).message}` }] };
  }
}

/** An issue as the library reports it (a sweep's may name a sweep limit). */
type Reported = Omit<Issue, 'limit'> & { limit?: string };

/** Print issues the way the service reports them, and choose the exit code. */
export function reportIssues(issues: readonly Reported[], io: Io, what = 'scenario'): number {
  const limit = issues.some((i) => i.limit);
  io.err(`${limit ? 'over a limit' : `invalid ${what}`}:\n${issues.map((i) => `  ${i.path}: ${i.message}`).join('\n')}\n`);
  return limit ? EXIT.limit : EXIT.invalid;
}

/** Minimal flag parsing: --name value, --flag, positional arguments. */
export function parseArgs(argv: readonly string[], flags: Record<string, 'bool' | 'string'>): { positional: string[]; opts: Record<string, string | boolean> } {
  const positional: string[] = [];
  const opts: Record<string, string | boolean> = {};
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i] as string;
    if (a.startsWith('--')) {
      const [name, inline] = a.slice(2).split('=', 2) as [string, string | undefined];
      const kind = flags[name];
      if (!kind) throw new UsageError(`unknown option --${name}`);
      if (kind === 'bool') opts[name] = true;
      else {
        const v = inline ?? argv[++i];
        if (v === undefined) throw new UsageError(`--${name} needs a value`);
        opts[name] = v;
      }
    } else positional.push(a);
  }
  return { positional, opts };
}

export interface Command {
  name: string;
  summary: string;
  usage: string;
  run: (argv: readonly string[], io: Io) => number;
}

type Answered<A> = { ok: true; answer: A } | { ok: false; issues: Reported[] };

/**
 * The shared body of the document commands (forces, sensing, turn, sweep): read FILE, compute,
 * print the warnings to standard error and the answer as JSON, or as CSV (`--series` picks the
 * series table where the command has one). `what` names the document in refusals.
 */
export function answerDocument<A extends { warnings: string[] }>(
  argv: readonly string[],
  io: Io,
  compute: (doc: unknown) => Answered<A>,
  csv: { table: (a: A) => string; series?: (a: A) => string },
  what = 'scenario',
): number {
  const flags: Record<string, 'bool' | 'string'> = { format: 'string', compact: 'bool', ...(csv.series ? { series: 'bool' } : {}) };
  const { positional, opts } = parseArgs(argv, flags);
  const format = (opts.format as string | undefined) ?? 'json';
  if (format !== 'json' && format !== 'csv') throw new UsageError(`--format ${format}: expected json or csv`);
  if (opts.series && format !== 'csv') throw new UsageError('--series goes with --format csv');
  if (positional.length > 1) throw new UsageError(`one ${what} FILE at a time; got ${positional.length}: ${positional.join(' ')}`);
  const read = readDocument(positional[0], io, what);
  if ('issues' in read) return reportIssues(read.issues, io, what);
  const r = compute(read.doc);
  if (!r.ok) return reportIssues(r.issues, io, what);
  for (const w of r.answer.warnings) io.err(`warning: ${w}\n`);
  if (format === 'csv') io.out(opts.series && csv.series ? csv.series(r.answer) : csv.table(r.answer));
  else io.out(`${JSON.stringify(r.answer, null, opts.compact ? undefined : 2)}\n`);
  return EXIT.ok;
}
