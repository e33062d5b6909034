/**
 * The scenario document (design §8) as a zod schema. Parsing is the one place where outside
 * input is checked: it converts every quantity to SI and refuses what the core cannot use,
 * naming the field, the value and what was expected. The core downstream assumes valid SI values.
 */
import { z } from 'zod';
import { type DimensionName, DIMENSIONS, toSI } from './units.js';
import { quantity, quantityOneOf, show } from './quantity.js';
import { LIMITS, nestedTooDeep, type LimitName } from './limits.js';
import { dot, norm, type Vec3 } from './vec.js';
import { DecimateSchema, ManeuverSchema } from './turn/schema.js';

export { quantity, quantityOneOf } from './quantity.js';

export interface Issue {
  path: string;
  message: string;
  /** Set when the issue is a limit on work per request rather than an invalid value. */
  limit?: LimitName;
}

const finite = z.number({ error: (iss) => `${show(iss.input)} is not a finite number` }).finite();

/** A direction in body axes: three plain numbers, normalised; zero length refused. */
export const direction = z.tuple([finite, finite, finite], { error: (iss) => `${show(iss.input)} is not a direction; expected three numbers [x, y, z] in body axes` }).transform((v, ctx) => {
  const n = norm(v);
  if (!(n > 1e-12) || !Number.isFinite(n)) {
    ctx.addIssue({ code: 'custom', message: `${show(v)} has zero length; expected a direction [x, y, z] in body axes` });
    return z.NEVER;
  }
  return [v[0] / n, v[1] / n, v[2] / n] as Vec3;
});

const vector = (dim: DimensionName) => z.tuple([quantity(dim), quantity(dim), quantity(dim)], { error: (iss) => `${show(iss.input)} is not a vector; expected three quantities [x, y, z] in body axes` }).transform((v) => v as Vec3);

const int = (name: string, min: number, max: number, limit?: LimitName) =>
  z.number({ error: (iss) => `${show(iss.input)} is not a whole number; expected ${name} from ${min} to ${max}` }).superRefine((v, ctx) => {
    if (!Number.isInteger(v)) ctx.addIssue({ code: 'custom', message: `${show(v)} is not a whole number; expected ${name} from ${min} to ${max}` });
    else if (v < min) ctx.addIssue({ code: 'custom', message: `${v} is too small; expected ${name} from ${min} to ${max}` });
    else if (v > max) ctx.addIssue({ code: 'custom', message: `${v} is over the limit of ${max} ${name}`, params: limit ? { limit } : undefined });
  });

const numberArray = (name: string) =>
  z.array(finite, { error: (iss) => `${show(iss.input)} is not a list of numbers; expected ${name}` }).superRefine((v, ctx) => {
    if (v.length > LIMITS.tracePoints) ctx.addIssue({ code: 'custom', message: `${v.length} points is over the limit of ${LIMITS.tracePoints}`, params: { limit: 'tracePoints' } });
  });

// ---- stroke waveforms -------------------------------------------------------------------------

const harmonicTerm = (dim: DimensionName) =>
  z.strictObject({
    order: int('harmonic order', 1, LIMITS.waveformTerms),
    cos: quantity(dim).default(0),
    sin: quantity(dim).default(0),
  });

