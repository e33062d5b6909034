/**
 * `turn`: what the sensor sees during a body maneuver, beat by beat (design §7, §9). Takes a
 * scenario document whose `body.maneuver` gives the rate profiles (without one, `body.rate` is
 * held for `sampling.beats` beats) and returns the full-rate loads of both organs, the beat-by-beat
 * lock-in read-out with the rates the pair would estimate against the true ones, their lag and
 * error, the peak strain, and decimated series.
 */
import { axesOf, COMPONENTS, N_AXES, TOTAL, type Axis, type Component } from '../components.js';
import { warningsFor } from '../forces.js';
import { LIMITS } from '../limits.js';
import { compile, STANDARD_GRAVITY, type Model, type Side } from '../model.js';
import { finiteAnswer } from '../finite.js';
import { parseScenario, type Issue, type Scenario } from '../scenario.js';
import { QUANTITY_UNIT } from '../sensing/detection.js';
import { demodulate, estimateRates, RATE_AXES, type Demodulated, type PairAnalysis, type Quantity } from '../sensing/index.js';
import { VERSION } from '../version.js';
import { fromEuler, toEuler, type QuaternionSeries } from './attitude.js';
import { channelsOf, type Channel, type TurnChannels } from './channels.js';
import { rateProfile, traceSpans, type RateProfile } from './profiles.js';
import { beatMeans, errorOf, lagOf, trailingMean, type ErrorStats } from './readout.js';
import { peakOf, strainPlan, STRAIN_KINDS, type StrainKind, type StrainPeak } from './strain.js';
import { allocTurn, fits, runTurn, turnPlan, type TurnPlan, type TurnRun, type TurnWorkspace } from './run.js';
import { decimate, decimation, describeDecimation, keptTimes, type Decimation, type Leaf } from './series.js';

export const TURN_UNITS = {
  time: 's', rate: 'rad/s', angularAcceleration: 'rad/s^2', angle: 'rad', load: 'N', gravity: 'm/s^2',
  lag: 's', strain: '1 (m/m)', lockIn: 'the channel\'s unit (readout.channels[].unit: N, 1 or m)',
} as const;

type Rates = { roll: number; pitch: number; yaw: number };

type Nullable<T> = { [K in keyof T]: T[K] | null };

export interface BeatRow {
  /** Centre of the beat (s). */
  time: number;
  /** Body rates averaged over the beat (rad/s). */
  trueRate: Rates;
  /**
   * Rates the pair estimates from the lock-in outputs over the window ending with this beat
   * (rad/s); null for an axis that the channels cannot observe.
   */
  estimatedRate: Nullable<Rates>;
  /** This beat's in-phase lock-in output of every channel (its unit), in the order of `readout.channels`. */
  inPhase: number[];
}

export interface ChannelAnswer {
  side: Side;
  role: 'specified' | 'mirror';
  axis: Axis;
  order: number;
  /** What the channel reads (sensing): a load (N), strain (1) or sense-mode displacement (m). */
  quantity: Quantity;
  unit: string;
  referencePhase: number;
  /** In-phase output per unit rate (channel unit per rad/s). */
  sensitivity: Rates;
  /** In-phase output of the body at rest in its initial attitude (channel unit), subtracted before estimating. */
  baseline: number;
}

export interface Readout {
  /** The lock-in integration window: the estimate at a beat averages the last `beats` beats. */
  window: { beats: number; time: number };
  channels: ChannelAnswer[];
  /** Of the sensitivity matrix (whitened when the channels carry noise); null when singular. */
  conditionNumber: number | null;
  /** Rate combinations the channels cannot tell apart (see sensing). */
  confusions: string[];
  /**
   * Spread (1σ, rad/s) of the estimated rate over a full window from the sensor's noise (sensing's
   * pair covariance), per axis; present when the scenario has a noise model.
   */
  noise?: Nullable<Rates>;
}

export interface TurnSeries {
  decimate: { every: number } | { envelope: true };
  time: number[];
  rate: Record<keyof Rates, Leaf>;
  angularAcceleration: Record<keyof Rates, Leaf>;
  /** ZYX Euler angles of the attitude (rad). */
  attitude: Record<keyof Rates, Leaf>;
  /** Gravity in body axes (m/s²). */
  gravity: Record<'x' | 'y' | 'z', Leaf>;
  organs: {
    side: Side;
    role: 'specified' | 'mirror';
    loads: Record<Component, Partial<Record<Axis, Leaf>>>;
    /** Stalk strain at the base (with a stalk): axial, in plane, out of plane. */
    strain?: Record<'axial' | 'inPlane' | 'outOfPlane', Leaf>;
  }[];
}

