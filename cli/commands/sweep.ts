import { sweep, sweepCsv } from '../../src/sweep.js';
import { answerDocument, type Command } from '../io.js';

export const sweepCommand: Command = {
  name: 'sweep',
  summary: 'chosen outputs (harmonic lines, sensing figures) over a grid of one or two scenario fields (as POST /api/v1/sweep)',
  usage: `beatforce sweep FILE|- [--format json|csv] [--compact]

  FILE        a sweep request (JSON), the body of POST /api/v1/sweep:
              { "scenario": {...}, "vary": [one or two grid axes], "outputs": [...] };
              - reads standard input. See examples/sweeps/ and docs/service.md (Sweeps)
  --format    json (default: the answer of POST /api/v1/sweep) or csv (one row per grid
              point: the varied values, then the outputs; units in the header)
  --compact   JSON on one line

  The grid limits are the service's (10,000 points for a rate sweep of lines, 1,000 computed
  point by point); the service's time budget per sweep does not apply here.`,
  run(argv, io) {
    return answerDocument(argv, io, (doc) => sweep(doc), { table: sweepCsv }, 'sweep request');
  },
};
