/**
 * A maneuver at the full sample rate (design §7): body rates and angular accelerations from the
 * profiles, attitude and gravity in body axes, and the loads of the organ and its mirror over
 * every sample, with the angular-acceleration component alive.
 *
 * The stroke is periodic, so one beat of kinematics serves every beat; the body motion varies
 * per sample (MotionSeries with stride 1) and the loads kernel fills the run beat by beat.
 * Sample j sits at t_j = j·dt, dt = 1/(n f), the waveform's and the maneuver's common origin.
 *
 * Mirror organ (design §2): the specified geometry under Ω* = −PΩ, Ω̇* = −PΩ̇, a* = Pa, g* = Pg
 * (P: y → −y), with its body-axis y loads reflected afterwards.
 *
 * Layout: the loads of an organ are stored beat-major, one block of 42 series (components × axes,
 * as in loads.ts) per beat: series (c, a) of sample j = b·n + i sits at
 *   data[b·B + (c·6 + a)·n + i],  B = 42 n,
 * so that every beat is an ordinary one-beat LoadSeries (`beats[b]`) and the kernel writes into a
 * block that stays in cache (about 2.5× faster than one long strided series).
 *
 * Memory: every series lives in a TurnWorkspace, allocated once for the longest run it serves;
 * a run allocates nothing per beat or per sample.
 */
import { N_AXES, N_COMPONENTS } from '../components.js';
import { allocKinematics, kinematics, loads, type Kinematics, type LoadSeries, type MotionSeries } from '../loads.js';
import type { Geometry } from '../model.js';
import type { Vec3 } from '../vec.js';
import { beatTable, sampleBeat, type WaveSamples } from '../waveform.js';
import { gravitySeries, integrateAttitude, type AttitudeReport, type Quaternion, type QuaternionSeries } from './attitude.js';
import { sampleAxis, type RateProfile } from './profiles.js';
import { beatStrain, type StrainPlan } from './strain.js';

export interface TurnPlan {
  frequency: number;
  pointsPerBeat: number;
  beats: number;
  /** beats × pointsPerBeat. */
  samples: number;
  /** Sample interval 1/(n f) (s). */
  dt: number;
}

/** The run covers whole beats: ⌈duration · f⌉ of them (a tolerance of 1e-9 beat absorbs rounding). */
export function turnPlan(frequency: number, pointsPerBeat: number, duration: number): TurnPlan {
  const beats = Math.max(1, Math.ceil(duration * frequency - 1e-9));
  return { frequency, pointsPerBeat, beats, samples: beats * pointsPerBeat, dt: 1 / (pointsPerBeat * frequency) };
}

export interface TurnWorkspace {
  capacity: number;
  pointsPerBeat: number;
  motion: MotionSeries;
  mirrorMotion: MotionSeries;
  /** Ω at the midpoints t_j + dt/2 (x, y, z), and a scratch for Ω̇ there. */
  mid: [Float64Array, Float64Array, Float64Array];
  midScratch: Float64Array;
  q: QuaternionSeries;
  loadData: [Float64Array, Float64Array];
  /** One-beat views into loadData, per organ and beat. */
  beatViews: [LoadSeries[], LoadSeries[]];
  /** Stalk strain per organ: axial, in plane, out of plane, one contiguous series each. */
  strain: [Strain3, Strain3];
  kin: Kinematics;
  stroke: WaveSamples;
  deviation: WaveSamples;
}

export type Strain3 = [Float64Array, Float64Array, Float64Array];

const f64 = (n: number) => new Float64Array(n);
const wave = (n: number): WaveSamples => ({ s: f64(n), v: f64(n), a: f64(n) });

/** Allocate (once) the buffers of a run of `samples` samples at n points per beat. */
export function allocTurn(samples: number, pointsPerBeat: number): TurnWorkspace {
  const N = samples;
  const motion: MotionSeries = { stride: 1, wx: f64(N), wy: f64(N), wz: f64(N), dwx: f64(N), dwy: f64(N), dwz: f64(N), ax: f64(N), ay: f64(N), az: f64(N), gx: f64(N), gy: f64(N), gz: f64(N) };
  // The mirror shares every array that P leaves unchanged (wy, dwy, ax, az, gx, gz).
  const mirrorMotion: MotionSeries = { ...motion, wx: f64(N), wz: f64(N), dwx: f64(N), dwz: f64(N), ay: f64(N), gy: f64(N) };
  const n = pointsPerBeat;
  const block = N_COMPONENTS * N_AXES * n;
  const loadData: [Float64Array, Float64Array] = [f64(N_COMPONENTS * N_AXES * N), f64(N_COMPONENTS * N_AXES * N)];
  const views = (data: Float64Array) => Array.from({ length: Math.floor(N / n) }, (_, b) => ({ n, data: data.subarray(b * block, (b + 1) * block) }));
  return {
    capacity: N,
    pointsPerBeat: n,
    motion,
    mirrorMotion,
    mid: [f64(N), f64(N), f64(N)],
    midScratch: f64(N),
    q: { w: f64(N), x: f64(N), y: f64(N), z: f64(N) },
    loadData,
    beatViews: [views(loadData[0]), views(loadData[1])],
    strain: [[f64(N), f64(N), f64(N)], [f64(N), f64(N), f64(N)]],
    kin: allocKinematics(n),
    stroke: wave(n),
    deviation: wave(n),
  };
}

