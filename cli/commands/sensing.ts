import { sensing } from '../../src/sensing/sensing.js';
import { sensingCsv } from '../../src/sensing/table.js';
import { answerDocument, type Command } from '../io.js';

export const sensingCommand: Command = {
  name: 'sensing',
  summary: 'scale factor, noise, SNR, smallest detectable rate and bias per body axis, per organ and for the pair (as POST /api/v1/sensing)',
  usage: `beatforce sensing FILE|- [--format json|csv] [--compact]

  FILE        a scenario document (JSON), with optional organ.stalk, organ.senseMode and sensor;
              - reads standard input. In the document, output.lines (default false) adds the
              strain and sense-mode line tables, output.series (default true) their series
  --format    json (default: the answer of POST /api/v1/sensing) or csv (one row per organ and
              body axis: channel, scale factor, noise, SNR, minimum rate, detectable, ARW, bias;
              then the pair's minimum rates; units in the header)
  --compact   JSON on one line`,
  run(argv, io) {
    return answerDocument(argv, io, sensing, { table: sensingCsv });
  },
};