export interface TurnAnswer {
  version: string;
  scenario: Scenario;
  units: typeof TURN_UNITS;
  warnings: string[];
  run: {
    /** Requested duration (s); the run covers whole beats, `beats / frequency` ≥ duration. */
    duration: number;
    beats: number;
    pointsPerBeat: number;
    samples: number;
    sampleInterval: number;
  };
  attitude: { initial: Rates; final: Rates; normDrift: number };
  readout: Readout;
  beats: BeatRow[];
  /** Delay of the estimated rate behind the true one (s), per axis; null where the rate does not vary. */
  lag: Nullable<Rates>;
  /** Estimated − true over the beats, per axis; null where the axis is not observable. */
  error: Record<keyof Rates, ErrorStats | null>;
  /** With a stalk: per strain, the largest magnitude over both organs and the whole run. */
  peakStrain?: PeakStrain;
  series?: TurnSeries;
}

export type OrganPeak = StrainPeak & { side: Side; role: 'specified' | 'mirror' };

export type PeakStrain = Record<StrainKind, OrganPeak> & {
  /** Each organ's own peaks. */
  organs: ({ side: Side; role: 'specified' | 'mirror' } & Record<StrainKind, StrainPeak>)[];
};

export type TurnResult = { ok: true; answer: TurnAnswer } | { ok: false; issues: Issue[] };

/** Runs up to this many samples keep their workspace between calls; longer ones allocate their own. */
export const CACHED_SAMPLES = 16_384;
let cached: TurnWorkspace | undefined;

function workspaceFor(plan: TurnPlan): TurnWorkspace {
  if (cached && fits(cached, plan)) return cached;
  const ws = allocTurn(plan.samples, plan.pointsPerBeat);
  if (plan.samples <= CACHED_SAMPLES) cached = ws;
  return ws;
}

const side = (m: Model, mirror: boolean): Side => (!mirror ? m.side : m.side === 'right' ? 'left' : m.side === 'left' ? 'right' : 'midline');

/** Numbers in the series of an answer: per kept point, time and 12 body series, 42 per organ (+3 strains). */
const seriesValues = (d: Decimation, organs: number, strain: boolean): number =>
  d.kept * (1 + 12 + organs * (COMPONENTS.length * N_AXES + (strain ? 3 : 0))) * (d.kind === 'envelope' ? 2 : 1);

/** The run's plan, or the issues that refuse it (limits first: a refusal costs microseconds). */
export function planOf(s: Scenario): { plan: TurnPlan; decimation: Decimation } | { issues: Issue[] } {
  const m = s.body.maneuver;
  const f = s.organ.frequency;
  const n = s.sampling.pointsPerBeat;
  const duration = m ? m.duration : s.sampling.beats / f;
  const plan = turnPlan(f, n, duration);
  if (plan.samples > LIMITS.samplesPerRequest) {
    const what = m ? `a maneuver of ${duration} s at ${f} Hz is ${plan.beats} beats` : `${plan.beats} beats`;
    return {
      issues: [{
        path: m ? 'body.maneuver.duration' : 'sampling.beats',
        message: `${what} × ${n} points = ${plan.samples} samples per organ, over the limit of ${LIMITS.samplesPerRequest} samples per request; shorten the maneuver or lower sampling.pointsPerBeat`,
        limit: 'samplesPerRequest',
      }],
    };
  }
  const d = decimation(s.output.decimate, plan);
  if (d.kind === 'every' && d.every > plan.samples) {
    return { issues: [{ path: 'output.decimate.every', message: `${d.every} is more than the run's ${plan.samples} samples; expected every k-th sample with k ≤ ${plan.samples}` }] };
  }
  const organs = s.organ.mirror ? 2 : 1;
  const values = seriesValues(d, organs, s.organ.drive === 'rotary' && s.organ.stalk !== undefined);
  if (s.output.series && values > LIMITS.seriesValues) {
    const every = Math.ceil((plan.samples * (values / d.kept)) / LIMITS.seriesValues);
    return {
      issues: [{
        path: s.output.decimate ? 'output.decimate' : 'output.series',
        message: `the series would hold ${values} numbers, over the limit of ${LIMITS.seriesValues}; set output.decimate to { "every": ${every} } or more, { "envelope": true }, or output.series to false`,
        limit: 'seriesValues',
      }],
    };
  }
  return { plan, decimation: d };
}

