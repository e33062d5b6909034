/**
 * The `body.maneuver` block (design §3, §8) and the turn's output decimation, as zod schemas.
 * Every value arrives in SI; profiles are checked here once (times increasing, finite numbers,
 * a pulse that lasts), and the core downstream assumes valid SI values.
 *
 * Per axis (`roll`, `pitch`, `yaw`, body axes of ISO 1151-1) a profile is one term or a list of
 * terms that add:
 *   "200 deg/s" or { "constant": r }                      Ω(t) = r
 *   { "pulse": { "peak", "duration", "start" } }           raised-cosine bell, zero outside
 *   { "sine":  { "amplitude", "frequency", "phase" } }     Ω(t) = A sin(2π f t + φ)
 *   { "samples": { "time": [...], "rate": [...] } }        not-a-knot cubic spline (C²)
 */
import { z } from 'zod';
import { LIMITS } from '../limits.js';
import { quantity, show } from '../quantity.js';
import { toSI, type DimensionName } from '../units.js';

const finiteList = (name: string) =>
  z
    .array(z.number({ error: (iss) => `${show(iss.input)} is not a finite number; expected ${name} as plain numbers` }).finite(), {
      error: (iss) => `${show(iss.input)} is not a list of numbers; expected ${name}`,
    })
    .superRefine((v, ctx) => {
      if (v.length > LIMITS.tracePoints) ctx.addIssue({ code: 'custom', message: `${v.length} points is over the limit of ${LIMITS.tracePoints}`, params: { limit: 'tracePoints' } });
    });

const unitScale = (u: unknown, dim: DimensionName): number | undefined => {
  if (u === undefined) return 1;
  const r = toSI(`1 ${String(u)}`, [dim]);
  return r.ok ? r.value : undefined;
};

/** Closest spacing of a rate trace's samples (s). */
const MIN_SPACING = 1e-9;

/** A measured rate trace; times strictly increasing, one rate per time, at least two points. */
const samplesTerm = z
  .strictObject({
    samples: z.strictObject({
      time: finiteList('times'),
      rate: finiteList('rates'),
      timeUnit: z.string().max(20).optional(),
      rateUnit: z.string().max(20).optional(),
    }),
  })
  .transform(({ samples: s }, ctx) => {
    const ts = unitScale(s.timeUnit, 'time');
    const rs = unitScale(s.rateUnit, 'angularRate');
    if (ts === undefined) ctx.addIssue({ code: 'custom', path: ['samples', 'timeUnit'], message: `${show(s.timeUnit)} is not a unit of time; expected e.g. 'ms'` });
    if (rs === undefined) ctx.addIssue({ code: 'custom', path: ['samples', 'rateUnit'], message: `${show(s.rateUnit)} is not a unit of angular rate; expected e.g. 'deg/s'` });
    if (ts === undefined || rs === undefined) return z.NEVER;
    if (s.rate.length !== s.time.length) {
      ctx.addIssue({ code: 'custom', path: ['samples', 'rate'], message: `has ${s.rate.length} points but time has ${s.time.length}; expected one rate per time` });
      return z.NEVER;
    }
    if (s.time.length < 2) {
      ctx.addIssue({ code: 'custom', path: ['samples', 'time'], message: `${s.time.length} point(s) cannot make a profile; expected at least 2` });
      return z.NEVER;
    }
    for (let i = 1; i < s.time.length; i++) {
      if (!((s.time[i] as number) > (s.time[i - 1] as number))) {
        ctx.addIssue({ code: 'custom', path: ['samples', 'time', i], message: `${s.time[i]} does not come after ${s.time[i - 1]}; expected times strictly increasing` });
        return z.NEVER;
      }
    }
    // The spline divides by each spacing: spacings below any recording's (under a nanosecond) would
    // make rate steps of 1e200 rad/s² and beyond, so they are refused rather than left to overflow.
    for (let i = 1; i < s.time.length; i++) {
      const gap = ((s.time[i] as number) - (s.time[i - 1] as number)) * ts;
      if (!(gap >= MIN_SPACING)) {
        ctx.addIssue({ code: 'custom', path: ['samples', 'time', i], message: `${s.time[i]} is only ${gap.toPrecision(3)} s after ${s.time[i - 1]}; expected samples at least 1 ns apart` });
        return z.NEVER;
      }
    }
    return { kind: 'samples' as const, time: s.time.map((t) => t * ts), rate: s.rate.map((r) => r * rs) };
  });