/** True when `ws` can hold the plan's run. */
export const fits = (ws: TurnWorkspace, plan: TurnPlan): boolean => ws.capacity >= plan.samples && ws.pointsPerBeat === plan.pointsPerBeat;

export interface TurnInput {
  geometry: Geometry;
  profile: RateProfile;
  /** Initial attitude (body → north–east–down). */
  attitude: Quaternion;
  /** Gravity magnitude (m/s²); 0 turns it off. */
  gravity: number;
  /** Acceleration of the reference point (m/s², body axes), held through the run. */
  acceleration: Vec3;
  mirror: boolean;
  /** Stalk strain to compute alongside the loads (rotary organ with a stalk). */
  strain?: StrainPlan;
}

export interface TurnRun {
  plan: TurnPlan;
  motion: MotionSeries;
  mirrorMotion?: MotionSeries;
  q: QuaternionSeries;
  /** Loads of the specified organ, then of its mirror: one LoadSeries per beat (views into the workspace). */
  organs: LoadSeries[][];
  /** Stalk strain per organ (axial, in plane, out of plane; views of the run's length), with a stalk. */
  strain?: Strain3[];
  /** One beat of stroke (and deviation) samples. */
  stroke: WaveSamples;
  deviation?: WaveSamples;
  attitude: AttitudeReport;
}

/** Body motion at every sample: Ω, Ω̇ from the profiles, attitude, gravity, translation. */
export function bodyMotion(input: TurnInput, plan: TurnPlan, ws: TurnWorkspace): AttitudeReport {
  const N = plan.samples;
  const m = ws.motion;
  const w = [m.wx, m.wy, m.wz] as const;
  const dw = [m.dwx, m.dwy, m.dwz] as const;
  for (let a = 0; a < 3; a++) {
    const terms = input.profile.axes[a] ?? [];
    sampleAxis(terms, plan.dt, N, w[a] as Float64Array, dw[a] as Float64Array);
    sampleAxis(terms, plan.dt, N - 1, ws.mid[a] as Float64Array, ws.midScratch, plan.dt / 2);
  }
  const report = integrateAttitude(input.attitude, w, ws.mid, plan.dt, N, ws.q);
  gravitySeries(ws.q, input.gravity, N, m.gx, m.gy, m.gz);
  m.ax.fill(input.acceleration[0], 0, N);
  m.ay.fill(input.acceleration[1], 0, N);
  m.az.fill(input.acceleration[2], 0, N);
  if (input.mirror) {
    const r = ws.mirrorMotion;
    for (let j = 0; j < N; j++) {
      r.wx[j] = -(m.wx[j] as number);
      r.wz[j] = -(m.wz[j] as number);
      r.dwx[j] = -(m.dwx[j] as number);
      r.dwz[j] = -(m.dwz[j] as number);
      r.ay[j] = -(m.ay[j] as number);
      r.gy[j] = -(m.gy[j] as number);
    }
  }
  return report;
}

/** Run a maneuver into `ws` (which must fit the plan). Returned series are views into `ws`. */
export function runTurn(input: TurnInput, plan: TurnPlan, ws: TurnWorkspace): TurnRun {
  if (!fits(ws, plan)) throw new RangeError(`workspace of ${ws.capacity} samples at ${ws.pointsPerBeat} points per beat cannot hold ${plan.samples} at ${plan.pointsPerBeat}`);
  const g = input.geometry;
  const n = plan.pointsPerBeat;
  const attitude = bodyMotion(input, plan, ws);
  const table = beatTable(n);
  const stroke = sampleBeat(g.stroke, g.frequency, n, table, ws.stroke);
  const deviation = g.deviation ? sampleBeat(g.deviation, g.frequency, n, table, ws.deviation) : undefined;
  const kin = kinematics(g, stroke, deviation, ws.kin);
  const organs: LoadSeries[][] = [ws.beatViews[0].slice(0, plan.beats)];
  if (input.mirror) organs.push(ws.beatViews[1].slice(0, plan.beats));
  const sp = input.strain;
  organs.forEach((beats, o) => {
    const motion = o === 0 ? ws.motion : ws.mirrorMotion;
    const strain = ws.strain[o] as Strain3;
    beats.forEach((beat, b) => {
      loads(kin, motion, g.mass, beat, 0, b * n);
      if (sp) beatStrain(sp, beat, kin, motion, b * n, strain, b * n);
    });
  });
  if (input.mirror) for (const beat of organs[1] as LoadSeries[]) reflectY(beat);
  const N = plan.samples;
  const strain = sp ? organs.map((_, o) => (ws.strain[o] as Strain3).map((x) => x.subarray(0, N)) as Strain3) : undefined;
  return { plan, motion: ws.motion, ...(input.mirror ? { mirrorMotion: ws.mirrorMotion } : {}), q: ws.q, organs, ...(strain ? { strain } : {}), stroke, ...(deviation ? { deviation } : {}), attitude };
}

/** Apply P (y → −y) to the body-axis y series of every component. */
function reflectY(s: LoadSeries): void {
  const { n, data } = s;
  for (let c = 0; c < N_COMPONENTS; c++) {
    const at = (c * N_AXES + 1) * n;
    for (let j = 0; j < n; j++) data[at + j] = -(data[at + j] as number);
  }
}
