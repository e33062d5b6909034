/**
 * `sweep`: vary one or two scenario fields over a grid and tabulate chosen outputs per grid point.
 *
 * A grid axis is a list of values or from/to/steps with linear or logarithmic spacing; two axes
 * span their Cartesian product (first axis outer). Outputs are harmonic lines (component, axis,
 * order, organ; amplitude, phase or the cos/sin coefficients) and, where a sensing function is
 * supplied, any number in the sensing answer.
 *
 * Two methods:
 * - `rate-polynomial`: when only body rates vary and every output is a line. For a constant body
 *   motion every load is a polynomial of degree two in Ω = (p, q, r) (primary and the constant
 *   terms: degree 0; Coriolis: 1; centrifugal: 2), and so is every Fourier coefficient (the DFT
 *   and the closed form are linear in the loads). Ten evaluations at Ω ∈ {0, ±s e_i, s(e_i + e_j)}
 *   fix the ten coefficients exactly; each grid point then costs a few multiplications.
 * - `per-point`: any other field, or sensing figures: each point is parsed and computed afresh
 *   (closed form where it applies), with the grid point's value written into the document.
 *
 * Pure: no I/O. The caller may pass a clock and a time budget.
 */
import { z } from 'zod';
import { axesOf, COMPONENTS, LINEAR_AXES, ROTARY_AXES, type Axis, type Component } from './components.js';
import { toCsv } from './csv.js';
import { choosePath, organNumbers, type Path } from './forces.js';
import { amplitudePhase, lineIndex } from './harmonics.js';
import { overflowIssue } from './finite.js';
import { LIMITS, type LimitName } from './limits.js';
import { compile, type Model } from './model.js';
import { nestingIssues, parseScenario, plainWords, toIssues, type Scenario } from './scenario.js';
import { sensing as sensingOfDoc } from './sensing/sensing.js';
import { DIMENSIONS, toSI, type DimensionName } from './units.js';
import type { Vec3 } from './vec.js';
import { VERSION } from './version.js';

export const SWEEP_LIMITS = {
  /** Grid points of a `rate-polynomial` sweep (only body rates vary, every output is a line). */
  sweepPoints: 10_000,
  /** Grid points of a `per-point` sweep (each point computed afresh). */
  sweepPointsRecomputed: 1_000,
  /** Outputs (columns after the varied fields) per sweep. */
  sweepOutputs: 32,
} as const;

export type SweepLimitName = keyof typeof SWEEP_LIMITS | 'sweepTime';

export interface SweepIssue {
  path: string;
  message: string;
  limit?: LimitName | SweepLimitName;
}

// ---- the fields that may vary -----------------------------------------------------------------

type FieldKind = DimensionName | 'count' | 'stroke';

const vec3 = (prefix: string, kind: FieldKind): [string, FieldKind][] => [0, 1, 2].map((i) => [`${prefix}[${i}]`, kind]);

/** Field → what its values are ('stroke': an angle for a rotary organ, a length for a linear one). */
export const SWEEP_FIELDS: Readonly<Record<string, FieldKind>> = Object.fromEntries([
  ['organ.mass', 'mass'], ['organ.arm', 'length'], ['organ.frequency', 'frequency'],
  ['organ.amplitude', 'stroke'], ['organ.peakToPeak', 'stroke'], ['organ.mean', 'stroke'],
  ...vec3('organ.hinge', 'length'), ...vec3('organ.rest', 'dimensionless'), ...vec3('organ.normal', 'dimensionless'),
  ...vec3('organ.driveAxis', 'dimensionless'), ...vec3('organ.senseAxis', 'dimensionless'),
  ['organ.stalk.length', 'length'], ['organ.stalk.outerRadius', 'length'], ['organ.stalk.innerRadius', 'length'],
  ['organ.stalk.modulus', 'pressure'], ['organ.stalk.mass', 'mass'],
  ['organ.senseMode.frequency', 'frequency'], ['organ.senseMode.quality', 'dimensionless'], ['organ.senseMode.mass', 'mass'],
  ['body.rate.roll', 'angularRate'], ['body.rate.pitch', 'angularRate'], ['body.rate.yaw', 'angularRate'],
  ...vec3('body.acceleration', 'acceleration'), ['body.gravity', 'acceleration'],
  ['body.attitude.roll', 'angle'], ['body.attitude.pitch', 'angle'], ['body.attitude.yaw', 'angle'],
  ['sensor.temperature', 'temperature'], ['sensor.integration', 'time'], ['sensor.threshold', 'dimensionless'],
  ['sensor.misalignment', 'angle'], ['sensor.phaseError', 'angle'],
  ['sampling.pointsPerBeat', 'count'], ['sampling.beats', 'count'], ['sampling.harmonics', 'count'],
]);

const RATE_FIELDS = ['body.rate.roll', 'body.rate.pitch', 'body.rate.yaw'] as const;

// ---- the request ------------------------------------------------------------------------------

const show = (v: unknown): string => {
  if (typeof v === 'string') return `'${v.length > 60 ? `${v.slice(0, 57)}...` : v}'`;
  if (v === undefined) return 'nothing';
  const s = JSON.stringify(v);
  return s === undefined ? String(v) : s.length > 40 ? `${s.slice(0, 37)}...` : s;
};

