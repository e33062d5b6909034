import { beatsCsv, turnSeriesCsv } from '../../src/turn/tables.js';
import { turn } from '../../src/turn/turn.js';
import { answerDocument, type Command } from '../io.js';

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
    return answerDocument(argv, io, turn, { table: beatsCsv, series: turnSeriesCsv });
  },
};