/** A measured trace: times and values (numbers, in SI unless units are named), fitted to K harmonics. */
const samplesWave = (valueKey: 'angle' | 'position', dim: DimensionName) =>
  z.strictObject({
    samples: z.strictObject({
      time: numberArray('times'),
      [valueKey]: numberArray(valueKey === 'angle' ? 'stroke angles' : 'positions'),
      timeUnit: z.string().optional(),
      [`${valueKey}Unit`]: z.string().optional(),
    }),
    harmonics: int('harmonics', 1, LIMITS.fitHarmonics),
  }).transform((w, ctx) => {
    const s = w.samples as Record<string, unknown>;
    const time = s.time as number[];
    const values = s[valueKey] as number[];
    const scaleOf = (unitKey: string, d: DimensionName): number | undefined => {
      const u = s[unitKey];
      if (u === undefined) return 1;
      const r = toSI(`1 ${String(u)}`, [d]);
      if (!r.ok) {
        ctx.addIssue({ code: 'custom', path: ['samples', unitKey], message: `${show(u)} is not a unit of ${DIMENSIONS[d].name.replace(/^an? /, '')}; expected e.g. '${d === 'time' ? 'ms' : dim === 'angle' ? 'deg' : 'um'}'` });
        return undefined;
      }
      return r.value;
    };
    const ts = scaleOf('timeUnit', 'time');
    const vs = scaleOf(`${valueKey}Unit`, dim);
    if (ts === undefined || vs === undefined) return z.NEVER;
    if (time.length !== values.length) {
      ctx.addIssue({ code: 'custom', path: ['samples', valueKey], message: `has ${values.length} points but time has ${time.length}; expected one ${valueKey} per time` });
      return z.NEVER;
    }
    const need = 2 * w.harmonics + 1;
    if (time.length < need) {
      ctx.addIssue({ code: 'custom', path: ['samples', 'time'], message: `${time.length} points cannot support ${w.harmonics} harmonics; expected at least 2K+1 = ${need} points` });
      return z.NEVER;
    }
    if (time.length * need * need > LIMITS.fitWork) {
      const most = Math.floor((Math.sqrt(LIMITS.fitWork / time.length) - 1) / 2);
      ctx.addIssue({
        code: 'custom', path: ['harmonics'], params: { limit: 'fitWork' },
        message: `${w.harmonics} harmonics over ${time.length} points is over the limit of ${LIMITS.fitWork.toExponential(0).replace('e+', 'e')} for points × (2K+1)², the work of the fit; expected at most ${most} harmonics for this trace, or fewer points`,
      });
      return z.NEVER;
    }
    for (let i = 1; i < time.length; i++) {
      if (!((time[i] as number) > (time[i - 1] as number))) {
        ctx.addIssue({ code: 'custom', path: ['samples', 'time', i], message: `${time[i]} does not come after ${time[i - 1]}; expected times strictly increasing` });
        return z.NEVER;
      }
    }
    return { samples: { time: time.map((t) => t * ts), values: values.map((x) => x * vs) }, harmonics: w.harmonics };
  });

const waveform = (valueKey: 'angle' | 'position', dim: DimensionName) =>
  z.union(
    [
      z.literal('sine'),
      z.literal('triangle'),
      z.strictObject({ triangle: z.strictObject({ rounding: z.number().gt(0, 'rounding must be greater than 0 (a sharp triangle has infinite acceleration)').lte(1, 'rounding must be at most 1 (1 is a sine)') }) }),
      z.strictObject({ harmonics: z.array(harmonicTerm(dim)).min(1, 'expected at least one harmonic term').max(LIMITS.waveformTerms) }),
      samplesWave(valueKey, dim),
    ],
    {
      error: (iss) =>
        `${show(iss.input)} is not a waveform; expected "sine", "triangle", { "triangle": { "rounding": r } }, { "harmonics": [{ "order", "cos", "sin" }] } or { "samples": { "time", "${valueKey}" }, "harmonics": K }`,
    },
  );

export type Waveform = z.output<ReturnType<typeof waveform>>;

/** Out-of-plane deviation θ(t) of a rotary organ: a harmonic series or a measured trace. */
const deviation = z.union(
  [
    z.strictObject({ harmonics: z.array(harmonicTerm('angle')).min(1).max(LIMITS.waveformTerms), mean: quantity('angle').default(0) }),
    samplesWave('angle', 'angle'),
  ],
  { error: (iss) => `${show(iss.input)} is not a deviation waveform; expected { "harmonics": [...] } or { "samples": { "time", "angle" }, "harmonics": K }` },
);