/** The scenario inside a sweep request: any JSON here, validated by `parseScenario` per grid point. */
export const ScenarioDocumentSchema = z.unknown().meta({ description: 'a scenario document, as for POST /api/v1/forces' });

const value = z.union([z.number(), z.string()], { error: (iss) => `${show(iss.input)} is not a value; expected a number in SI units or a string with units` });

const VarySchema = z
  .strictObject({
    field: z.string({ error: (iss) => `${show(iss.input)} is not a field name; expected e.g. "body.rate.yaw"` }).meta({ description: 'the scenario field, e.g. "body.rate.yaw", "organ.amplitude", "organ.hinge[1]"' }),
    values: z.array(value, { error: (iss) => `${show(iss.input)} is not a list of values` }).min(1, 'is empty; expected at least one value').optional(),
    from: value.optional(),
    to: value.optional(),
    steps: z
      .number({ error: (iss) => `${show(iss.input)} is not a whole number; expected the number of grid points from 1` })
      .int({ error: (iss) => `${show(iss.input)} is not a whole number; expected the number of grid points from 1` })
      .min(1, { error: (iss) => `${show(iss.input)} is too small; expected at least 1 grid point` })
      .optional(),
    spacing: z.enum(['linear', 'log'], { error: (iss) => `${show(iss.input)} is not a spacing; expected "linear" or "log"` }).default('linear'),
  }, { error: (iss) => (iss.code === 'invalid_type' ? `${show(iss.input)} is not a grid axis; expected { "field", "values" } or { "field", "from", "to", "steps" }` : undefined) })
  .meta({ description: 'one grid axis: a list of values, or from/to/steps with linear or log spacing; values are SI numbers or strings with units' });

const AXIS_NAMES = [...new Set([...ROTARY_AXES, ...LINEAR_AXES])] as [Axis, ...Axis[]];
const NAME = /^[A-Za-z_][A-Za-z0-9_.:-]{0,63}$/;
const nameField = z.string().regex(NAME, 'is not a column name; expected up to 64 letters, digits, _ . : -').optional();

const LineOutputSchema = z.strictObject({
  line: z.strictObject({
    component: z.enum(COMPONENTS, { error: (iss) => `${show(iss.input)} is not a load component; expected one of ${COMPONENTS.join(', ')}` }),
    axis: z.enum(AXIS_NAMES, { error: (iss) => `${show(iss.input)} is not an axis; expected one of ${AXIS_NAMES.join(', ')}` }),
    order: z
      .number({ error: (iss) => `${show(iss.input)} is not a harmonic order; expected a whole number from 0 to ${LIMITS.harmonics}` })
      .int({ error: (iss) => `${show(iss.input)} is not a harmonic order; expected a whole number from 0 to ${LIMITS.harmonics}` })
      .min(0, { error: (iss) => `${show(iss.input)} is not a harmonic order; expected a whole number from 0 to ${LIMITS.harmonics}` })
      .max(LIMITS.harmonics, { error: (iss) => `${show(iss.input)} is over the limit of order ${LIMITS.harmonics}` }),
    organ: z.enum(['specified', 'mirror'], { error: (iss) => `${show(iss.input)} is not an organ; expected "specified" or "mirror"` }).default('specified'),
  }),
  value: z.enum(['amplitude', 'phase', 'cos', 'sin'], { error: (iss) => `${show(iss.input)} is not a line value; expected "amplitude", "phase", "cos" or "sin"` }).default('amplitude').meta({ description: 'amplitude A_k (N), phase ψ_k (rad), or p_k / q_k of p cos kωt + q sin kωt (N)' }),
  name: nameField,
});

const SensingOutputSchema = z.strictObject({
  sensing: z.string().min(1).max(200).meta({ description: 'a path to a number in the sensing answer, e.g. "organs[0].axes.yaw.minimumRate" or "pair.yaw.minimumRate"' }),
  name: nameField,
});

const OutputSchema = z.union([LineOutputSchema, SensingOutputSchema], {
  error: (iss) => `${show(iss.input)} is not an output; expected { "line": { "component", "axis", "order", "organ" }, "value" } or { "sensing": "path" }`,
});

export const SweepRequestSchema = z.strictObject(
  {
    scenario: ScenarioDocumentSchema.nonoptional({ error: 'is required; expected a scenario document, as for POST /api/v1/forces' }),
    vary: z
      .array(VarySchema, { error: (iss) => (iss.input === undefined ? 'is required; expected a list of one or two grid axes' : `${show(iss.input)} is not a list of grid axes`) })
      .min(1, 'is empty; expected one or two grid axes')
      .max(2, 'has more than two grid axes; expected one or two'),
    outputs: z
      .array(OutputSchema, { error: (iss) => (iss.input === undefined ? 'is required; expected a list of outputs (harmonic lines or sensing figures)' : `${show(iss.input)} is not a list of outputs`) })
      .min(1, 'is empty; expected at least one output')
      .max(SWEEP_LIMITS.sweepOutputs, `has more than ${SWEEP_LIMITS.sweepOutputs} outputs`),
    name: z.string().max(200).optional().meta({ description: 'free text for the author (not used in the computation)' }),
    description: z.string().max(2000).optional().meta({ description: 'free text for the author (not used in the computation)' }),
  },
  { error: (iss) => (iss.code === 'invalid_type' ? `${show(iss.input)} is not a sweep request; expected { "scenario", "vary", "outputs" }` : undefined) },
);

