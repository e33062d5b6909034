/**
 * `forces`: the loads on the support of the organ and its mirror over whole beats, as series and
 * harmonic lines (design §4, §5, §9). Takes a scenario document, returns a JSON-ready answer.
 */
import { besselJ } from './bessel.js';
import { axesOf, COMPONENTS, N_AXES, type Axis, type Component } from './components.js';
import { closedFormApplies, closedFormHarmonics } from './closedForm.js';
import { allocHarmonics, loadHarmonics, toLines, type HarmonicTable, type Line } from './harmonics.js';
import { allocKinematics, allocLoads, constantMotion, kinematics, loads, type Kinematics, type LoadSeries, type MotionSeries } from './loads.js';
import { compile, mirroredMotion, type Geometry, type Model, type Motion, type Side } from './model.js';
import { finiteAnswer } from './finite.js';
import { parseScenario, type Issue, type Scenario } from './scenario.js';
import { VERSION } from './version.js';
import { beatFrequencyOf, beatTable, contentOrder, fitTrace, sampleBeat, type FitReport, type WaveSamples } from './waveform.js';

export type Path = 'closed-form' | 'sampled';

export const UNITS = {
  time: 's', load: 'N', amplitude: 'N (loads)', phase: 'rad', angle: 'rad', position: 'm', frequency: 'Hz',
  rate: 'rad/s', mass: 'kg', length: 'm', acceleration: 'm/s^2', residualRms: 'rad (rotary) or m (linear)',
} as const;

export interface OrganSeries {
  time: number[];
  /** Stroke angle φ (rad) or drive position x (m). */
  stroke: number[];
  deviation?: number[];
  loads: Record<Component, Partial<Record<Axis, number[]>>>;
}

export interface OrganAnswer {
  side: Side;
  role: 'specified' | 'mirror';
  /** Organ-frame axes at zero stroke, in body axes. */
  frame: Record<string, [number, number, number]>;
  harmonics: Line[];
  series?: OrganSeries;
}

export interface ForcesAnswer {
  version: string;
  path: Path;
  scenario: Scenario;
  units: typeof UNITS;
  warnings: string[];
  fit?: FitReport;
  organs: OrganAnswer[];
}

export type ForcesResult = { ok: true; answer: ForcesAnswer } | { ok: false; issues: Issue[] };

/** Raw numbers of one organ: harmonic table and (optionally) one beat of load series. */
export interface OrganNumbers {
  table: HarmonicTable;
  beat?: LoadSeries;
  stroke?: WaveSamples;
  deviation?: WaveSamples;
}

const samples = (n: number): WaveSamples => ({ s: new Float64Array(n), v: new Float64Array(n), a: new Float64Array(n) });

/**
 * One beat of loads of the specified geometry under a constant motion. The beat and the stroke
 * samples are fresh arrays owned by the caller; the kinematics in between live in the workspace.
 */
export function sampleOrgan(g: Geometry, motion: Motion, n: number): { beat: LoadSeries; stroke: WaveSamples; deviation?: WaveSamples } {
  const table = beatTable(n);
  const ws = sampledWorkspace(n);
  const stroke = sampleBeat(g.stroke, g.frequency, n, table, samples(n));
  const deviation = g.deviation ? sampleBeat(g.deviation, g.frequency, n, table, samples(n)) : undefined;
  const k = kinematics(g, stroke, deviation, ws.kin);
  const beat = loads(k, setMotion(ws.motion, motion), g.mass, allocLoads(n));
  return { beat, stroke, deviation };
}

/**
 * Buffers for the sampled path when no series leaves organNumbers: the core is synchronous, so one
 * workspace per beat length serves every call (allocating them costs more than the arithmetic).
 */
interface SampledWorkspace { n: number; stroke: WaveSamples; deviation: WaveSamples; kin: Kinematics; beat: LoadSeries; motion: MotionSeries }
let sampledWs: SampledWorkspace | undefined;
function sampledWorkspace(n: number): SampledWorkspace {
  if (!sampledWs || sampledWs.n !== n) {
    sampledWs = { n, stroke: samples(n), deviation: samples(n), kin: allocKinematics(n), beat: allocLoads(n), motion: constantMotion({ omega: [], omegaDot: [], accel: [], gravity: [] }) };
  }
  return sampledWs;
}

/** Load a constant motion into a MotionSeries of stride 0. */
function setMotion(ms: MotionSeries, m: Motion): MotionSeries {
  ms.wx[0] = m.omega[0]; ms.wy[0] = m.omega[1]; ms.wz[0] = m.omega[2];
  ms.dwx[0] = m.omegaDot[0]; ms.dwy[0] = m.omegaDot[1]; ms.dwz[0] = m.omegaDot[2];
  ms.ax[0] = m.accel[0]; ms.ay[0] = m.accel[1]; ms.az[0] = m.accel[2];
  ms.gx[0] = m.gravity[0]; ms.gy[0] = m.gravity[1]; ms.gz[0] = m.gravity[2];
  return ms;
}

