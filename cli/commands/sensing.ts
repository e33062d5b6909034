import { sensing } from '../../src/sensing/sensing.js';
import { sensingCsv } from '../../src/sensing/table.js';
import { EXIT, parseArgs, readDocument, reportIssues, UsageError, type Command } from '../io.js';

export const sensingCommand: Command = {
  name: 'sensing',
  summary: 'scale factor, noise, SNR, smallest detectable rate and bias per body axis, per organ and for the pair (as POST /api/v1/sensing)',
  usage: `beatforce sensing FILE|- [--format json|csv] [--compact]

  FILE        a scenario document (JSON), with optional organ.stalk, organ.senseMode and sensor;
              - reads standard input
  --format    json (default: the answer of POST /api/v1/sensing) or csv (one row per organ and
              body axis: channel, scale factor, noise, SNR, minimum rate, ARW, bias; then the
              pair's minimum rates; units in the header)
  --compact   JSON on one line`,
  run(argv, io) {
    const { positional, opts } = parseArgs(argv, { format: 'string', compact: 'bool' });
    const format = (opts.format as string | undefined) ?? 'json';
    if (format !== 'json' && format !== 'csv') throw new UsageError(`--format ${format}: expected json or csv`);
    const read = readDocument(positional[0], io);
    if ('issues' in read) return reportIssues(read.issues, io);
    const r = sensing(read.doc);
    if (!r.ok) return reportIssues(r.issues, io);
    for (const w of r.answer.warnings) io.err(`warning: ${w}\n`);
    if (format === 'csv') io.out(sensingCsv(r.answer));
    else io.out(`${JSON.stringify(r.answer, null, opts.compact ? undefined : 2)}\n`);
    return EXIT.ok;
  },
};