export type SweepRequestInput = z.input<typeof SweepRequestSchema>;
type SweepRequest = z.output<typeof SweepRequestSchema>;
type LineOutput = z.output<typeof LineOutputSchema>;
type SensingOutput = z.output<typeof SensingOutputSchema>;

// ---- the answer -------------------------------------------------------------------------------

export interface SweepColumn {
  name: string;
  /** SI unit of the column ('1' for plain numbers). */
  unit: string;
  kind: 'field' | 'line' | 'sensing';
}

export interface SweepAnswer {
  version: string;
  method: 'rate-polynomial' | 'per-point';
  /** How the lines were computed (closed form or sampled beat); absent without line outputs. */
  path?: Path;
  points: number;
  columns: SweepColumn[];
  /** One row per grid point: the varied fields' values, then the outputs (null where not finite). */
  rows: (number | null)[][];
  warnings: string[];
}

export type SensingFn = (doc: unknown) => { ok: true; answer: unknown } | { ok: false; issues: { path: string; message: string; limit?: string }[] };

export interface SweepOptions {
  /** The sensing computation, for `sensing` outputs (default: the project's `sensing`). */
  sensing?: SensingFn;
  /** A clock (ms) and a budget: the sweep stops with a `sweepTime` issue when it runs over. */
  now?: () => number;
  budgetMs?: number;
}

export type SweepResult = { ok: true; answer: SweepAnswer } | { ok: false; issues: SweepIssue[] };

// ---- paths into documents ---------------------------------------------------------------------

type Segment = string | number;

/** "organ.hinge[1]" → ["organ", "hinge", 1]; "organs[0].axes.yaw.snr" likewise. */
export function segments(path: string): Segment[] | undefined {
  const out: Segment[] = [];
  const re = /([A-Za-z_][A-Za-z0-9_]*)|\[(\d+)\]|(\.)/gy;
  let m: RegExpExecArray | null;
  let expectName = true;
  while (re.lastIndex < path.length && (m = re.exec(path)) !== null) {
    if (m[1] !== undefined) {
      if (!expectName) return undefined;
      out.push(m[1]);
      expectName = false;
    } else if (m[2] !== undefined) {
      if (expectName) return undefined;
      out.push(Number(m[2]));
    } else {
      if (expectName) return undefined;
      expectName = true;
    }
  }
  return re.lastIndex === path.length && !expectName && out.length > 0 ? out : undefined;
}

const isObject = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);

/** A copy of `doc` with `value` at `path`; only the containers along the path are copied. */
export function setAt(doc: unknown, path: readonly Segment[], value: unknown): unknown {
  if (path.length === 0) return value;
  const [head, ...rest] = path as [Segment, ...Segment[]];
  if (typeof head === 'number') {
    const arr = Array.isArray(doc) ? doc.slice() : [0, 0, 0];
    arr[head] = setAt(arr[head], rest, value);
    return arr;
  }
  const obj: Record<string, unknown> = isObject(doc) ? { ...doc } : {};
  obj[head] = setAt(obj[head], rest, value);
  return obj;
}

export function getAt(doc: unknown, path: readonly Segment[]): unknown {
  let v = doc;
  for (const s of path) {
    if (typeof s === 'number') v = Array.isArray(v) ? v[s] : undefined;
    else v = isObject(v) && Object.hasOwn(v, s) ? v[s] : undefined;
  }
  return v;
}

// ---- grids ------------------------------------------------------------------------------------

interface GridAxis {
  field: string;
  path: Segment[];
  kind: Exclude<FieldKind, 'stroke'>;
  values: number[];
}

const unitOf = (kind: GridAxis['kind']): string => (kind === 'count' ? '1' : DIMENSIONS[kind].si);

const driveOf = (doc: unknown): 'rotary' | 'linear' => (isObject(doc) && isObject(doc.organ) && doc.organ.drive === 'linear' ? 'linear' : 'rotary');

