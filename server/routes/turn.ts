/** POST /api/v1/turn: a body maneuver beat by beat: read-out, estimated against true rates, lag. */
import { z } from 'zod';
import { beatsCsv, turn, turnSeriesCsv } from '../../src/turn/index.js';
import { sendIssues } from '../errors.js';
import { chooseFormat, FormatSchema, sendCsv, sendJson } from '../format.js';
import { inputHash } from '../hash.js';
import { defineRoute } from '../route.js';
import { errorResponses, stamp } from '../schemas.js';
import { ScenarioBody } from './forces.js';

const num = z.number();
const nnum = z.number().nullable();
const rates = <T extends z.ZodType>(t: T) => z.strictObject({ roll: t, pitch: t, yaw: t });

const BeatSchema = z.strictObject({
  time: num.meta({ description: 'centre of the beat (s)' }),
  trueRate: rates(num).meta({ description: 'rad/s, averaged over the beat' }),
  estimatedRate: rates(nnum).meta({ description: 'rad/s, from the lock-in outputs over the window ending with this beat; null where not observable' }),
  inPhase: z.array(num).meta({ description: "this beat's in-phase output of every channel, in the order of readout.channels" }),
});

export const TurnAnswerSchema = z.strictObject({
  ...stamp,
  scenario: z.record(z.string(), z.unknown()).meta({ description: 'the normalised scenario: every quantity in SI, defaults filled in' }),
  units: z.record(z.string(), z.string()),
  warnings: z.array(z.string()),
  run: z.strictObject({ duration: num, beats: num, pointsPerBeat: num, samples: num, sampleInterval: num }),
  attitude: z.strictObject({ initial: rates(num), final: rates(num), normDrift: num }),
  readout: z.record(z.string(), z.unknown()).meta({ description: 'lock-in window, channels (side, axis, order, unit, sensitivity, baseline), condition number, confusions, noise' }),
  beats: z.array(BeatSchema),
  lag: rates(nnum).meta({ description: 'delay of the estimate behind the true rate (s); null where the rate does not vary' }),
  error: rates(z.strictObject({ rms: num, max: num }).nullable()),
  peakStrain: z.record(z.string(), z.unknown()).optional().meta({ description: 'with a stalk: largest strain magnitude per kind, over both organs and the run' }),
  series: z.record(z.string(), z.unknown()).optional().meta({ description: 'rates, attitude, gravity, loads (and strain) over the run, decimated as output.decimate asks' }),
});

export const turnRoute = defineRoute({
  method: 'POST',
  url: '/turn',
  operationId: 'turn',
  summary: 'A body maneuver beat by beat: lock-in read-out, estimated against true rates, lag, peak strain, decimated series',
  description:
    'The same answer as `beatforce turn FILE`; the scenario needs body.maneuver. CSV (`?format=csv` or `Accept: text/csv`): one row per beat, or with `table=series` the (decimated) series.',
  tags: ['compute'],
  body: ScenarioBody,
  query: z.strictObject({
    format: FormatSchema.optional(),
    table: z.enum(['beats', 'series'], { error: 'is not a table; expected beats or series' }).optional().meta({ description: 'with CSV: the beats (default) or the series' }),
  }),
  responses: {
    200: { description: 'the turn answer', schema: TurnAnswerSchema, csv: true },
    ...errorResponses,
  },
  keepsAnswers: true,
  handler(request, reply, { query }) {
    const hash = inputHash(request.body);
    const r = turn(request.body);
    if (!r.ok) {
      sendIssues(reply, r.issues, hash);
      return;
    }
    if (chooseFormat(query, request.headers.accept) === 'csv') sendCsv(reply, hash, query.table === 'series' ? turnSeriesCsv(r.answer) : beatsCsv(r.answer));
    else sendJson(reply, hash, r.answer);
  },
});