// ---- organ ------------------------------------------------------------------------------------

const stalk = z.strictObject({
  length: quantity('length', 'positive'),
  outerRadius: quantity('length', 'positive').optional(),
  innerRadius: quantity('length', 'nonNegative').optional(),
  outerSemiAxes: z.tuple([quantity('length', 'positive'), quantity('length', 'positive')]).optional(),
  innerSemiAxes: z.tuple([quantity('length', 'nonNegative'), quantity('length', 'nonNegative')]).optional(),
  modulus: quantity('pressure', 'positive'),
  mass: quantity('mass', 'nonNegative').default(0),
});

const senseMode = z.strictObject({
  frequency: quantity('frequency', 'positive'),
  quality: quantity('dimensionless', 'positive'),
  mass: quantity('mass', 'positive'),
});

const stroke = {
  mass: quantity('mass', 'positive'),
  frequency: quantity('frequency', 'positive'),
  hinge: vector('length').default([0, 0, 0]),
  mirror: z.boolean({ error: (iss) => `${show(iss.input)} is not true or false` }).default(true),
  senseMode: senseMode.optional(),
};

const rotary = z.strictObject({
  drive: z.literal('rotary'),
  ...stroke,
  arm: quantity('length', 'positive'),
  amplitude: quantity('angle', 'positive').optional(),
  peakToPeak: quantity('angle', 'positive').optional(),
  mean: quantity('angle').optional(),
  waveform: waveform('angle', 'angle').default('sine'),
  deviation: deviation.optional(),
  rest: direction,
  normal: direction,
  stalk: stalk.optional(),
});

const linear = z.strictObject({
  drive: z.literal('linear'),
  ...stroke,
  amplitude: quantity('length', 'positive').optional(),
  peakToPeak: quantity('length', 'positive').optional(),
  mean: quantity('length').optional(),
  waveform: waveform('position', 'length').default('sine'),
  driveAxis: direction,
  senseAxis: direction,
});

const organ = z.preprocess(
  (v) => (v !== null && typeof v === 'object' && !Array.isArray(v) && !('drive' in v) ? { drive: 'rotary', ...v } : v),
  z.discriminatedUnion('drive', [rotary, linear], { error: (iss) => (iss.input === undefined || iss.input === null || typeof iss.input !== 'object' ? `${show(iss.input)} is not an organ; expected an object` : `${show((iss.input as Record<string, unknown>).drive)} is not a drive; expected "rotary" or "linear"`) }),
);

// ---- body, sensor, sampling -------------------------------------------------------------------

const rates = z.strictObject({
  roll: quantity('angularRate').default(0),
  pitch: quantity('angularRate').default(0),
  yaw: quantity('angularRate').default(0),
});

const body = z.strictObject({
  rate: rates.prefault({}),
  acceleration: vector('acceleration').default([0, 0, 0]),
  gravity: z.union([z.boolean(), quantity('acceleration', 'nonNegative')], { error: (iss) => `${show(iss.input)} is not a gravity setting; expected true, false or an acceleration such as '9.80665 m/s^2'` }).default(false),
  attitude: z.strictObject({ roll: quantity('angle').default(0), pitch: quantity('angle').default(0), yaw: quantity('angle').default(0) }).prefault({}),
  maneuver: ManeuverSchema.optional(),
});

const sensor = z.strictObject({
  temperature: quantity('temperature', 'positive').default(300),
  readoutNoise: quantityOneOf(['forceDensity', 'strainDensity', 'displacementDensity'] as const, 'nonNegative').optional(),
  integration: z.union([quantity('time', 'positive'), z.strictObject({ beats: int('beats', 1, 1_000_000) })], { error: (iss) => `${show(iss.input)} is not an integration; expected a time such as '20 ms' or { "beats": n }` }).default({ beats: 10 }),
  threshold: quantity('dimensionless', 'positive').default(1),
  misalignment: quantity('angle').default(0),
  phaseError: quantity('angle').default(0),
});