function gridAxis(v: SweepRequest['vary'][number], at: string, drive: 'rotary' | 'linear', issues: SweepIssue[]): GridAxis | undefined {
  const known = SWEEP_FIELDS[v.field];
  const path = segments(v.field);
  if (known === undefined || path === undefined) {
    issues.push({ path: `${at}.field`, message: `${show(v.field)} is not a field that can vary; expected one of ${Object.keys(SWEEP_FIELDS).join(', ')}` });
    return undefined;
  }
  const kind = known === 'stroke' ? (drive === 'rotary' ? 'angle' : 'length') : known;
  const convert = (x: number | string, where: string): number | undefined => {
    const r = toSI(x, [kind === 'count' ? 'dimensionless' : kind]);
    if (!r.ok) {
      issues.push({ path: where, message: r.message });
      return undefined;
    }
    return r.value;
  };
  const hasRange = v.from !== undefined || v.to !== undefined || v.steps !== undefined;
  if (v.values !== undefined && hasRange) {
    issues.push({ path: at, message: 'gives both values and from/to/steps; expected one of them' });
    return undefined;
  }
  if (v.values !== undefined) {
    if (v.values.length > SWEEP_LIMITS.sweepPoints) {
      issues.push({ path: `${at}.values`, message: `${v.values.length} values is over the limit of ${SWEEP_LIMITS.sweepPoints} grid points`, limit: 'sweepPoints' });
      return undefined;
    }
    const values: number[] = [];
    for (let i = 0; i < v.values.length; i++) {
      const x = convert(v.values[i] as number | string, `${at}.values[${i}]`);
      if (x === undefined) return undefined;
      values.push(x);
    }
    return { field: v.field, path, kind, values };
  }
  const missing = (['from', 'to', 'steps'] as const).filter((k) => v[k] === undefined);
  if (missing.length > 0) {
    issues.push({ path: `${at}.${missing[0]}`, message: `is required; expected "values": [...] or "from", "to" and "steps"` });
    return undefined;
  }
  const from = convert(v.from as number | string, `${at}.from`);
  const to = convert(v.to as number | string, `${at}.to`);
  if (from === undefined || to === undefined) return undefined;
  const steps = v.steps as number;
  if (steps > SWEEP_LIMITS.sweepPoints) {
    issues.push({ path: `${at}.steps`, message: `${steps} is over the limit of ${SWEEP_LIMITS.sweepPoints} grid points`, limit: 'sweepPoints' });
    return undefined;
  }
  if (v.spacing === 'log' && !(from > 0 && to > 0)) {
    issues.push({ path: `${at}.spacing`, message: `"log" needs from and to greater than zero; from is ${from}, to is ${to} ${unitOf(kind)}` });
    return undefined;
  }
  const values = new Array<number>(steps);
  for (let j = 0; j < steps; j++) {
    const f = steps === 1 ? 0 : j / (steps - 1);
    values[j] = j === steps - 1 && steps > 1 ? to : v.spacing === 'log' ? from * (to / from) ** f : from + (to - from) * f;
  }
  if (kind === 'count') for (let j = 0; j < steps; j++) values[j] = Math.round(values[j] as number);
  return { field: v.field, path, kind, values };
}

// ---- outputs ----------------------------------------------------------------------------------

const lineName = (o: LineOutput): string => o.name ?? `${o.line.organ}.${o.line.component}.${o.line.axis}.${o.line.order}.${o.value}`;

const lineUnit = (o: LineOutput): string => (o.value === 'phase' ? 'rad' : 'N');

/** Read a number at a path of an answer (for sensing outputs). */
function figure(answer: unknown, path: readonly Segment[]): number | undefined {
  const v = getAt(answer, path);
  return typeof v === 'number' ? v : v === null ? Number.NaN : undefined;
}

/** Figures whose unit does not depend on the channel: by name (the last name in the path). */
const FIXED_UNITS: Record<string, string> = {
  minimumRate: 'rad/s', rate: 'rad/s', worstCase: 'rad/s',
  snr: '1', conditionNumber: '1', order: '1', channels: '1', organs: '1', beats: '1', quality: '1', forceGain: '1', ratio: '1',
  rateNoiseDensity: '(rad/s)/Hz^0.5', angleRandomWalk: 'deg/h^0.5', covariance: '(rad/s)^2',
  frequency: 'Hz', referencePhase: 'rad', phase: 'rad', time: 's',
  // the sense mode's constants and transfer
  mass: 'kg', stiffness: 'N/m', damping: 'N s/m', thermalForceDensity: 'N/Hz^0.5', magnitude: 'm/N',
  // the stalk
  leverArm: 'm', area: 'm^2', secondMomentNormal: 'm^4', secondMomentInPlane: 'm^4', inner: 'm', outer: 'm',
};

/**
 * The SI unit of a number in the sensing answer ('1' for ratios and counts), from its place in the
 * answer and the unit of the quantity its channels read (N, strain '1' or m). The sensing answer's
 * `units` map says the same in words.
 */
