/** POST /api/v1/sensing: scale factors, noise, SNR, minimum detectable rate, bias; the pair. */
import { z } from 'zod';
import { CONVENTIONS, SENSING_UNITS, sensing, sensingCsv } from '../../src/sensing/index.js';
import { sendIssues } from '../errors.js';
import { chooseFormat, FormatSchema, registerFixedJson, sendCsv, sendJson } from '../format.js';
import { inputHash } from '../hash.js';
import { defineRoute } from '../route.js';
import { errorResponses, stamp } from '../schemas.js';
import { ScenarioBody } from './forces.js';

registerFixedJson(CONVENTIONS, SENSING_UNITS);

const rates = <T extends z.ZodType>(t: T) => z.strictObject({ roll: t, pitch: t, yaw: t });
const num = z.number();
const nnum = z.number().nullable();

const ChannelSchema = z.strictObject({
  axis: z.string().meta({ description: 'organ axis read' }),
  order: z.number().int(),
  frequency: num.meta({ description: 'Hz' }),
  quantity: z.enum(['load', 'strain', 'displacement']),
  unit: z.string(),
  referencePhase: num.meta({ description: 'ψ_ref of the lock-in (rad)' }),
});

const BiasSchema = z.strictObject({
  primary: num, misalignment: num, quadrature: num, phaseError: num, centrifugal: num, gravity: num, translational: num, angularAcceleration: num,
  perAngularAcceleration: z.strictObject({ inPhase: num, quadrature: num }),
  worstCase: num,
}).meta({ description: 'equivalent rates (rad/s) of what else lands on the channel' });

const AxisSchema = z.strictObject({
  channel: ChannelSchema.nullable().meta({ description: 'the best single line for this body axis' }),
  scaleFactor: num.meta({ description: 'K = ∂I/∂Ω: in-phase output per rad/s (channel unit per rad/s)' }),
  quadratureScaleFactor: num,
  crossAxis: rates(num).nullable(),
  rate: num.meta({ description: "the scenario's rate about this axis (rad/s)" }),
  signal: num,
  noise: z.strictObject({ density: num, thermalDensity: num, readoutDensity: num, sigma: num, limitedBy: z.enum(['thermal', 'readout', 'none']) }).nullable(),
  snr: nnum,
  minimumRate: nnum.meta({ description: 'rad/s at the threshold SNR' }),
  detectable: z.boolean().nullable().meta({ description: "SNR ≥ threshold at the scenario's rate; null without a noise model or at zero rate" }),
  rateNoiseDensity: nnum.meta({ description: '(rad/s)/Hz^0.5, one-sided' }),
  angleRandomWalk: nnum.meta({ description: 'deg/h^0.5 (IEEE Std 952 / 1431)' }),
  bias: BiasSchema.nullable(),
});

const strains = <T extends z.ZodType>(t: T) => z.strictObject({ axial: t, inPlane: t, outOfPlane: t });
const StrainAxisSchema = z.enum(['axial', 'inPlane', 'outOfPlane']);
const StrainLineSchema = z.strictObject({ axis: StrainAxisSchema, order: z.number().int(), amplitude: num, phase: num });
const SenseLineSchema = z.strictObject({ order: z.number().int(), amplitude: num.meta({ description: 'm' }), phase: num });

const StrainSchema = z.strictObject({
  section: z.strictObject({
    outer: z.tuple([num, num]).meta({ description: 'outer semi-axes [normal, in-plane] (m)' }),
    inner: z.tuple([num, num]).meta({ description: 'inner semi-axes [normal, in-plane] (m)' }),
    secondMomentNormal: num.meta({ description: 'm^4' }),
    secondMomentInPlane: num.meta({ description: 'm^4' }),
    area: num.meta({ description: 'm^2' }),
  }),
  leverArm: num.meta({ description: 'm' }),
  perLoad: strains(num).meta({ description: 'base strain per newton of load' }),
  dynamic: StrainAxisSchema.nullable().meta({ description: 'the strain that follows the sense mode, or null' }),
  harmonics: z.array(StrainLineSchema).optional().meta({ description: 'with output.lines: strain lines of the total load' }),
  rateInduced: z.array(StrainLineSchema).optional().meta({ description: 'with output.lines: strain lines of the rate-induced load' }),
  series: z.strictObject({ time: z.array(num), axial: z.array(num), inPlane: z.array(num), outOfPlane: z.array(num) }).optional().meta({ description: 'with output.series' }),
  peak: strains(num).optional().meta({ description: 'with output.series: largest |strain| of each series' }),
}).meta({ description: 'stalk section and base strain (with organ.stalk)' });