/** A plain rate is shorthand for { "constant": rate }. */
const rateTerm = quantity('angularRate').transform((rate) => ({ kind: 'constant' as const, rate }));
const constantTerm = z.strictObject({ constant: quantity('angularRate') }).transform((v) => ({ kind: 'constant' as const, rate: v.constant }));

const pulseTerm = z
  .strictObject({
    pulse: z.strictObject({
      peak: quantity('angularRate'),
      duration: quantity('time', 'positive', 'a pulse needs a duration such as \'60 ms\'').superRefine((d, ctx) => {
        // Its Ω̇ peaks at πP/D: below a nanosecond that heads for overflow, and no body turns so.
        if (d < MIN_SPACING) ctx.addIssue({ code: 'custom', message: `${d} s is shorter than a nanosecond; expected a pulse of at least 1 ns` });
      }),
      start: quantity('time').default(0),
    }),
  })
  .transform(({ pulse: p }) => ({ kind: 'pulse' as const, ...p }));

const sineTerm = z
  .strictObject({
    sine: z.strictObject({
      amplitude: quantity('angularRate'),
      frequency: quantity('frequency', 'positive', 'a sine profile needs a frequency such as \'12 Hz\''),
      phase: quantity('angle').default(0),
    }),
  })
  .transform(({ sine: s }) => ({ kind: 'sine' as const, ...s }));

const TERM_HINT = `expected a rate such as '200 deg/s', { "constant": r }, { "pulse": { "peak", "duration", "start" } }, { "sine": { "amplitude", "frequency", "phase" } } or { "samples": { "time", "rate" } }`;

// The term kinds are branches of one union (no nesting), so that an issue deep inside the branch
// the user meant (e.g. body.maneuver.yaw.pulse.duration) is the one reported.
const TERMS = [rateTerm, constantTerm, pulseTerm, sineTerm, samplesTerm] as const;
const term = z.union(TERMS, { error: (iss) => `${show(iss.input)} is not a rate profile; ${TERM_HINT}` });

/** Most terms one axis may add up. */
export const MAX_TERMS = 16;

const axisProfile = z.union(
  [
    ...TERMS.map((t) => t.transform((x) => [x])),
    z.array(term, { error: (iss) => `${show(iss.input)} is not a rate profile; ${TERM_HINT}, or a list of these that add` })
      .min(1, 'is an empty list; expected at least one profile term')
      .max(MAX_TERMS, `has more than ${MAX_TERMS} terms; expected at most ${MAX_TERMS} terms that add`),
  ],
  { error: (iss) => `${show(iss.input)} is not a rate profile; ${TERM_HINT}, or a list of these that add` },
);

export const ManeuverSchema = z.strictObject(
  {
    duration: quantity('time', 'positive', 'the maneuver needs a duration such as \'200 ms\''),
    roll: axisProfile.optional(),
    pitch: axisProfile.optional(),
    yaw: axisProfile.optional(),
  },
  { error: (iss) => (iss.code === 'invalid_type' ? `${show(iss.input)} is not a maneuver; expected { "duration", "roll"?, "pitch"?, "yaw"? }` : undefined) },
);

export type Maneuver = z.output<typeof ManeuverSchema>;
export type ProfileTerm = z.output<typeof term>;
export type AxisProfile = ProfileTerm[];

/**
 * Decimation of a turn's series (never silent truncation): every k-th sample, or the minimum and
 * maximum of each series over each beat.
 */
export const DecimateSchema = z.union(
  [
    z.strictObject({
      every: z.number({ error: (iss) => `${show(iss.input)} is not a whole number; expected every k-th sample, k ≥ 1` }).int('is not a whole number; expected every k-th sample, k ≥ 1').min(1, 'must be at least 1 (1 keeps every sample)'),
    }),
    z.strictObject({ envelope: z.literal(true, { error: 'expected true (min/max of each series over each beat)' }) }),
  ],
  { error: (iss) => `${show(iss.input)} is not a decimation; expected { "every": k } or { "envelope": true }` },
);

export type Decimate = z.output<typeof DecimateSchema>;