export function sensingUnit(answer: unknown, path: readonly Segment[]): string {
  const names = path.filter((p): p is string => typeof p === 'string');
  const last = names[names.length - 1] ?? '';
  const plain = (raw: unknown): string => (typeof raw === 'string' ? (raw.startsWith('1') ? '1' : raw) : '');
  const perRate = (u: string): string => (u === '' ? '' : u === '1' ? '1/(rad/s)' : `${u}/(rad/s)`);
  const organUnit = path[0] === 'organs' && typeof path[1] === 'number' ? plain(getAt(answer, ['organs', path[1], 'read', 'unit'])) : '';
  if (names.includes('perAngularAcceleration')) return 's';
  if (names.includes('bias')) return 'rad/s';
  if (names.includes('crossAxis') || names.includes('confusions')) return '1';
  if (path[0] === 'pair') {
    if (path[1] === 'matrix' && typeof path[2] === 'number') {
      const row = plain(getAt(answer, ['pair', 'matrix', path[2], 'unit']));
      if (last === 'noise') return row;
      if (last === 'roll' || last === 'pitch' || last === 'yaw') return perRate(row);
    }
    if (last === 'singularValues') return getAt(answer, ['pair', 'weighted']) === true ? '1/(rad/s)' : perRate(plain(getAt(answer, ['pair', 'matrix', 0, 'unit'])));
  }
  if (names.includes('senseMode')) {
    if (names.includes('perUnitRate') && last === 'amplitude') return 'm/(rad/s)';
    if (names.includes('displacement') && last === 'amplitude') return 'm';
  }
  if (names.includes('strain')) {
    if (names.includes('perLoad')) return '1/N';
    if (last === 'amplitude') return '1';
  }
  const fixed = FIXED_UNITS[last];
  if (fixed !== undefined) return fixed;
  switch (last) {
    case 'scaleFactor': case 'quadratureScaleFactor': return perRate(organUnit);
    case 'signal': case 'sigma': return organUnit;
    case 'density': case 'thermalDensity': case 'readoutDensity': return organUnit ? `${organUnit}/Hz^0.5` : '';
    default: return '';
  }
}

// ---- the sweep --------------------------------------------------------------------------------

interface Plan {
  axes: GridAxis[];
  lines: { index: number; out: LineOutput }[];
  sensing: { index: number; out: SensingOutput; path: Segment[] }[];
  /** Output index in the request → its column after the varied fields. */
  column: Map<number, number>;
  points: number;
}

const prefixed = (issues: readonly { path: string; message: string; limit?: string }[], prefix: string, suffix = ''): SweepIssue[] =>
  issues.map((i) => ({ path: i.path === '(document)' ? prefix : `${prefix}.${i.path}`, message: `${i.message}${suffix}`, ...(i.limit ? { limit: i.limit as SweepIssue['limit'] } : {}) }));

/** Validate the request and lay out the grid and the outputs. */
function plan(req: SweepRequest, issues: SweepIssue[]): Plan | undefined {
  const sc = req.scenario;
  if (sc === null || typeof sc !== 'object' || Array.isArray(sc)) {
    // Not an object: no grid point can make it one; refuse it as the scenario routes do.
    const r = parseScenario(sc);
    issues.push(...(r.ok ? [{ path: 'scenario', message: `${show(sc)} is not an object` }] : prefixed(r.issues, 'scenario')));
    return undefined;
  }
  const drive = driveOf(sc);
  const axes: GridAxis[] = [];
  req.vary.forEach((v, i) => {
    const a = gridAxis(v, `vary[${i}]`, drive, issues);
    if (a) axes.push(a);
  });
  if (axes.length === 2 && axes[0]?.field === axes[1]?.field) issues.push({ path: 'vary[1].field', message: `${show(axes[1]?.field)} varies twice; expected two different fields` });
  const lines: Plan['lines'] = [];
  const sensing: Plan['sensing'] = [];
  const allowed = axesOf(drive);
  req.outputs.forEach((o, i) => {
    if ('line' in o) {
      if (!allowed.includes(o.line.axis)) issues.push({ path: `outputs[${i}].line.axis`, message: `'${o.line.axis}' is not an axis of a ${drive} organ; expected one of ${allowed.join(', ')}` });
      else lines.push({ index: i, out: o });
    } else {
      const path = segments(o.sensing);
      if (!path) issues.push({ path: `outputs[${i}].sensing`, message: `${show(o.sensing)} is not a path; expected e.g. "organs[0].axes.yaw.minimumRate"` });
      else sensing.push({ index: i, out: o, path });
    }
  });
  if (issues.length > 0) return undefined;
  const points = axes.reduce((n, a) => n * a.values.length, 1);
  return { axes, lines, sensing, column: new Map(req.outputs.map((_, i) => [i, i])), points };
}

/** The grid point's values, first axis outer. */
function pointValues(axes: readonly GridAxis[], i: number, out: number[]): number[] {
  let rest = i;
  for (let a = axes.length - 1; a >= 0; a--) {
    const vs = (axes[a] as GridAxis).values;
    out[a] = vs[rest % vs.length] as number;
    rest = Math.floor(rest / vs.length);
  }
  return out;
}

/** An unknown member outside the scenario is checked against the sweep request's reference, not the scenario's. */
const requestWords = (i: SweepIssue): SweepIssue =>
  i.path.startsWith('scenario') || !i.message.startsWith('is not a field here')
    ? i
    : { ...i, message: 'is not a field here; a sweep request has scenario, vary, outputs, and optionally name and description (docs/service.md, Sweeps)' };

