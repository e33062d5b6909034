/** POST /api/v1/sweep: chosen outputs over a grid of one or two scenario fields. */
import { z } from 'zod';
import { sweep, sweepCsv, SweepRequestSchema, type SensingFn } from '../../src/sweep.js';
import { sendIssues } from '../errors.js';
import { chooseFormat, FormatSchema, sendCsv, sendJson } from '../format.js';
import { inputHash } from '../hash.js';
import { defineRoute } from '../route.js';
import { errorResponses, stamp } from '../schemas.js';

export const SweepAnswerSchema = z.strictObject({
  ...stamp,
  method: z.enum(['rate-polynomial', 'per-point']).meta({ description: 'rate-polynomial: only body rates vary and every output is a line (each line is a quadratic in the body rate, fixed by ten evaluations); per-point: each grid point computed afresh' }),
  path: z.enum(['closed-form', 'sampled']).optional().meta({ description: 'how the lines were computed' }),
  points: z.number().int(),
  columns: z.array(z.strictObject({ name: z.string(), unit: z.string().meta({ description: "SI unit ('1' for plain numbers)" }), kind: z.enum(['field', 'line', 'sensing']) })),
  rows: z.array(z.array(z.number().nullable())).meta({ description: 'one row per grid point (first field outer): the varied values, then the outputs in request order; null where not finite' }),
  warnings: z.array(z.string()),
});

export interface SweepRouteOptions {
  sensing?: SensingFn;
  /** Compute-time budget of one sweep (ms). */
  budgetMs: number;
}

export const sweepRoute = (opts: SweepRouteOptions) =>
  defineRoute({
    method: 'POST',
    url: '/sweep',
    operationId: 'sweep',
    summary: 'Chosen outputs (harmonic lines, sensing figures) over a grid of one or two scenario fields',
    description:
      'Vary one or two scenario fields (a list of values, or from/to/steps with linear or log spacing; two fields span their product) and tabulate the outputs per grid point. CSV (`?format=csv` or `Accept: text/csv`): one row per grid point, header `name_unit`.',
    tags: ['compute'],
    body: { schema: SweepRequestSchema, ref: 'SweepRequest', description: 'the scenario, the grid axes and the outputs' },
    query: z.strictObject({ format: FormatSchema.optional() }),
    responses: {
      200: { description: 'the table', schema: SweepAnswerSchema, csv: true },
      ...errorResponses,
    },
    keepsAnswers: true,
    handler(request, reply, { query }) {
      const hash = inputHash(request.body);
      const r = sweep(request.body, { sensing: opts.sensing, now: () => performance.now(), budgetMs: opts.budgetMs });
      if (!r.ok) {
        sendIssues(reply, r.issues, hash, r.issues.some((i) => i.path.startsWith('scenario')) ? 'invalid_scenario' : 'invalid_request');
        return;
      }
      if (chooseFormat(query, request.headers.accept) === 'csv') sendCsv(reply, hash, sweepCsv(r.answer));
      else sendJson(reply, hash, r.answer);
    },
  });
