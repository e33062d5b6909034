/**
 * `turn`: what the sensor sees during a body maneuver, beat by beat (design §7, §9). Takes a
 * scenario document whose `body.maneuver` gives the rate profiles (without one, `body.rate` is
 * held for `sampling.beats` beats) and returns the full-rate loads of both organs, the beat-by-beat
 * lock-in read-out with the rates the pair would estimate against the true ones, their lag and
 * error, the peak strain, and decimated series.
 */
import { axesOf, COMPONENTS, N_AXES, type Axis, type Component } from '../components.js';
import { warningsFor } from '../forces.js';
import { LIMITS } from '../limits.js';
import { compile, STANDARD_GRAVITY, type Model, type Side } from '../model.js';
import { parseScenario, type Issue, type Scenario } from '../scenario.js';
import { VERSION } from '../version.js';
import { fromEuler, toEuler, type QuaternionSeries } from './attitude.js';
import { rateProfile, traceSpans, type RateProfile } from './profiles.js';
import { allocTurn, fits, runTurn, turnPlan, type TurnPlan, type TurnRun, type TurnWorkspace } from './run.js';
import { decimate, decimation, describeDecimation, keptTimes, type Decimation, type Leaf } from './series.js';

export const TURN_UNITS = {
  time: 's', rate: 'rad/s', angularAcceleration: 'rad/s^2', angle: 'rad', load: 'N', gravity: 'm/s^2',
  lag: 's', strain: '1 (m/m)', lockIn: 'unit of the channel (N for loads, 1 for strain)',
} as const;

type Rates = { roll: number; pitch: number; yaw: number };

export interface BeatRow {
  /** Centre of the beat (s). */
  time: number;
  /** Body rates averaged over the beat (rad/s). */
  trueRate: Rates;
  /** Rates the pair estimates from the lock-in outputs over the window ending with this beat (rad/s). */
  estimatedRate: Rates;
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
  organs: { side: Side; role: 'specified' | 'mirror'; loads: Record<Component, Partial<Record<Axis, Leaf>>> }[];
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
  beats: BeatRow[];
  series?: TurnSeries;
}

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

/** Numbers in the series of an answer: per kept point, time and 12 body series, 42 per organ. */
const seriesValues = (d: Decimation, organs: number): number => d.kept * (1 + 12 + organs * COMPONENTS.length * N_AXES) * (d.kind === 'envelope' ? 2 : 1);

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
  const values = seriesValues(d, organs);
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
  return turnOf(parsed.scenario);
}

/** The turn answer for a parsed scenario. */
export function turnOf(s: Scenario): TurnResult {
  const planned = planOf(s);
  if ('issues' in planned) return { ok: false, issues: planned.issues };
  const { plan } = planned;
  const compiled = compile(s);
  if (!compiled.ok) return compiled;
  const model = compiled.model;
  const b = s.body;
  const profile: RateProfile = b.maneuver
    ? rateProfile(b.maneuver)
    : { axes: [[{ kind: 'constant', rate: b.rate.roll }], [{ kind: 'constant', rate: b.rate.pitch }], [{ kind: 'constant', rate: b.rate.yaw }]] };
  const g = b.gravity === true ? STANDARD_GRAVITY : b.gravity === false ? 0 : b.gravity;
  const ws = workspaceFor(plan);
  const run = runTurn({ geometry: model.geometry, profile, attitude: fromEuler(b.attitude), gravity: g, acceleration: b.acceleration, mirror: model.mirror }, plan, ws);
  const beats = beatRows(run);
  const last = plan.samples - 1;
  const q = run.q;
  return {
    ok: true,
    answer: {
      version: VERSION,
      scenario: s,
      units: TURN_UNITS,
      warnings: turnWarnings(s, model, plan, profile),
      run: { duration: b.maneuver?.duration ?? plan.beats / plan.frequency, beats: plan.beats, pointsPerBeat: plan.pointsPerBeat, samples: plan.samples, sampleInterval: plan.dt },
      attitude: { initial: { ...b.attitude }, final: toEuler(q.w[last] as number, q.x[last] as number, q.y[last] as number, q.z[last] as number), normDrift: run.attitude.normDrift },
      beats,
      ...(s.output.series ? { series: seriesOf(run, model, planned.decimation, ws) } : {}),
    },
  };
}

function beatRows(run: TurnRun): BeatRow[] {
  const { plan, motion } = run;
  const n = plan.pointsPerBeat;
  const rows: BeatRow[] = [];
  const mean = (x: Float64Array, b: number) => {
    let s = 0;
    for (let j = b * n; j < (b + 1) * n; j++) s += x[j] as number;
    return s / n;
  };
  for (let b = 0; b < plan.beats; b++) {
    const trueRate = { roll: mean(motion.wx, b), pitch: mean(motion.wy, b), yaw: mean(motion.wz, b) };
    rows.push({ time: (b + 0.5) / plan.frequency, trueRate, estimatedRate: { ...trueRate } });
  }
  return rows;
}

/** Euler angles at every sample, into the workspace's half-grid buffers (free after the run). */
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
  const euler = ws.half; // Ω on the half grid is spent once the attitude is integrated
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
    return { side: side(model, i === 1), role: (i === 0 ? 'specified' : 'mirror') as 'specified' | 'mirror', loads };
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