const sampling = z.strictObject({
  pointsPerBeat: int('points per beat', 8, LIMITS.pointsPerBeat, 'pointsPerBeat').default(256),
  beats: int('beats', 1, LIMITS.samplesPerRequest, 'samplesPerRequest').default(1),
  harmonics: int('harmonics', 0, LIMITS.harmonics, 'harmonics').default(8),
});

const output = z.strictObject({
  series: z.boolean().default(true).meta({ description: 'include time series (forces: load series; sensing: strain and sense-mode series; turns: decimated series)' }),
  /** Sensing: add the per-harmonic line tables of the strain and sense-mode blocks. */
  lines: z.boolean().default(false).meta({ description: 'sensing: add the per-harmonic strain and sense-mode line tables' }),
  path: z.enum(['auto', 'closed-form', 'sampled'], { error: (iss) => `${show(iss.input)} is not a path; expected "auto", "closed-form" or "sampled"` }).default('auto').meta({ description: 'auto takes the closed form where it applies (rotary: a sine stroke without deviation; linear: a stroke given as harmonics), else the sampled path' }),
  decimate: DecimateSchema.optional().meta({ description: 'turns: keep every k-th sample ({ "every": k }) or per-beat envelopes ({ "envelope": true })' }),
});

export const ScenarioSchema = z
  .strictObject(
    {
    organ,
    body: body.prefault({}),
    sensor: sensor.optional(),
    sampling: sampling.prefault({}),
    output: output.prefault({}),
    name: z.string().max(200).optional(),
    description: z.string().max(2000).optional(),
    },
    { error: (iss) => (iss.code === 'invalid_type' ? `${show(iss.input)} is not a scenario; expected a JSON object with at least "organ"` : undefined) },
  )
  .superRefine((s, ctx) => {
    const o = s.organ;
    const issue = (path: (string | number)[], message: string, limit?: LimitName) =>
      ctx.addIssue({ code: 'custom', path, message, params: limit ? { limit } : undefined });
    const [a, b, aName, bName] = o.drive === 'rotary' ? [o.rest, o.normal, 'rest', 'normal'] : [o.driveAxis, o.senseAxis, 'driveAxis', 'senseAxis'];
    const c = dot(a, b);
    if (Math.abs(c) > 1e-6) issue(['organ', bName], `is not perpendicular to organ.${aName} (cosine ${c.toPrecision(3)} after normalising); expected |${aName}·${bName}| ≤ 1e-6`);
    const w = o.waveform;
    const periodic = w === 'sine' || w === 'triangle' || 'triangle' in w;
    if (periodic) {
      if (o.amplitude === undefined && o.peakToPeak === undefined) issue(['organ', 'amplitude'], `is required for a ${w === 'sine' ? 'sine' : 'triangle'} stroke; give amplitude (half stroke) or peakToPeak`);
      if (o.amplitude !== undefined && o.peakToPeak !== undefined) issue(['organ', 'peakToPeak'], 'given together with amplitude; give one of them: amplitude is the half stroke, peakToPeak the whole');
    } else {
      for (const key of ['amplitude', 'peakToPeak'] as const) if (o[key] !== undefined) issue(['organ', key], 'is not used with a harmonics or samples waveform; the series sets the stroke');
      if ('samples' in w && o.mean !== undefined) issue(['organ', 'mean'], 'is not used with a measured trace; the fit finds the mean');
    }
    if (o.drive === 'rotary') {
      const amp = o.amplitude ?? (o.peakToPeak === undefined ? undefined : o.peakToPeak / 2);
      if (amp !== undefined && amp >= Math.PI) issue(['organ', o.amplitude === undefined ? 'peakToPeak' : 'amplitude'], `${amp} rad is a half stroke of π or more; give degrees as a string, e.g. '80 deg'`);
      if (o.stalk && o.stalk.outerRadius === undefined && o.stalk.outerSemiAxes === undefined) issue(['organ', 'stalk', 'outerRadius'], 'is required; give outerRadius (a tube) or outerSemiAxes [normal, in-plane] (an elliptical tube)');
      if (o.stalk?.outerRadius !== undefined && o.stalk.innerRadius !== undefined && o.stalk.innerRadius >= o.stalk.outerRadius) issue(['organ', 'stalk', 'innerRadius'], `${o.stalk.innerRadius} m is not smaller than outerRadius ${o.stalk.outerRadius} m`);
      if (o.stalk?.outerRadius !== undefined && o.stalk.outerSemiAxes !== undefined) issue(['organ', 'stalk', 'outerSemiAxes'], 'given together with outerRadius; give one of them: outerRadius for a round tube, outerSemiAxes [normal, in-plane] for an elliptical one');
      if (o.stalk?.innerRadius !== undefined && o.stalk.innerSemiAxes !== undefined) issue(['organ', 'stalk', 'innerSemiAxes'], 'given together with innerRadius; give one of them');
      if (o.stalk?.outerSemiAxes !== undefined) {
        const inner = o.stalk.innerSemiAxes ?? (o.stalk.innerRadius === undefined ? undefined : [o.stalk.innerRadius, o.stalk.innerRadius]);
        const key = o.stalk.innerSemiAxes ? 'innerSemiAxes' : 'innerRadius';
        inner?.forEach((b, i) => {
          const a = o.stalk?.outerSemiAxes?.[i] ?? 0;
          if (b >= a) issue(['organ', 'stalk', key], `${b} m is not smaller than the outer semi-axis ${a} m ${i === 0 ? 'along the normal' : 'in the stroke plane'}; expected a wall of positive thickness`);
        });
      }
    }
    const { pointsPerBeat, beats, harmonics } = s.sampling;
    if (pointsPerBeat * beats > LIMITS.samplesPerRequest) issue(['sampling', 'beats'], `${pointsPerBeat} points × ${beats} beats = ${pointsPerBeat * beats} samples is over the limit of ${LIMITS.samplesPerRequest} samples per request`, 'samplesPerRequest');
    if (harmonics > pointsPerBeat / 2 - 1) issue(['sampling', 'harmonics'], `${harmonics} harmonics need at least ${2 * harmonics + 2} points per beat (Nyquist); pointsPerBeat is ${pointsPerBeat}`);
    if (s.sensor?.integration !== undefined && typeof s.sensor.integration === 'number' && s.sensor.integration < 1 / o.frequency) issue(['sensor', 'integration'], `${s.sensor.integration} s is shorter than one beat (${(1 / o.frequency).toPrecision(4)} s); expected at least one beat`);
  });