/** Run a sweep request (see the module comment). */
export function sweep(request: unknown, options: SweepOptions = {}): SweepResult {
  const deep = nestingIssues(request, 'sweep');
  if (deep.length > 0) return { ok: false, issues: deep };
  const parsed = SweepRequestSchema.safeParse(request, { error: plainWords });
  if (!parsed.success) return { ok: false, issues: toIssues(parsed.error).map(requestWords) };
  const req = parsed.data;
  const issues: SweepIssue[] = [];
  const p = plan(req, issues);
  if (!p) return { ok: false, issues };
  const ratePolynomial = p.sensing.length === 0 && p.axes.every((a) => (RATE_FIELDS as readonly string[]).includes(a.field));
  const limit = ratePolynomial ? 'sweepPoints' : 'sweepPointsRecomputed';
  if (p.points > SWEEP_LIMITS[limit]) {
    const what = ratePolynomial ? 'for a rate sweep' : 'for a sweep computed point by point (fields other than body rates, or sensing figures)';
    return { ok: false, issues: [{ path: 'vary', message: `${p.axes.length > 1 ? `${p.axes.map((a) => a.values.length).join(' × ')} = ` : ''}${p.points} grid points is over the limit of ${SWEEP_LIMITS[limit]} ${what}`, limit }] };
  }
  return ratePolynomial ? ratePolynomialSweep(req, p) : perPointSweep(req, p, { ...options, sensing: options.sensing ?? sensingOfDoc });
}

function fieldColumns(p: Plan): SweepColumn[] {
  return p.axes.map((a) => ({ name: a.field, unit: unitOf(a.kind), kind: 'field' as const }));
}

/** The document at one grid point (series off: a sweep reads lines, not series). */
function docAt(base: unknown, axes: readonly GridAxis[], values: readonly number[]): unknown {
  let doc = base;
  axes.forEach((a, i) => {
    doc = setAt(doc, a.path, values[i]);
  });
  if (isObject(doc) && (doc.output === undefined || isObject(doc.output))) doc = { ...doc, output: { ...(doc.output as object | undefined), series: false } };
  return doc;
}

const where = (axes: readonly GridAxis[], values: readonly number[]): string =>
  ` (at the grid point ${axes.map((a, i) => `${a.field} = ${values[i]}${unitOf(a.kind) === '1' ? '' : ` ${unitOf(a.kind)}`}`).join(', ')})`;

/** Parse and compile one document; issues are prefixed with "scenario". */
function modelOf(doc: unknown, suffix: string): { ok: true; scenario: Scenario; model: Model; path: Path } | { ok: false; issues: SweepIssue[] } {
  const parsed = parseScenario(doc);
  if (!parsed.ok) return { ok: false, issues: prefixed(parsed.issues, 'scenario', suffix) };
  const compiled = compile(parsed.scenario);
  if (!compiled.ok) return { ok: false, issues: prefixed(compiled.issues, 'scenario', suffix) };
  const chosen = choosePath(parsed.scenario, compiled.model);
  if ('issue' in chosen) return { ok: false, issues: prefixed([chosen.issue], 'scenario', suffix) };
  return { ok: true, scenario: parsed.scenario, model: compiled.model, path: chosen.path };
}

/** Orders the lines need, checked against the model (mirror present, below Nyquist when sampled). */
function checkLines(p: Plan, s: Scenario, model: Model, path: Path, suffix: string): SweepIssue[] {
  const issues: SweepIssue[] = [];
  const nyquist = s.sampling.pointsPerBeat / 2 - 1;
  for (const { index, out } of p.lines) {
    if (out.line.organ === 'mirror' && !model.mirror) issues.push({ path: `outputs[${index}].line.organ`, message: `'mirror' asks for the mirror organ, but the scenario sets organ.mirror to false${suffix}` });
    if (path === 'sampled' && out.line.order > nyquist) issues.push({ path: `outputs[${index}].line.order`, message: `${out.line.order} is above the ${nyquist} orders that ${s.sampling.pointsPerBeat} points per beat resolve; raise sampling.pointsPerBeat${suffix}` });
  }
  return issues;
}

const maxOrder = (p: Plan): number => p.lines.reduce((k, l) => Math.max(k, l.out.line.order), 0);

/** (p, q) of every line output for one organ evaluation. */
function linePairs(model: Model, p: Plan, path: Path, role: 'specified' | 'mirror', s: Scenario, out: Float64Array): void {
  const table = organNumbers(model, { mirror: role === 'mirror', path, pointsPerBeat: s.sampling.pointsPerBeat, harmonics: maxOrder(p), series: false }).table;
  const axes = axesOf(model.geometry.drive);
  p.lines.forEach(({ out: o }, j) => {
    if (o.line.organ !== role) return;
    const at = lineIndex(table, COMPONENTS.indexOf(o.line.component as Component), axes.indexOf(o.line.axis), o.line.order);
    out[2 * j] = table.pq[at] as number;
    out[2 * j + 1] = table.pq[at + 1] as number;
  });
}

function lineValue(o: LineOutput, pc: number, qc: number): number {
  if (o.value === 'cos') return pc;
  if (o.value === 'sin') return qc;
  const ap = amplitudePhase(pc, qc, o.line.order);
  return o.value === 'amplitude' ? ap.amplitude : ap.phase;
}

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

/** The first of a line's p, q and value that is not finite, or undefined (no allocation: the sweep's inner loop). */
const notFinite = (p: number, q: number, v: number): number | undefined => (!Number.isFinite(p) ? p : !Number.isFinite(q) ? q : !Number.isFinite(v) ? v : undefined);

/**
 * The refusal of a grid point whose line value overflowed double precision (see finite.ts), the
 * input of most extreme magnitude named from the document at that point.
 */