/** Warnings a careful user should read with a turn's numbers. */
function turnWarnings(s: Scenario, model: Model, plan: TurnPlan, profile: RateProfile): string[] {
  const w = warningsFor(s, model, 'sampled');
  const m = s.body.maneuver;
  const runEnd = plan.beats / plan.frequency;
  if (m && Math.abs(runEnd - m.duration) > 1e-9 * runEnd) {
    w.push(`the duration ${m.duration} s is not a whole number of beats at ${plan.frequency} Hz; the run covers ${plan.beats} beats (${runEnd} s), with the profiles continued to its end`);
  }
  if (m && (s.body.rate.roll !== 0 || s.body.rate.pitch !== 0 || s.body.rate.yaw !== 0)) {
    w.push('body.rate is ignored when body.maneuver is given; put a constant rate into the maneuver (e.g. "yaw": "200 deg/s")');
  }
  const lastSample = (plan.samples - 1) * plan.dt;
  profile.axes.forEach((terms, a) => {
    for (const [t0, t1] of traceSpans(terms)) {
      if (t0 > 0 || t1 < lastSample) {
        w.push(`the ${['roll', 'pitch', 'yaw'][a]} samples cover ${t0} s to ${t1} s, not the whole run (0 to ${lastSample} s); the end rates are held outside, where the angular acceleration jumps to zero`);
      }
    }
  });
  return w;
}

/** The turn answer for a scenario document (design §9). */
export function turn(doc: unknown): TurnResult {
  const parsed = parseScenario(doc);
  if (!parsed.ok) return parsed;
  return turnOf(parsed.scenario, doc);
}

/** The numbers of a turn before they become an answer: the run, the channels and the read-out. */
export interface TurnNumbers {
  plan: TurnPlan;
  profile: RateProfile;
  run: TurnRun;
  channels: Channel[];
  /** Integration window (beats). */
  window: number;
  read: ReadOutResult;
}

/**
 * Run a parsed, compiled, planned scenario into `ws` (default: a workspace kept between calls for
 * runs up to CACHED_SAMPLES samples) and read it out beat by beat through `channels`
 * (`channelsOf`). The run's series are views into the workspace, valid until its next use.
 */
export function turnNumbers(s: Scenario, model: Model, plan: TurnPlan, channels: TurnChannels, ws: TurnWorkspace = workspaceFor(plan)): TurnNumbers {
  const b = s.body;
  const profile: RateProfile = b.maneuver
    ? rateProfile(b.maneuver)
    : { axes: [[{ kind: 'constant', rate: b.rate.roll }], [{ kind: 'constant', rate: b.rate.pitch }], [{ kind: 'constant', rate: b.rate.yaw }]] };
  const g = b.gravity === true ? STANDARD_GRAVITY : b.gravity === false ? 0 : b.gravity;
  const strain = strainPlan(s.organ, model.geometry);
  const run = runTurn({ geometry: model.geometry, profile, attitude: fromEuler(b.attitude), gravity: g, acceleration: b.acceleration, mirror: model.mirror, ...(strain ? { strain } : {}) }, plan, ws);
  const window = Math.max(1, Math.round(channels.integration * plan.frequency));
  const read = readOut(run, channels.channels, channels.pair, window);
  return { plan, profile, run, channels: channels.channels, window, read };
}

