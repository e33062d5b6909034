/** POST /api/v1/forces: loads on the support over whole beats, as series and harmonic lines. */
import { z } from 'zod';
import { COMPONENTS, LINEAR_AXES, ROTARY_AXES } from '../../src/components.js';
import { forces } from '../../src/forces.js';
import { LIMITS } from '../../src/limits.js';
import { ScenarioSchema } from '../../src/scenario.js';
import { harmonicsCsv, seriesCsv } from '../../src/tables.js';
import { sendIssues, type ServiceIssue } from '../errors.js';
import { SERVICE_LIMITS } from '../limits.js';
import { chooseFormat, FormatSchema, sendCsv, sendJson } from '../format.js';
import { inputHash } from '../hash.js';
import { defineRoute } from '../route.js';
import { errorResponses, stamp, Vec3Schema } from '../schemas.js';

export const ScenarioBody = { schema: ScenarioSchema, ref: 'Scenario', description: 'a scenario document (quantities as SI numbers or strings with units)' };

const AXES = [...new Set([...ROTARY_AXES, ...LINEAR_AXES])] as [string, ...string[]];

export const LineSchema = z.strictObject({
  component: z.enum(COMPONENTS),
  axis: z.enum(AXES),
  order: z.number().int().min(0),
  amplitude: z.number().meta({ description: 'single-sided amplitude A_k ≥ 0 (N)' }),
  phase: z.number().meta({ description: 'ψ_k in (−π, π] (rad) of A_k cos(kωt + ψ_k), t = 0 at the waveform origin' }),
});

const SeriesSchema = z.strictObject({
  time: z.array(z.number()).meta({ description: 's' }),
  stroke: z.array(z.number()).meta({ description: 'stroke angle φ (rad) or drive position x (m)' }),
  deviation: z.array(z.number()).optional().meta({ description: 'out-of-plane deviation θ (rad)' }),
  loads: z.partialRecord(z.enum(COMPONENTS), z.partialRecord(z.enum(AXES), z.array(z.number()))).meta({ description: 'component → axis → load series (N)' }),
});

export const OrganAnswerSchema = z.strictObject({
  side: z.enum(['right', 'left', 'midline']),
  role: z.enum(['specified', 'mirror']),
  frame: z.record(z.string(), Vec3Schema).meta({ description: 'organ-frame axes at zero stroke, in body axes' }),
  harmonics: z.array(LineSchema),
  series: SeriesSchema.optional(),
});

export const ForcesAnswerSchema = z.strictObject({
  ...stamp,
  path: z.enum(['closed-form', 'sampled']).meta({ description: 'how the lines were computed' }),
  scenario: z.record(z.string(), z.unknown()).meta({ description: 'the normalised scenario: every quantity in SI, defaults filled in' }),
  units: z.record(z.string(), z.string()),
  warnings: z.array(z.string()),
  fit: z
    .strictObject({ harmonics: z.number(), points: z.number(), residualRms: z.number(), conditionNumber: z.number(), spanBeats: z.number() })
    .optional()
    .meta({ description: 'least-squares fit of a measured stroke trace' }),
  organs: z.array(OrganAnswerSchema).meta({ description: 'the organ as specified, then its mirror' }),
});

const isObject = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);

/**
 * The service's limit on series in one answer (SERVICE_LIMITS.seriesSamples per organ): checked on
 * the raw document before any work, so that a refusal costs microseconds. Values that are not
 * whole numbers are left to the scenario's own checks.
 */
export function seriesOverLimit(doc: unknown): ServiceIssue | undefined {
  if (!isObject(doc)) return undefined;
  const output = doc.output, sampling = doc.sampling;
  if (isObject(output) && output.series === false) return undefined;
  const n = isObject(sampling) && sampling.pointsPerBeat !== undefined ? sampling.pointsPerBeat : 256;
  const beats = isObject(sampling) && sampling.beats !== undefined ? sampling.beats : 1;
  if (!Number.isInteger(n) || !Number.isInteger(beats)) return undefined;
  const samples = (n as number) * (beats as number);
  if (samples <= SERVICE_LIMITS.seriesSamples || samples > LIMITS.samplesPerRequest) return undefined;
  return {
    path: 'sampling.beats',
    message: `${n} points × ${beats} beats = ${samples} samples of series is over the service's limit of ${SERVICE_LIMITS.seriesSamples} samples per organ in one answer; set output.series to false for the lines alone`,
    limit: 'seriesSamples',
  };
}

const ForcesQuery = z.strictObject({
  format: FormatSchema.optional(),
  table: z.enum(['harmonics', 'series'], { error: 'is not a table; expected harmonics or series' }).optional().meta({ description: 'with CSV: the harmonic lines (default) or the load series' }),
});

export const forcesRoute = defineRoute({
  method: 'POST',
  url: '/forces',
  operationId: 'forces',
  summary: 'Loads on the support: harmonic lines and series of the organ and its mirror',
  description: 'The same answer as `beatforce forces FILE`. CSV (`?format=csv` or `Accept: text/csv`) gives the harmonic table, or with `table=series` the load series.',
  tags: ['compute'],
  body: ScenarioBody,
  query: ForcesQuery,
  responses: {
    200: { description: 'the forces answer', schema: ForcesAnswerSchema, csv: true },
    ...errorResponses,
  },
  keepsAnswers: true,
  handler(request, reply, { query }) {
    const hash = inputHash(request.body);
    const over = seriesOverLimit(request.body);
    if (over) {
      sendIssues(reply, [over], hash);
      return;
    }
    const r = forces(request.body);
    if (!r.ok) {
      sendIssues(reply, r.issues, hash);
      return;
    }
    if (chooseFormat(query, request.headers.accept) === 'csv') sendCsv(reply, hash, query.table === 'series' ? seriesCsv(r.answer) : harmonicsCsv(r.answer));
    else sendJson(reply, hash, r.answer);
  },
});