function overflowAt(req: SweepRequest, p: Plan, values: readonly number[], column: string, value: number): SweepResult {
  return { ok: false, issues: prefixed([overflowIssue(docAt(req.scenario, p.axes, values), column, value)], 'scenario', where(p.axes, values)) };
}

function ratePolynomialSweep(req: SweepRequest, p: Plan): SweepResult {
  const values = new Array<number>(p.axes.length);
  const first = modelOf(docAt(req.scenario, p.axes, pointValues(p.axes, 0, values)), '');
  if (!first.ok) return first;
  const { scenario: s, model, path } = first;
  const lineIssues = checkLines(p, s, model, path, '');
  if (lineIssues.length > 0) return { ok: false, issues: lineIssues };

  // Ω at each grid point: the scenario's rates, with the varied ones replaced.
  const which = p.axes.map((a) => RATE_FIELDS.indexOf(a.field as (typeof RATE_FIELDS)[number]));
  const omega0 = model.motion.omega;
  let scale = Math.max(Math.abs(omega0[0]), Math.abs(omega0[1]), Math.abs(omega0[2]));
  for (const a of p.axes) for (const x of a.values) scale = Math.max(scale, Math.abs(x));
  if (!(scale > 0) || !Number.isFinite(scale)) scale = 1;

  // Ten evaluations: f(0), f(±s e_i), f(s(e_i + e_j)) for each line's p and q.
  const nl = p.lines.length;
  const evalAt = (w: Vec3): Float64Array => {
    const out = new Float64Array(2 * nl);
    const m: Model = { ...model, motion: { ...model.motion, omega: [w[0] * scale, w[1] * scale, w[2] * scale] } };
    linePairs(m, p, path, 'specified', s, out);
    if (p.lines.some((l) => l.out.line.organ === 'mirror')) linePairs(m, p, path, 'mirror', s, out);
    return out;
  };
  const e = (i: number, x: number): Vec3 => [i === 0 ? x : 0, i === 1 ? x : 0, i === 2 ? x : 0];
  const f0 = evalAt([0, 0, 0]);
  const fp = [0, 1, 2].map((i) => evalAt(e(i, 1)));
  const fm = [0, 1, 2].map((i) => evalAt(e(i, -1)));
  const pairs: readonly [number, number][] = [[0, 1], [0, 2], [1, 2]];
  const fij = pairs.map(([i, j]) => evalAt([i === 0 || j === 0 ? 1 : 0, i === 1 || j === 1 ? 1 : 0, i === 2 || j === 2 ? 1 : 0]));
  // Coefficients per value slot v: c0, b_i, a_ii, a_ij (ij = 01, 02, 12).
  const C = new Float64Array(10 * 2 * nl);
  for (let v = 0; v < 2 * nl; v++) {
    const c0 = f0[v] as number;
    const b = [0, 1, 2].map((i) => (((fp[i] as Float64Array)[v] as number) - ((fm[i] as Float64Array)[v] as number)) / 2);
    const a = [0, 1, 2].map((i) => (((fp[i] as Float64Array)[v] as number) + ((fm[i] as Float64Array)[v] as number)) / 2 - c0);
    const o = v * 10;
    C[o] = c0;
    for (let i = 0; i < 3; i++) {
      C[o + 1 + i] = b[i] as number;
      C[o + 4 + i] = a[i] as number;
    }
    pairs.forEach(([i, j], k) => {
      C[o + 7 + k] = ((fij[k] as Float64Array)[v] as number) - c0 - (b[i] as number) - (b[j] as number) - (a[i] as number) - (a[j] as number);
    });
  }

  const badSlot = C.findIndex((c) => !Number.isFinite(c));
  if (badSlot >= 0) {
    // The fit's evaluations at the grid's largest rate overflowed: refuse at that grid point.
    let far = 0, farSize = -1;
    for (let i = 0; i < p.points; i++) {
      const size = Math.max(...pointValues(p.axes, i, values).map(Math.abs));
      if (size > farSize) [far, farSize] = [i, size];
    }
    return overflowAt(req, p, pointValues(p.axes, far, values), lineName((p.lines[Math.floor(badSlot / 20)] as Plan['lines'][number]).out), C[badSlot] as number);
  }

  const rows: (number | null)[][] = new Array(p.points);
  const w: [number, number, number] = [omega0[0] / scale, omega0[1] / scale, omega0[2] / scale];
  const base: [number, number, number] = [w[0], w[1], w[2]];
  const poly = (v: number): number => {
    const o = v * 10;
    const [x, y, z] = w;
    return (C[o] as number) + (C[o + 1] as number) * x + (C[o + 2] as number) * y + (C[o + 3] as number) * z
      + (C[o + 4] as number) * x * x + (C[o + 5] as number) * y * y + (C[o + 6] as number) * z * z
      + (C[o + 7] as number) * x * y + (C[o + 8] as number) * x * z + (C[o + 9] as number) * y * z;
  };
  const nf = p.axes.length;
  for (let i = 0; i < p.points; i++) {
    pointValues(p.axes, i, values);
    w[0] = base[0]; w[1] = base[1]; w[2] = base[2];
    for (let a = 0; a < nf; a++) w[which[a] as number] = (values[a] as number) / scale;
    const row = new Array<number | null>(nf + nl);
    for (let a = 0; a < nf; a++) row[a] = values[a] as number;
    for (let j = 0; j < nl; j++) {
      const out = (p.lines[j] as Plan['lines'][number]).out;
      const pj = poly(2 * j), qj = poly(2 * j + 1), v = lineValue(out, pj, qj);
      const bad = notFinite(pj, qj, v);
      if (bad !== undefined) return overflowAt(req, p, values, lineName(out), bad);
      row[nf + j] = v;
    }
    rows[i] = row;
  }
  const columns = [...fieldColumns(p), ...p.lines.map(({ out }) => ({ name: lineName(out), unit: lineUnit(out), kind: 'line' as const }))];
  return { ok: true, answer: { version: VERSION, method: 'rate-polynomial', path, points: p.points, columns, rows, warnings: [] } };
}