export type ScenarioInput = z.input<typeof ScenarioSchema>;
export type Scenario = z.output<typeof ScenarioSchema>;
export type Organ = Scenario['organ'];
export type RotaryOrgan = Extract<Organ, { drive: 'rotary' }>;
export type LinearOrgan = Extract<Organ, { drive: 'linear' }>;

const pathOf = (path: readonly PropertyKey[]): string =>
  path.reduce<string>((acc, p) => (typeof p === 'number' ? `${acc}[${p}]` : acc ? `${acc}.${String(p)}` : String(p)), '');

/** Turn zod issues into the project's issue list (path as "organ.mass", limit named). */
export function toIssues(error: z.ZodError): Issue[] {
  const out: Issue[] = [];
  const walk = (issues: readonly z.core.$ZodIssue[], prefix: readonly PropertyKey[]) => {
    for (const iss of issues) {
      const path = [...prefix, ...iss.path];
      if (iss.code === 'invalid_union' && iss.errors.length > 0) {
        // The branch that got furthest (deepest issue path) is the one the user meant.
        const depth = (b: readonly z.core.$ZodIssue[]) => Math.max(0, ...b.map((i) => (i.code === 'unrecognized_keys' ? 0 : i.path.length)));
        const best = [...iss.errors].sort((a, b) => depth(b) - depth(a) || a.length - b.length)[0] ?? [];
        if (depth(best) > 0 || !iss.message.includes('expected')) {
          walk(best, path);
          continue;
        }
      }
      if (iss.code === 'unrecognized_keys') {
        for (const key of iss.keys) out.push({ path: pathOf([...path, key]) || '(document)', message: `is not a field here; check the spelling against the scenario reference` });
        continue;
      }
      const limit = iss.code === 'custom' ? ((iss.params as { limit?: LimitName } | undefined)?.limit) : undefined;
      out.push({ path: pathOf(path) || '(document)', message: iss.message, ...(limit ? { limit } : {}) });
    }
  };
  walk(error.issues, []);
  return out;
}

