import { beatsCsv, turnSeriesCsv } from '../../src/turn/tables.js';
import { turn } from '../../src/turn/turn.js';
import { EXIT, parseArgs, readDocument, reportIssues, UsageError, type Command } from '../io.js';

export const turnCommand: Command = {
  name: 'turn',
  summary: 'a body maneuver beat by beat: loads, strain, lock-in read-out, estimated vs true rates, lag (as POST /api/v1/turn)',
  usage: `beatforce turn FILE|- [--format json|csv] [--series] [--compact]

  FILE        a scenario document (JSON) with body.maneuver; - reads standard input
  --format    json (default: the answer of POST /api/v1/turn) or csv (one row per beat:
              true and estimated rates, each channel's in-phase output)
  --series    with --format csv: the series (decimated as output.decimate asks) instead
  --compact   JSON on one line

  Long runs: set output.decimate to { "every": k } or { "envelope": true } in the document,
  or output.series to false; the series are never cut short silently.`,
  run(argv, io) {
    const { positional, opts } = parseArgs(argv, { format: 'string', series: 'bool', compact: 'bool' });
    const format = (opts.format as string | undefined) ?? 'json';
    if (format !== 'json' && format !== 'csv') throw new UsageError(`--format ${format}: expected json or csv`);
    if (opts.series && format !== 'csv') throw new UsageError('--series goes with --format csv');
    const read = readDocument(positional[0], io);
    if ('issues' in read) return reportIssues(read.issues, io);
    const r = turn(read.doc);
    if (!r.ok) return reportIssues(r.issues, io);
    for (const w of r.answer.warnings) io.err(`warning: ${w}\n`);
    if (format === 'csv') io.out(opts.series ? turnSeriesCsv(r.answer) : beatsCsv(r.answer));
    else io.out(`${JSON.stringify(r.answer, null, opts.compact ? undefined : 2)}\n`);
    return EXIT.ok;
  },
};