function perPointSweep(req: SweepRequest, p: Plan, options: SweepOptions): SweepResult {
  const { now, budgetMs } = options;
  const start = now?.();
  const nf = p.axes.length;
  const nl = p.lines.length;
  const values = new Array<number>(nf);
  const pq = new Float64Array(2 * nl);
  const rows: (number | null)[][] = new Array(p.points);
  const sensingUnits = new Array<string>(p.sensing.length).fill('');
  let linePath: Path | undefined;
  for (let i = 0; i < p.points; i++) {
    if (now && budgetMs !== undefined && start !== undefined && (i & 15) === 15 && now() - start > budgetMs) {
      return { ok: false, issues: [{ path: 'vary', message: `the sweep ran over its time budget of ${budgetMs} ms after ${i} of ${p.points} grid points; ask for fewer points or a cheaper scenario (fewer points per beat, a sine stroke for the closed form)`, limit: 'sweepTime' }] };
    }
    pointValues(p.axes, i, values);
    const doc = docAt(req.scenario, p.axes, values);
    const suffix = where(p.axes, values);
    const row = new Array<number | null>(nf + nl + p.sensing.length);
    for (let a = 0; a < nf; a++) row[a] = values[a] as number;
    if (nl > 0) {
      const m = modelOf(doc, suffix);
      if (!m.ok) return m;
      const lineIssues = checkLines(p, m.scenario, m.model, m.path, suffix);
      if (lineIssues.length > 0) return { ok: false, issues: lineIssues };
      linePath ??= m.path;
      linePairs(m.model, p, m.path, 'specified', m.scenario, pq);
      if (p.lines.some((l) => l.out.line.organ === 'mirror')) linePairs(m.model, p, m.path, 'mirror', m.scenario, pq);
      for (let j = 0; j < nl; j++) {
        const l = p.lines[j] as Plan['lines'][number];
        const pj = pq[2 * j] as number, qj = pq[2 * j + 1] as number, v = lineValue(l.out, pj, qj);
        const bad = notFinite(pj, qj, v);
        if (bad !== undefined) return overflowAt(req, p, values, lineName(l.out), bad);
        row[nf + (p.column.get(l.index) as number)] = v;
      }
    }
    if (p.sensing.length > 0) {
      const r = (options.sensing as SensingFn)(doc);
      if (!r.ok) return { ok: false, issues: prefixed(r.issues, 'scenario', suffix) };
      for (let j = 0; j < p.sensing.length; j++) {
        const x = p.sensing[j] as Plan['sensing'][number];
        const v = figure(r.answer, x.path);
        if (v === undefined) return { ok: false, issues: [{ path: `outputs[${x.index}].sensing`, message: `${show(x.out.sensing)} is not a number in the sensing answer; expected a path such as "organs[0].axes.yaw.minimumRate"` }] };
        if (i === 0) sensingUnits[j] = sensingUnit(r.answer, x.path);
        row[nf + (p.column.get(x.index) as number)] = finiteOrNull(v);
      }
    }
    rows[i] = row;
  }
  const outputColumns = new Array<SweepColumn>(nl + p.sensing.length);
  p.lines.forEach(({ index, out }) => {
    outputColumns[p.column.get(index) as number] = { name: lineName(out), unit: lineUnit(out), kind: 'line' };
  });
  p.sensing.forEach(({ index, out }, j) => {
    outputColumns[p.column.get(index) as number] = { name: out.name ?? out.sensing, unit: sensingUnits[j] ?? '', kind: 'sensing' };
  });
  return { ok: true, answer: { version: VERSION, method: 'per-point', ...(linePath ? { path: linePath } : {}), points: p.points, columns: [...fieldColumns(p), ...outputColumns], rows, warnings: [] } };
}

/** Column names with units for CSV: "name_unit" ("name" for plain numbers). */
export const csvHeader = (c: SweepColumn): string => (c.unit === '1' || c.unit === '' ? c.name : `${c.name}_${c.unit}`);

/** The sweep table as CSV: one row per grid point, a header that names units. */
export function sweepCsv(a: SweepAnswer): string {
  return toCsv(a.columns.map(csvHeader), a.rows);
}