export type ParseResult = { ok: true; scenario: Scenario } | { ok: false; issues: Issue[] };

/**
 * The parser of scenario documents in a process that parses many (the service, sweeps, tests):
 * zod's ahead-of-time compiled fast path for ScenarioSchema (z.compile), which hands any document it
 * does not accept to the runtime parser, so refusals carry the same issues word for word. On the
 * fly-sensing example, parsing took 74 µs on the runtime parser and 16 µs compiled, most of the
 * difference being the collector's work on the runtime parser's bookkeeping. Compiling takes about
 * 60 ms, so the first few parses of a process (all of a one-shot command line run) use the runtime
 * parser.
 */
export function scenarioParser(): typeof ScenarioSchema {
  compiled ??= z.compile(ScenarioSchema);
  return compiled;
}

let compiled: typeof ScenarioSchema | undefined;
const COMPILE_AFTER = 8;
let parses = 0;

/** How deep a valid document of each kind nests (from the schemas; see LIMITS.nesting). */
const NEEDS = { scenario: 'a scenario document needs at most 7', sweep: 'a sweep request needs at most 8' } as const;

/**
 * The refusal of a document nested deeper than LIMITS.nesting, checked before anything walks it
 * recursively, so that no document can exhaust the stack (the service checks every body with it).
 */
export function nestingIssues(doc: unknown, kind: keyof typeof NEEDS): Issue[] {
  const path = nestedTooDeep(doc);
  if (!path) return [];
  const shown = pathOf(path.slice(0, 8)) + (path.length > 8 ? '…' : '');
  return [{ path: shown || '(document)', message: `is at nesting level ${path.length + 1}, over the limit of ${LIMITS.nesting} levels of arrays and objects; ${NEEDS[kind]}`, limit: 'nesting' }];
}

const TYPE_WORDS: Readonly<Record<string, string>> = { string: 'a string', number: 'a number', boolean: 'true or false', object: 'an object', array: 'a list' };

/**
 * The words of a refusal where a field's schema gives none of its own (plain objects, strings,
 * flags): the value and what was expected, in the project's wording, for every parse of a document.
 */
export const plainWords: z.core.$ZodErrorMap = (iss) => {
  if (iss.code !== 'invalid_type') return undefined;
  const what = TYPE_WORDS[iss.expected] ?? iss.expected;
  return iss.input === undefined ? `is required; expected ${what}` : `${show(iss.input)} is not ${what}`;
};

/** Validate a scenario document and convert it to SI. */
export function parseScenario(input: unknown): ParseResult {
  const deep = nestingIssues(input, 'scenario');
  if (deep.length > 0) return { ok: false, issues: deep };
  const schema = compiled ?? (++parses > COMPILE_AFTER ? scenarioParser() : ScenarioSchema);
  const r = schema.safeParse(input, { error: plainWords });
  return r.success ? { ok: true, scenario: r.data } : { ok: false, issues: toIssues(r.error) };
}