/** Harmonic lines of one beat on the sampled path, in the shared workspace (nothing returned but the table). */
function sampledHarmonics(g: Geometry, motion: Motion, n: number, out: HarmonicTable): HarmonicTable {
  const ws = sampledWorkspace(n);
  const table = beatTable(n);
  const stroke = sampleBeat(g.stroke, g.frequency, n, table, ws.stroke);
  const deviation = g.deviation ? sampleBeat(g.deviation, g.frequency, n, table, ws.deviation) : undefined;
  kinematics(g, stroke, deviation, ws.kin);
  loads(ws.kin, setMotion(ws.motion, motion), g.mass, ws.beat);
  return loadHarmonics(ws.beat, n, table, out.orders - 1, out);
}

export interface OrganNumbersOptions {
  mirror: boolean;
  path: Path;
  pointsPerBeat: number;
  harmonics: number;
  series: boolean;
  /** A table to fill (allocHarmonics(harmonics)), for callers that evaluate many times; fresh otherwise. */
  out?: HarmonicTable;
}

/**
 * The numbers for one organ of a compiled model: `mirror` selects the mirror organ
 * (computed as the specified geometry under the mirrored motion, body axes reflected).
 * With `series`, the beat's series are fresh arrays owned by the caller.
 */
export function organNumbers(model: Model, opts: OrganNumbersOptions): OrganNumbers {
  const g = model.geometry;
  const motion = opts.mirror ? mirroredMotion(model.motion) : model.motion;
  const n = opts.pointsPerBeat;
  const table = opts.out && opts.out.orders === opts.harmonics + 1 ? opts.out : allocHarmonics(opts.harmonics);
  let out: OrganNumbers = { table };
  if (opts.series) {
    const s = sampleOrgan(g, motion, n);
    out = { table, beat: s.beat, stroke: s.stroke, deviation: s.deviation };
    if (opts.path === 'sampled') loadHarmonics(s.beat, n, beatTable(n), opts.harmonics, table);
  } else if (opts.path === 'sampled') sampledHarmonics(g, motion, n, table);
  if (opts.path === 'closed-form') closedFormHarmonics(g, motion, table);
  if (opts.mirror) reflectBody(out);
  return out;
}

/** Apply P (y → −y) to the body-axis y series and lines. */
function reflectBody(o: OrganNumbers): void {
  const { table, beat } = o;
  const K1 = table.orders;
  for (let c = 0; c < COMPONENTS.length; c++) {
    const at = (c * N_AXES + 1) * K1 * 2;
    for (let i = 0; i < 2 * K1; i++) table.pq[at + i] = -(table.pq[at + i] as number);
    if (beat) {
      const s = (c * N_AXES + 1) * beat.n;
      for (let j = 0; j < beat.n; j++) beat.data[s + j] = -(beat.data[s + j] as number);
    }
  }
}

/** Highest harmonic order with content above ~1e-12 of the largest, for the aliasing warning. */
export function loadContentOrder(g: Geometry): number {
  const strokeOrder = contentOrder(g.stroke, 1e-12);
  if (g.drive === 'linear') return strokeOrder;
  const w = g.stroke;
  const swing = w.kind === 'triangle' ? Math.abs(w.amplitude) : Array.from(w.cos, (a, i) => Math.hypot(a, w.sin[i] ?? 0)).reduce((x, y) => x + y, 0);
  const x = 2 * swing;
  const top = Math.ceil(x) + 60;
  const J = besselJ(x, top);
  let kb = top;
  for (let k = Math.ceil(x); k <= top; k++) if (Math.abs(J[k] as number) < 1e-12) { kb = k; break; }
  const devOrder = g.deviation ? contentOrder(g.deviation, 1e-12) * 4 : 0;
  return Math.max(strokeOrder * (kb + 2), devOrder);
}

const toArray = (x: Float64Array, start: number, n: number, beats: number): number[] => {
  const out = new Array<number>(n * beats);
  for (let b = 0; b < beats; b++) for (let j = 0; j < n; j++) out[b * n + j] = x[start + j] as number;
  return out;
};

function organSeries(numbers: OrganNumbers, drive: 'rotary' | 'linear', frequency: number, n: number, beats: number): OrganSeries | undefined {
  const { beat, stroke, deviation } = numbers;
  if (!beat || !stroke) return undefined;
  const axes = axesOf(drive);
  const time = Array.from({ length: n * beats }, (_, j) => j / (n * frequency));
  const loadsOut = {} as Record<Component, Partial<Record<Axis, number[]>>>;
  COMPONENTS.forEach((c, ci) => {
    const byAxis: Partial<Record<Axis, number[]>> = {};
    axes.forEach((a, ai) => {
      byAxis[a] = toArray(beat.data, (ci * N_AXES + ai) * beat.n, n, beats);
    });
    loadsOut[c] = byAxis;
  });
  return { time, stroke: toArray(stroke.s, 0, n, beats), ...(deviation ? { deviation: toArray(deviation.s, 0, n, beats) } : {}), loads: loadsOut };
}