/** The turn answer for a parsed scenario (`doc` as in `forcesOf`). */
export function turnOf(s: Scenario, doc: unknown = s): TurnResult {
  const planned = planOf(s);
  if ('issues' in planned) return { ok: false, issues: planned.issues };
  const { plan } = planned;
  const compiled = compile(s);
  if (!compiled.ok) return compiled;
  const model = compiled.model;
  const chosen = channelsOf(s, model);
  if (!chosen.ok) return chosen;
  const ws = workspaceFor(plan);
  const { profile, run, channels, window, read } = turnNumbers(s, model, plan, chosen.value, ws);
  const b = s.body;
  const warnings = turnWarnings(s, model, plan, profile);
  if (window > plan.beats) warnings.push(`the integration window (${window} beats) is longer than the run (${plan.beats} beats); every estimate averages fewer beats than the window`);
  for (const c of read.analysis.confusions) warnings.push(c.message);
  if (!read.analysis.weighted) warnings.push('no noise model (sensor.readoutNoise, or organ.senseMode for thermal noise): the estimator runs unweighted and readout.noise is absent');
  const sm = chosen.value.sensing.plan.senseMode;
  if (sm) warnings.push(`the sense mode is taken as quasi-steady: each beat's line passes through its steady-state response; its ring-up (time constant Q/(π f_s) = ${(sm.quality / (Math.PI * sm.frequency)).toPrecision(3)} s) is not simulated and would add to the lag`);
  const beatsPerIntegration = chosen.value.integration * plan.frequency;
  if (Math.abs(beatsPerIntegration - window) > 1e-9 * window) warnings.push(`sensor.integration is ${beatsPerIntegration.toPrecision(4)} beats; the turn's lock-in averages whole beats, ${window} of them`);
  const last = plan.samples - 1;
  const q = run.q;
  return finiteAnswer(doc, {
    ok: true,
    answer: {
      version: VERSION,
      scenario: s,
      units: TURN_UNITS,
      warnings,
      run: { duration: b.maneuver?.duration ?? plan.beats / plan.frequency, beats: plan.beats, pointsPerBeat: plan.pointsPerBeat, samples: plan.samples, sampleInterval: plan.dt },
      attitude: { initial: { ...b.attitude }, final: toEuler(q.w[last] as number, q.x[last] as number, q.y[last] as number, q.z[last] as number), normDrift: run.attitude.normDrift },
      readout: {
        window: { beats: window, time: window / plan.frequency },
        channels: channels.map((c) => ({
          side: side(model, c.organ === 1), role: c.organ === 1 ? 'mirror' : 'specified', axis: c.axisName, order: c.order, quantity: c.quantity, unit: QUANTITY_UNIT[c.quantity],
          referencePhase: c.referencePhase, sensitivity: { roll: c.sensitivity[0], pitch: c.sensitivity[1], yaw: c.sensitivity[2] }, baseline: c.baseline,
        })),
        conditionNumber: read.analysis.conditionNumber,
        confusions: read.analysis.confusions.map((c) => c.message),
        ...(read.analysis.weighted ? { noise: noiseOf(read.analysis) } : {}),
      },
      beats: read.rows,
      lag: read.lag,
      error: read.error,
      ...(run.strain ? { peakStrain: peakStrainOf(run, model) } : {}),
      ...(s.output.series ? { series: seriesOf(run, model, planned.decimation, ws) } : {}),
    },
  });
}

function noiseOf(a: PairAnalysis): Nullable<Rates> {
  const sd = (i: number) => {
    const c = a.covariance[i]?.[i];
    return c === null || c === undefined ? null : Math.sqrt(c);
  };
  return { roll: sd(0), pitch: sd(1), yaw: sd(2) };
}

export interface ReadOutResult {
  rows: BeatRow[];
  analysis: PairAnalysis;
  lag: Nullable<Rates>;
  error: Record<keyof Rates, ErrorStats | null>;
}

const one: Demodulated = { inPhase: new Float64Array(1), quadrature: new Float64Array(1) };

/**
 * Beat by beat: the in-phase output of every channel over each beat (lock-in, sensing), the
 * baseline removed, averaged over the trailing window and turned into rates by the pair's
 * least-squares estimator; against them the true rates averaged over each beat.
 */
function readOut(run: TurnRun, channels: Channel[], analysis: PairAnalysis, window: number): ReadOutResult {
  const { plan, motion } = run;
  const n = plan.pointsPerBeat, B = plan.beats, C = channels.length;
  const y = new Float64Array(C * B), ybar = new Float64Array(C * B);
  channels.forEach((c, ci) => {
    const beats = run.organs[c.organ] ?? [];
    const start = (TOTAL * N_AXES + 3 + c.axis) * n;
    for (let b = 0; b < B; b++) {
      const beat = beats[b];
      if (!beat) continue;
      demodulate(beat.data, { order: c.order, pointsPerBeat: n, referencePhase: c.loadPhase, firstSample: b * n, start, beats: 1 }, one);
      y[ci * B + b] = c.gain * (one.inPhase[0] as number) - c.baseline;
    }
    trailingMean(y.subarray(ci * B, (ci + 1) * B), window, B, ybar.subarray(ci * B, (ci + 1) * B));
  });
  const truth = [new Float64Array(B), new Float64Array(B), new Float64Array(B)];
  const est = [new Float64Array(B), new Float64Array(B), new Float64Array(B)];
  beatMeans(motion.wx, n, B, truth[0] as Float64Array);
  beatMeans(motion.wy, n, B, truth[1] as Float64Array);
  beatMeans(motion.wz, n, B, truth[2] as Float64Array);
  const yb = new Float64Array(C), e = new Float64Array(3);
  const rows: BeatRow[] = [];
  const seen = RATE_AXES.map((a) => analysis.observable[a]);
  for (let b = 0; b < B; b++) {
    for (let ci = 0; ci < C; ci++) yb[ci] = ybar[ci * B + b] as number;
    estimateRates(analysis, yb, e);
    const inPhase = new Array<number>(C);
    for (let ci = 0; ci < C; ci++) inPhase[ci] = (y[ci * B + b] as number) + (channels[ci] as Channel).baseline;
    for (let a = 0; a < 3; a++) (est[a] as Float64Array)[b] = e[a] as number;
    const pick = (x: Float64Array[], a: number) => (x[a] as Float64Array)[b] as number;
    rows.push({
      time: (b + 0.5) / plan.frequency,
      trueRate: { roll: pick(truth, 0), pitch: pick(truth, 1), yaw: pick(truth, 2) },
      estimatedRate: { roll: seen[0] ? pick(est, 0) : null, pitch: seen[1] ? pick(est, 1) : null, yaw: seen[2] ? pick(est, 2) : null },
      inPhase,
    });
  }
  const per = <T>(f: (a: number) => T | null) => ({ roll: f(0), pitch: f(1), yaw: f(2) });
  return {
    rows,
    analysis,
    lag: per((a) => (seen[a] ? lagOf(truth[a] as Float64Array, est[a] as Float64Array, B, window, plan.frequency) : null)),
    error: per((a) => (seen[a] ? errorOf(truth[a] as Float64Array, est[a] as Float64Array, B) : null)),
  };
}

