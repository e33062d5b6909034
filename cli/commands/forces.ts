import { forces } from '../../src/forces.js';
import { harmonicsCsv, seriesCsv } from '../../src/tables.js';
import { answerDocument, type Command } from '../io.js';

export const forcesCommand: Command = {
  name: 'forces',
  summary: 'loads on the support over whole beats: series and harmonic lines (as POST /api/v1/forces)',
  usage: `beatforce forces FILE|- [--format json|csv] [--series] [--compact]

  FILE        a scenario document (JSON); - reads standard input
  --format    json (default: the answer of POST /api/v1/forces) or csv (the harmonic table)
  --series    with --format csv: the load series instead of the harmonic table
  --compact   JSON on one line`,
  run(argv, io) {
    return answerDocument(argv, io, forces, { table: harmonicsCsv, series: seriesCsv });
  },
};
