import { forces } from '../../src/forces.js';
import { harmonicsCsv, seriesCsv } from '../../src/tables.js';
import { EXIT, parseArgs, readDocument, reportIssues, UsageError, type Command } from '../io.js';

export const forcesCommand: Command = {
  name: 'forces',
  summary: 'loads on the support over whole beats: series and harmonic lines (as POST /api/v1/forces)',
  usage: `beatforce forces FILE|- [--format json|csv] [--series] [--compact]

  FILE        a scenario document (JSON); - reads standard input
  --format    json (default: the answer of POST /api/v1/forces) or csv (the harmonic table)
  --series    with --format csv: the load series instead of the harmonic table
  --compact   JSON on one line`,
  run(argv, io) {
    const { positional, opts } = parseArgs(argv, { format: 'string', series: 'bool', compact: 'bool' });
    const format = (opts.format as string | undefined) ?? 'json';
    if (format !== 'json' && format !== 'csv') throw new UsageError(`--format ${format}: expected json or csv`);
    if (opts.series && format !== 'csv') throw new UsageError('--series goes with --format csv');
    const read = readDocument(positional[0], io);
    if ('issues' in read) return reportIssues(read.issues, io);
    const r = forces(read.doc);
    if (!r.ok) return reportIssues(r.issues, io);
    for (const w of r.answer.warnings) io.err(`warning: ${w}\n`);
    if (format === 'csv') io.out(opts.series ? seriesCsv(r.answer) : harmonicsCsv(r.answer));
    else io.out(`${JSON.stringify(r.answer, null, opts.compact ? undefined : 2)}\n`);
    return EXIT.ok;
  },
};