function peakStrainOf(run: TurnRun, model: Model): PeakStrain {
  const { plan } = run;
  const organs = (run.strain ?? []).map((x, o) => {
    const peaks = Object.fromEntries(STRAIN_KINDS.map((k, i) => [k, peakOf(x[i] as Float64Array, plan.samples, plan.dt, plan.pointsPerBeat)])) as Record<StrainKind, StrainPeak>;
    return { side: side(model, o === 1), role: (o === 1 ? 'mirror' : 'specified') as 'specified' | 'mirror', ...peaks };
  });
  const overall = Object.fromEntries(STRAIN_KINDS.map((k) => {
    const best = organs.reduce((a, o) => (Math.abs(o[k].value) > Math.abs(a[k].value) ? o : a));
    return [k, { ...best[k], side: best.side, role: best.role }];
  })) as Record<StrainKind, OrganPeak>;
  return { ...overall, organs };
}

/** Euler angles at every sample, into the workspace's midpoint buffers (free after the run). */
function eulerSeries(q: QuaternionSeries, N: number, out: [Float64Array, Float64Array, Float64Array]): void {
  const [r, p, y] = out;
  for (let j = 0; j < N; j++) {
    const e = toEuler(q.w[j] as number, q.x[j] as number, q.y[j] as number, q.z[j] as number);
    r[j] = e.roll;
    p[j] = e.pitch;
    y[j] = e.yaw;
  }
}

function seriesOf(run: TurnRun, model: Model, d: Decimation, ws: TurnWorkspace): TurnSeries {
  const { plan, motion } = run;
  const N = plan.samples;
  const dec = (x: Float64Array, start = 0) => decimate(d, plan, x, start);
  const euler = ws.mid; // Ω at the midpoints is spent once the attitude is integrated
  eulerSeries(run.q, N, euler);
  const axes = axesOf(model.geometry.drive);
  const n = plan.pointsPerBeat;
  const block = COMPONENTS.length * N_AXES * n;
  const organs = run.organs.map((o, i) => {
    const data = o[0]?.data.buffer === undefined ? new Float64Array(0) : new Float64Array(o[0].data.buffer, o[0].data.byteOffset, plan.beats * block);
    const loads = {} as Record<Component, Partial<Record<Axis, Leaf>>>;
    COMPONENTS.forEach((c, ci) => {
      const byAxis: Partial<Record<Axis, Leaf>> = {};
      axes.forEach((a, ai) => {
        byAxis[a] = decimate(d, plan, data, (ci * N_AXES + ai) * n, block);
      });
      loads[c] = byAxis;
    });
    const strain = run.strain?.[i];
    return {
      side: side(model, i === 1),
      role: (i === 0 ? 'specified' : 'mirror') as 'specified' | 'mirror',
      loads,
      ...(strain ? { strain: { axial: dec(strain[0]), inPlane: dec(strain[1]), outOfPlane: dec(strain[2]) } } : {}),
    };
  });
  return {
    decimate: describeDecimation(d),
    time: keptTimes(d, plan),
    rate: { roll: dec(motion.wx), pitch: dec(motion.wy), yaw: dec(motion.wz) },
    angularAcceleration: { roll: dec(motion.dwx), pitch: dec(motion.dwy), yaw: dec(motion.dwz) },
    attitude: { roll: dec(euler[0]), pitch: dec(euler[1]), yaw: dec(euler[2]) },
    gravity: { x: dec(motion.gx), y: dec(motion.gy), z: dec(motion.gz) },
    organs,
  };
}