/** Choose the path: the closed form where it applies (and is asked for or allowed). */
export function choosePath(s: Scenario, m: Model): { path: Path } | { issue: Issue } {
  const applies = closedFormApplies(m.geometry);
  if (s.output.path === 'closed-form' && !applies) {
    return { issue: { path: 'output.path', message: "'closed-form' needs a sine stroke without deviation (rotary) or a harmonic-series stroke (linear); use 'sampled' or 'auto'" } };
  }
  return { path: s.output.path === 'sampled' || !applies ? 'sampled' : 'closed-form' };
}

/**
 * When a measured stroke fits poorly, the beat frequency its mean crossings give, if a fit there is
 * at least twice as good (the likeliest slip is the frequency); '' otherwise. Runs only on that path.
 */
function frequencyHint(s: Scenario, residualRms: number): string {
  const w = s.organ.waveform;
  if (typeof w !== 'object' || !('samples' in w)) return '';
  const { time, values } = w.samples;
  const f = beatFrequencyOf(time, values);
  if (f === undefined || Math.abs(f / s.organ.frequency - 1) < 1e-3) return '';
  const refit = fitTrace(time, values, f, w.harmonics);
  if (!refit.fit || !(refit.fit.residualRms < 0.5 * residualRms)) return '';
  return ` (the trace's upward crossings of its mean give ${f.toPrecision(4)} Hz, where the residual RMS is ${refit.fit.residualRms.toPrecision(3)}: set organ.frequency to it if that is the beat)`;
}

/** Warnings a careful user should read with the numbers. */
export function warningsFor(s: Scenario, m: Model, path: Path): string[] {
  const warnings: string[] = [];
  const n = s.sampling.pointsPerBeat;
  const content = loadContentOrder(m.geometry);
  if ((path === 'sampled' || s.output.series) && content > n / 2 - 1) {
    warnings.push(`the loads carry harmonics up to about order ${content}, above the ${n / 2 - 1} that ${n} points per beat resolve: sampled lines and series alias; raise sampling.pointsPerBeat to at least ${2 * content + 2}`);
  }
  if (m.fit && m.fit.spanBeats < 1) warnings.push(`the measured trace covers ${m.fit.spanBeats.toPrecision(3)} beats; the fit extrapolates over the rest of the beat`);
  if (m.fit) {
    const w = m.geometry.stroke;
    const swing = w.kind === 'series' ? Math.max(...Array.from(w.cos, (a, i) => Math.hypot(a, w.sin[i] ?? 0))) : 0;
    if (m.fit.residualRms > 0.1 * swing) warnings.push(`the fit's residual RMS (${m.fit.residualRms.toPrecision(3)}) is over 10% of the largest stroke harmonic; check the frequency${frequencyHint(s, m.fit.residualRms)} or add harmonics`);
  }
  return warnings;
}

/** The forces answer for a scenario document (design §9). */
export function forces(doc: unknown): ForcesResult {
  const parsed = parseScenario(doc);
  if (!parsed.ok) return parsed;
  const s = parsed.scenario;
  const compiled = compile(s);
  if (!compiled.ok) return compiled;
  return forcesOf(s, compiled.model, doc);
}

/**
 * The forces answer for a parsed scenario and its compiled model; `doc`, the document as given,
 * names the inputs in a refusal of an answer that overflowed (finite.ts).
 */
export function forcesOf(s: Scenario, model: Model, doc: unknown = s): ForcesResult {
  const chosen = choosePath(s, model);
  if ('issue' in chosen) return { ok: false, issues: [chosen.issue] };
  const { path } = chosen;
  const { pointsPerBeat: n, beats, harmonics } = s.sampling;
  const g = model.geometry;
  const frameNames = axesOf(g.drive).slice(3);
  const organs: OrganAnswer[] = [];
  const roles: ('specified' | 'mirror')[] = model.mirror ? ['specified', 'mirror'] : ['specified'];
  for (const role of roles) {
    const mirror = role === 'mirror';
    const numbers = organNumbers(model, { mirror, path, pointsPerBeat: n, harmonics, series: s.output.series });
    const P = (v: [number, number, number]): [number, number, number] => (mirror ? [v[0], -v[1], v[2]] : v);
    const frame = Object.fromEntries([g.e1, g.e2, g.e3].map((v, i) => [frameNames[i] as string, P(v)]));
    const series = s.output.series ? organSeries(numbers, g.drive, g.frequency, n, beats) : undefined;
    organs.push({
      side: mirror ? (model.side === 'right' ? 'left' : model.side === 'left' ? 'right' : 'midline') : model.side,
      role,
      frame,
      harmonics: toLines(numbers.table, g.drive),
      ...(series ? { series } : {}),
    });
  }
  return finiteAnswer(doc, {
    ok: true,
    answer: { version: VERSION, path, scenario: s, units: UNITS, warnings: warningsFor(s, model, path), ...(model.fit ? { fit: model.fit } : {}), organs },
  });
}