const SenseModeSchema = z.strictObject({
  axis: z.string(),
  frequency: num.meta({ description: 'Hz' }),
  quality: num,
  mass: num.meta({ description: 'kg' }),
  stiffness: num.meta({ description: 'N/m' }),
  damping: num.meta({ description: 'N s/m' }),
  thermalForceDensity: num.meta({ description: 'N/Hz^0.5, one-sided' }),
  transfer: z.array(z.strictObject({ order: z.number().int(), frequency: num, magnitude: num.meta({ description: 'm/N' }), phase: num, forceGain: num })).optional().meta({ description: 'with output.lines' }),
  perUnitRate: rates(z.array(SenseLineSchema)).optional().meta({ description: 'with output.lines: displacement lines per rad/s' }),
  displacement: z.array(SenseLineSchema).optional().meta({ description: 'with output.lines: displacement lines at the scenario rates' }),
  series: z.strictObject({ time: z.array(num), displacement: z.array(num) }).optional().meta({ description: 'with output.series' }),
}).meta({ description: 'sense-mode constants and displacement (with organ.senseMode)' });

const OrganSensingSchema = z.strictObject({
  side: z.enum(['right', 'left', 'midline']),
  role: z.enum(['specified', 'mirror']),
  read: z.strictObject({ axes: z.array(z.string()), quantity: z.enum(['load', 'strain', 'displacement']), unit: z.string() }),
  axes: rates(AxisSchema),
  strain: StrainSchema.optional(),
  senseMode: SenseModeSchema.optional(),
});

const PairAxisSchema = z.strictObject({
  minimumRate: nnum.meta({ description: 'rad/s, both organs read together' }),
  observable: z.boolean(),
  detectable: z.boolean().nullable().meta({ description: "|rate| ≥ minimumRate at the scenario's rate; null without a noise model or at zero rate" }),
});

const PairRowSchema = z.strictObject({
  side: z.enum(['right', 'left', 'midline']),
  role: z.enum(['specified', 'mirror']),
  axis: z.string(),
  order: z.number().int(),
  quantity: z.enum(['load', 'strain', 'displacement']),
  unit: z.string(),
  referencePhase: num,
  noise: num.meta({ description: 'σ of the in-phase output over the integration (channel unit)' }),
  roll: num,
  pitch: num,
  yaw: num,
});

const ConfusionSchema = z.strictObject({
  kind: z.enum(['unobserved', 'confused']),
  axes: z.array(z.enum(['roll', 'pitch', 'yaw'])),
  direction: rates(num).meta({ description: 'unit rate direction the pair (almost) cannot see' }),
  ratio: num,
  message: z.string(),
});

const PairSchema = z.strictObject({
  organs: num,
  channels: num,
  weighted: z.boolean(),
  roll: PairAxisSchema,
  pitch: PairAxisSchema,
  yaw: PairAxisSchema,
  conditionNumber: nnum,
  singularValues: z.tuple([num, num, num]),
  covariance: z.array(z.array(nnum)).meta({ description: 'rate covariance (Hᵀ R⁻¹ H)⁻¹, (rad/s)²' }),
  confusions: z.array(ConfusionSchema),
  matrix: z.array(PairRowSchema).meta({ description: 'H: one row per channel (side, axis, order, noise, in-phase output per rad/s of roll, pitch, yaw)' }),
});

export const SensingAnswerSchema = z.strictObject({
  ...stamp,
  path: z.enum(['closed-form', 'sampled']),
  scenario: z.record(z.string(), z.unknown()).meta({ description: 'the normalised scenario: every quantity in SI, defaults filled in' }),
  units: z.record(z.string(), z.string()),
  conventions: z.record(z.string(), z.string()),
  warnings: z.array(z.string()),
  integration: z.strictObject({ time: num, beats: num }),
  organs: z.array(OrganSensingSchema),
  pair: PairSchema,
});

export const sensingRoute = defineRoute({
  method: 'POST',
  url: '/sensing',
  operationId: 'sensing',
  summary: 'Scale factor, noise, SNR, minimum detectable rate, angle random walk and bias per body axis, per organ and for the pair',
  description: 'The same answer as `beatforce sensing FILE`. CSV (`?format=csv` or `Accept: text/csv`): one row per organ and body axis, then the pair.',
  tags: ['compute'],
  body: ScenarioBody,
  query: z.strictObject({ format: FormatSchema.optional() }),
  responses: {
    200: { description: 'the sensing answer', schema: SensingAnswerSchema, csv: true },
    ...errorResponses,
  },
  keepsAnswers: true,
  handler(request, reply, { query }) {
    const hash = inputHash(request.body);
    const r = sensing(request.body);
    if (!r.ok) {
      sendIssues(reply, r.issues, hash);
      return;
    }
    if (chooseFormat(query, request.headers.accept) === 'csv') sendCsv(reply, hash, sensingCsv(r.answer));
    else sendJson(reply, hash, r.answer);
  },
});
