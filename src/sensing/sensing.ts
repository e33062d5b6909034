/**
 * `sensing(doc)`: scale factors, noise, SNR, smallest detectable rate and bias per body axis for
 * each organ, and the pair read together (design §6, §9). Also `prepareSensing` (the numbers
 * behind an answer, reusable by turns and sweeps) and `rateSweep` (many body rates at once, by the
 * linearity of the Coriolis lines in Ω, with the centrifugal lines as an exact quadratic form).
 */
import { N_AXES, TOTAL } from '../components.js';
import { choosePath, sampleOrgan, warningsFor, type Path } from '../forces.js';
import { amplitudePhase } from '../harmonics.js';
import { compile, mirroredMotion, type Model, type Side } from '../model.js';
import { finiteAnswer } from '../finite.js';
import { parseScenario, type Issue, type Scenario } from '../scenario.js';
import { VERSION } from '../version.js';
import { beatTable } from '../waveform.js';
import { bestChannel, biasOf, CH, organChannels, QUANTITY_UNIT, through, throughPQ, type AxisPlan, type Bias, type Quantity, type ReadPlan } from './detection.js';
import { axisAt, BLOCK, centrifugalForm, MIRROR_SIGN, organLines, unitAt, type OrganLines } from './lines.js';
import { angleRandomWalkCoefficient, rateNoiseDensity, thermalForcePsd, toDegreesPerRootHour } from './noise.js';
import { analysePair, estimatorGain, RATE_AXES, type Confusion, type PairAnalysis, type RateAxis } from './pair.js';
import { damping, displacementTransfer, forceTransfer, senseAxisIndex, stiffness } from './senseMode.js';
import { leverArm, section, STRAIN_AXES, strainPerLoad, type Section, type StrainAxis } from './strain.js';

export const FRAME_AXES = { rotary: ['radial', 'tangential', 'normal'], linear: ['drive', 'sense', 'cross'] } as const;
export type FrameAxis = (typeof FRAME_AXES)['rotary' | 'linear'][number];

export const SENSING_UNITS = {
  rate: 'rad/s',
  time: 's',
  frequency: 'Hz',
  phase: 'rad',
  load: 'N',
  strain: '1 (m/m)',
  displacement: 'm',
  scaleFactor: 'channel unit per rad/s (channel.unit)',
  noiseDensity: 'channel unit/Hz^0.5, one-sided',
  noiseSigma: 'channel unit (spread of one lock-in output over the integration)',
  snr: '1 (amplitude ratio)',
  rateNoiseDensity: '(rad/s)/Hz^0.5, one-sided',
  angleRandomWalk: 'deg/h^0.5',
  bias: 'rad/s',
  perAngularAcceleration: 's ((rad/s) per rad/s^2)',
  covariance: '(rad/s)^2',
  secondMoment: 'm^4',
  area: 'm^2',
  length: 'm',
  strainPerLoad: '1/N',
  transfer: 'm/N',
  stiffness: 'N/m',
  damping: 'N s/m',
  forceDensity: 'N/Hz^0.5, one-sided',
} as const;

export const CONVENTIONS = {
  psd: 'Every noise density is one-sided: S(f) over f ≥ 0, so that the variance in a band B is S·B; a density is √S.',
  amplitude: 'A line is A cos(kωt + ψ), t = 0 at the waveform origin; A is the single-sided peak amplitude (not RMS, not peak-to-peak).',
  lockIn: 'The lock-in of a channel multiplies by 2cos(kωt + ψ_ref) (in-phase) and −2sin(kωt + ψ_ref) (quadrature) and averages over the integration; a line A cos(kωt + ψ) reads I = A cos(ψ − ψ_ref), Q = A sin(ψ − ψ_ref). ψ_ref (channel.referencePhase) is locked to the rate-induced line; through a sense mode it includes the phase lag of that mode, so the scale factor keeps its sign across mode matching.',
  outputNoise: 'White noise of one-sided density √S gives each lock-in output a spread σ = √(S/T) over the integration time T.',
  scaleFactor: 'K = ∂I/∂Ω: the in-phase output per unit body rate about the axis, at zero rate (the Coriolis line is linear in Ω); signed.',
  snr: 'SNR = |K Ω| / σ, an amplitude ratio (not a power ratio), for the scenario\'s rate about that axis.',
  minimumRate: 'Smallest detectable rate = threshold · σ / |K| (rad/s), threshold = sensor.threshold (SNR, default 1).',
  detectable: 'Whether the scenario\'s rate about the axis is detected: SNR ≥ threshold on the organ\'s best channel (per organ), |Ω| ≥ the pair\'s minimum rate (pair); null without a noise model or when the scenario has no rate about that axis.',
  rateNoiseDensity: 'One-sided rate-noise density n = √(2S)/|K| in (rad/s)/√Hz: the demodulated rate output as white baseband noise, so that a T-average has spread n/√(2T) = σ/|K|.',
  angleRandomWalk: 'Angle random walk N in deg/√h with the IEEE Std 952 / IEEE Std 1431 Allan-variance convention σ²(τ) = N²/τ for white rate noise, N² being the two-sided PSD level: N = n/√2 = √S/|K|. N[deg/√h] = 60 · N[deg/s/√Hz] (0.01 deg/s/√Hz ↔ 0.6 deg/√h).',
  thermalNoise: 'Thermo-mechanical force noise of the sense mode S_F = 4 k_B T c, c = m ω_s/Q, k_B = 1.380649e-23 J/K (exact, SI 2019), one-sided, on the sense axis only. Without organ.senseMode there is no damping to take it from and only the readout noise counts.',
  readoutNoise: 'sensor.readoutNoise is the readout\'s own white noise in the quantity it reads: a force density for the load passed to the support, a strain density for strain at the stalk base, a displacement density for the sense-mode displacement.',
  channels: 'A channel is an organ axis and a harmonic order k ≥ 1. With a sense mode only its axis (rotary normal, linear sense) is read; without one, all three organ axes are. The best channel of an axis has the largest |K|/√S.',
  bias: 'Biases are equivalent rates (output / K, rad/s): primary load on the channel\'s axis; primary load leaking in through the misalignment δ (worst tilt direction); the quadrature line times |sin ε| for a phase error ε; centrifugal (quadratic in Ω, a scale-factor nonlinearity at the scenario\'s rate), gravity and translational lines. Angular acceleration is zero at constant rate; perAngularAcceleration gives its in-phase and quadrature output per rad/s².',
  pair: 'The pair reads every channel of both organs: H (rows: channels, columns: roll, pitch, yaw) from the in-phase outputs per unit rate, R = diag(σ²) (independent channels), Cov(Ω̂) = (Hᵀ R⁻¹ H)⁻¹, minimum rate = threshold · √Cov_ii, condition number of R^{-1/2} H.',
  mirror: 'The mirror organ is the image across the body x–z plane beating in phase; its frame is the mirror image of the original\'s, so a pitch rate gives identical outputs on both organs and roll and yaw rates opposite ones.',
  strain: 'Strain at the base of the stalk (Euler–Bernoulli), on the fibre at +normal (outOfPlane) and +tangential (inPlane), tension positive; axial strain from the radial load.',
  units: 'SI throughout; rates in rad/s.',
} as const;

export interface ChannelInfo {
  axis: FrameAxis;
  order: number;
  /** Frequency of the line (Hz). */
  frequency: number;
  quantity: Quantity;
  unit: string;
  /** ψ_ref (rad) of the lock-in, in the channel's quantity. */
  referencePhase: number;
}

export interface AxisNoise {
  /** √S in the channel unit per √Hz, one-sided, at the line. */
  density: number;
  thermalDensity: number;
  readoutDensity: number;
  /** σ = √(S/T): spread of one lock-in output over the integration. */
  sigma: number;
  limitedBy: 'thermal' | 'readout' | 'none';
}

export interface AxisSensing {
  channel: ChannelInfo | null;
  scaleFactor: number;
  quadratureScaleFactor: number;
  /** Output of this channel per unit rate about each axis over its own scale factor. */
  crossAxis: Record<RateAxis, number> | null;
  /** The scenario's rate about this axis (rad/s) and the in-phase output it gives. */
  rate: number;
  signal: number;
  noise: AxisNoise | null;
  snr: number | null;
  minimumRate: number | null;
  /** SNR ≥ threshold at the scenario's rate; null without a noise model or at zero rate. */
  detectable: boolean | null;
  rateNoiseDensity: number | null;
  angleRandomWalk: number | null;
  bias: Bias | null;
}

export interface StrainLine {
  axis: StrainAxis;
  order: number;
  amplitude: number;
  phase: number;
}

export interface StrainAnswer {
  section: Section;
  leverArm: number;
  perLoad: Record<StrainAxis, number>;
  /** The strain that follows the sense mode (rotary: outOfPlane), or null when all are quasi-static. */
  dynamic: StrainAxis | null;
  /** With output.lines: the strain lines of the total load and of its rate-induced part. */
  harmonics?: StrainLine[];
  rateInduced?: StrainLine[];
  peak?: Record<StrainAxis, number>;
  series?: { time: number[] } & Record<StrainAxis, number[]>;
}

export interface SenseLine {
  order: number;
  amplitude: number;
  phase: number;
}

export interface SenseModeAnswer {
  axis: FrameAxis;
  frequency: number;
  quality: number;
  mass: number;
  stiffness: number;
  damping: number;
  thermalForceDensity: number;
  /** With output.lines: the transfer per harmonic, displacement lines per unit rate and of the total. */
  transfer?: { order: number; frequency: number; magnitude: number; phase: number; forceGain: number }[];
  perUnitRate?: Record<RateAxis, SenseLine[]>;
  displacement?: SenseLine[];
  series?: { time: number[]; displacement: number[] };
}

export interface OrganSensing {
  side: Side;
  role: 'specified' | 'mirror';
  read: { axes: FrameAxis[]; quantity: Quantity; unit: string };
  axes: Record<RateAxis, AxisSensing>;
  strain?: StrainAnswer;
  senseMode?: SenseModeAnswer;
}

export interface PairRowAnswer {
  side: Side;
  role: 'specified' | 'mirror';
  axis: FrameAxis;
  order: number;
  quantity: Quantity;
  unit: string;
  referencePhase: number;
  noise: number;
  roll: number;
  pitch: number;
  yaw: number;
}

export interface PairAxis {
  minimumRate: number | null;
  observable: boolean;
  /** |Ω| ≥ minimumRate at the scenario's rate; null without a noise model or at zero rate. */
  detectable: boolean | null;
}

export interface PairSensing {
  organs: number;
  channels: number;
  weighted: boolean;
  roll: PairAxis;
  pitch: PairAxis;
  yaw: PairAxis;
  conditionNumber: number | null;
  singularValues: [number, number, number];
  covariance: (number | null)[][];
  confusions: Confusion[];
  matrix: PairRowAnswer[];
}

export interface SensingAnswer {
  version: string;
  path: Path;
  scenario: Scenario;
  units: typeof SENSING_UNITS;
  conventions: typeof CONVENTIONS;
  warnings: string[];
  integration: { time: number; beats: number };
  organs: OrganSensing[];
  pair: PairSensing;
}

export type SensingResult = { ok: true; answer: SensingAnswer } | { ok: false; issues: Issue[] };

// ---- the read plan ------------------------------------------------------------------------------

interface StalkInfo {
  section: Section;
  lever: number;
  perLoad: [number, number, number];
}

const QUANTITY_OF = { forceDensity: 'load', strainDensity: 'strain', displacementDensity: 'displacement' } as const;

/** The sensor settings with the schema's defaults when the block is absent. */
export function sensorOf(s: Scenario): NonNullable<Scenario['sensor']> {
  return s.sensor ?? { temperature: 300, integration: { beats: 10 }, threshold: 1, misalignment: 0, phaseError: 0 };
}

/** What is read, in which quantity, with which noise; issues for readouts the organ cannot support. */
export function readPlan(s: Scenario): { plan: ReadPlan; stalk?: StalkInfo } | { issues: Issue[] } {
  const o = s.organ;
  const sensor = sensorOf(s);
  const sm = o.senseMode;
  const stalk = o.drive === 'rotary' && o.stalk ? o.stalk : undefined;
  const readout = sensor.readoutNoise;
  const quantity: Quantity = readout ? QUANTITY_OF[readout.dimension] : sm ? 'displacement' : stalk ? 'strain' : 'load';
  const shown = () => (readout ? `${readout.value} ${readout.dimension === 'forceDensity' ? 'N/Hz^0.5' : readout.dimension === 'strainDensity' ? '/Hz^0.5' : 'm/Hz^0.5'}` : '');
  if (quantity === 'strain' && !stalk) {
    return { issues: [{ path: 'sensor.readoutNoise', message: `${shown()} is a strain noise density, but the organ has no stalk to strain; add organ.stalk (rotary organs) or give the readout noise as a force density such as '2e-10 N / Hz^0.5'` }] };
  }
  if (quantity === 'displacement' && !sm) {
    return { issues: [{ path: 'sensor.readoutNoise', message: `${shown()} is a displacement noise density, but without organ.senseMode nothing relates displacement to load; add organ.senseMode or give the readout noise as a force density such as '2e-10 N / Hz^0.5'` }] };
  }
  const info = stalk ? (() => {
    const sec = section(stalk);
    const lever = leverArm(o as Extract<typeof o, { drive: 'rotary' }>);
    return { section: sec, lever, perLoad: strainPerLoad(stalk, sec, lever) };
  })() : undefined;
  const si = senseAxisIndex(o.drive);
  const axes = [0, 1, 2].map((b): AxisPlan => ({
    read: sm ? b === si : true,
    quantity,
    gain: quantity === 'strain' && info ? (info.perLoad[b] as number) : 1,
    dynamic: sm !== undefined && b === si,
  })) as [AxisPlan, AxisPlan, AxisPlan];
  const integration = typeof sensor.integration === 'number' ? sensor.integration : sensor.integration.beats / o.frequency;
  return {
    plan: {
      axes,
      frequency: o.frequency,
      senseMode: sm,
      thermalPsd: sm ? thermalForcePsd(sensor.temperature, damping(sm)) : 0,
      readoutPsd: readout ? readout.value ** 2 : 0,
      integration,
      threshold: sensor.threshold,
      misalignment: sensor.misalignment,
      phaseError: sensor.phaseError,
    },
    ...(info ? { stalk: info } : {}),
  };
}

// ---- prepared numbers ---------------------------------------------------------------------------

export interface PreparedOrgan {
  role: 'specified' | 'mirror';
  side: Side;
  lines: OrganLines;
  /** Channel rows (detection.ts CH layout). */
  channels: Float64Array;
  /** Row of the best channel for roll, pitch, yaw (−1: none). */
  best: [number, number, number];
}

export interface SensingPlan {
  scenario: Scenario;
  model: Model;
  path: Path;
  plan: ReadPlan;
  stalk?: StalkInfo;
  organs: PreparedOrgan[];
  /** Channels of the pair: organ index and row, in the order of the pair matrix. */
  pairRows: { organ: number; row: number }[];
  pair: PairAnalysis;
  warnings: string[];
  /** Centrifugal quadratic form of the specified organ (filled by the first rateSweep). */
  centrifugal?: Float64Array;
}

const sideOf = (model: Model, mirror: boolean): Side => (!mirror ? model.side : model.side === 'right' ? 'left' : model.side === 'left' ? 'right' : 'midline');

const merit = (ch: Float64Array, r: number): number => {
  const at = r * CH.size;
  const K = Math.max(Math.abs(ch[at + CH.K] as number), Math.abs(ch[at + CH.K + 1] as number), Math.abs(ch[at + CH.K + 2] as number));
  const S = ch[at + CH.psd] as number;
  return S > 0 ? K / Math.sqrt(S) : K;
};

/** Buffers of the answer path (`sensingOf` copies every number out before it returns). */
const workspace: { K: number; lines?: { specified: OrganLines; mirror: OrganLines }; channels: (Float64Array | undefined)[] } = { K: -1, channels: [] };

/**
 * The numbers behind a sensing answer for a parsed scenario and its model. The plan owns its
 * arrays, so callers may keep it (for sweeps or turns) while computing other answers.
 */
export function prepareSensing(s: Scenario, model: Model): { ok: true; prepared: SensingPlan } | { ok: false; issues: Issue[] } {
  return prepare(s, model, false);
}

function prepare(s: Scenario, model: Model, reuse: boolean): { ok: true; prepared: SensingPlan } | { ok: false; issues: Issue[] } {
  const chosen = choosePath(s, model);
  if ('issue' in chosen) return { ok: false, issues: [chosen.issue] };
  const { path } = chosen;
  const rp = readPlan(s);
  if ('issues' in rp) return { ok: false, issues: rp.issues };
  const { plan } = rp;
  const K = s.sampling.harmonics;
  if (K < 1) return { ok: false, issues: [{ path: 'sampling.harmonics', message: '0 harmonics leave nothing to lock in to; expected at least 1' }] };
  if (reuse && workspace.K !== K) {
    workspace.K = K;
    workspace.lines = undefined;
    workspace.channels = [];
  }
  const lines = organLines(model, path, s.sampling.pointsPerBeat, K, reuse ? workspace.lines : undefined);
  if (reuse) workspace.lines = lines;
  const roles: ('specified' | 'mirror')[] = model.mirror ? ['specified', 'mirror'] : ['specified'];
  const organs = roles.map((role, oi): PreparedOrgan => {
    const L = role === 'mirror' ? lines.mirror : lines.specified;
    const channels = organChannels(plan, L, reuse ? workspace.channels[oi] : undefined);
    if (reuse) workspace.channels[oi] = channels;
    return { role, side: sideOf(model, role === 'mirror'), lines: L, channels, best: [bestChannel(channels, 0), bestChannel(channels, 1), bestChannel(channels, 2)] };
  });
  let top = 0;
  for (const o of organs) for (let r = 0; r < o.channels.length / CH.size; r++) top = Math.max(top, merit(o.channels, r));
  const pairRows: { organ: number; row: number }[] = [];
  const rows: { sensitivity: [number, number, number]; sigma: number }[] = [];
  organs.forEach((o, oi) => {
    for (let r = 0; r < o.channels.length / CH.size; r++) {
      if (!(merit(o.channels, r) > 1e-9 * top)) continue;
      const at = r * CH.size;
      pairRows.push({ organ: oi, row: r });
      rows.push({ sensitivity: [o.channels[at + CH.K] as number, o.channels[at + CH.K + 1] as number, o.channels[at + CH.K + 2] as number], sigma: Math.sqrt((o.channels[at + CH.psd] as number) / plan.integration) });
    }
  });
  const pair = analysePair(rows, { threshold: plan.threshold });
  // The core's warnings concern sampling (aliasing) and measured-trace fits only.
  const core = path === 'sampled' || s.output.series || model.fit ? warningsFor(s, model, path) : [];
  const warnings = [...core, ...sensingWarnings(s, plan, pair)];
  return { ok: true, prepared: { scenario: s, model, path, plan, ...(rp.stalk ? { stalk: rp.stalk } : {}), organs, pairRows, pair, warnings } };
}

function sensingWarnings(s: Scenario, plan: ReadPlan, pair: PairAnalysis): string[] {
  const w: string[] = [];
  if (!s.sensor) w.push('no sensor block: temperature 300 K, integration 10 beats, threshold 1, no readout noise, no misalignment or phase error assumed');
  if (plan.thermalPsd === 0 && plan.readoutPsd === 0) w.push('no noise model: give sensor.readoutNoise, or organ.senseMode for thermal noise; snr, minimumRate, rateNoiseDensity and angleRandomWalk are null and the pair is unweighted');
  const beats = plan.integration * plan.frequency;
  if (Math.abs(beats - Math.round(beats)) > 1e-9 * beats) w.push(`the integration (${plan.integration} s) is ${beats.toPrecision(4)} beats; the noise follows √(S/T) for any T, but the lock-in rejects the other lines exactly only over whole beats`);
  if (pair.conditionNumber === null || pair.conditionNumber > 1e3) w.push(`the channels read together are ${pair.conditionNumber === null ? 'singular' : `poorly conditioned (condition number ${pair.conditionNumber.toPrecision(3)})`}: ${pair.confusions.map((c) => c.message).join('; ') || 'one rate combination is seen far worse than the others'}`);
  return w;
}

// ---- answer ---------------------------------------------------------------------------------------

const RATE_FREE = [BLOCK.primary, BLOCK.centrifugal, BLOCK.gravity, BLOCK.translational] as const;

/** Total load line (p, q) on organ axis b, order k, at the organ's rates (constant rate). */
function totalLine(L: OrganLines, omega: readonly number[], b: number, k: number): [number, number] {
  const d = L.data;
  let p = 0, q = 0;
  for (const block of RATE_FREE) {
    const at = axisAt(L, block, b, k);
    p += d[at] as number;
    q += d[at + 1] as number;
  }
  for (let i = 0; i < 3; i++) {
    const at = unitAt(L, BLOCK.coriolis, i, b, k);
    p += (omega[i] as number) * (d[at] as number);
    q += (omega[i] as number) * (d[at + 1] as number);
  }
  return [p, q];
}

/**
 * A complex line W = T Z as { amplitude, phase } in the convention of harmonics.ts
 * (`amplitudePhase` with p = Re W, q = −Im W): A = |W|, ψ = arg W in (−π, π]; order 0 keeps the
 * sign in the phase (0 or π). Written out with √ instead of Math.hypot, which is slow in V8;
 * a test holds it equal to `amplitudePhase`.
 */
export function lineOf(w: readonly [number, number], k: number): { amplitude: number; phase: number } {
  if (k === 0) return amplitudePhase(w[0], -w[1], 0);
  const amplitude = Math.sqrt(w[0] * w[0] + w[1] * w[1]);
  if (amplitude === 0) return { amplitude: 0, phase: 0 };
  const phase = Math.atan2(w[1], w[0]) + 0;
  return { amplitude, phase: phase <= -Math.PI ? Math.PI : phase };
}

function senseLine(order: number, w: [number, number]): SenseLine {
  const { amplitude, phase } = lineOf(w, order);
  return { order, amplitude, phase };
}

function axisAnswer(P: SensingPlan, o: PreparedOrgan, i: number): AxisSensing {
  const { plan } = P;
  const drive = P.scenario.organ.drive;
  const rate = P.model.motion.omega[i] as number;
  const r = o.best[i] as number;
  if (r < 0) {
    return { channel: null, scaleFactor: 0, quadratureScaleFactor: 0, crossAxis: null, rate, signal: 0, noise: null, snr: null, minimumRate: null, detectable: null, rateNoiseDensity: null, angleRandomWalk: null, bias: null };
  }
  const ch = o.channels, at = r * CH.size;
  const b = ch[at + CH.b] as number, k = ch[at + CH.k] as number;
  const K = ch[at + CH.K + i] as number;
  const S = ch[at + CH.psd] as number, St = ch[at + CH.thermal] as number;
  const a = plan.axes[b] as AxisPlan;
  const sigma = Math.sqrt(S / plan.integration);
  const noisy = S > 0;
  const crossAxis = { roll: (ch[at + CH.K] as number) / K, pitch: (ch[at + CH.K + 1] as number) / K, yaw: (ch[at + CH.K + 2] as number) / K };
  return {
    channel: { axis: FRAME_AXES[drive][b] as FrameAxis, order: k, frequency: k * plan.frequency, quantity: a.quantity, unit: QUANTITY_UNIT[a.quantity], referencePhase: ch[at + CH.psi] as number },
    scaleFactor: K,
    quadratureScaleFactor: ch[at + CH.Kq + i] as number,
    crossAxis,
    rate,
    signal: K * rate,
    noise: { density: Math.sqrt(S), thermalDensity: Math.sqrt(St), readoutDensity: Math.sqrt(plan.readoutPsd), sigma, limitedBy: !noisy ? 'none' : St > plan.readoutPsd ? 'thermal' : 'readout' },
    snr: noisy ? Math.abs(K * rate) / sigma : null,
    minimumRate: noisy ? (plan.threshold * sigma) / Math.abs(K) : null,
    detectable: noisy && rate !== 0 ? Math.abs(K * rate) / sigma >= plan.threshold : null,
    rateNoiseDensity: noisy ? rateNoiseDensity(S, K) : null,
    angleRandomWalk: noisy ? toDegreesPerRootHour(angleRandomWalkCoefficient(S, K)) : null,
    bias: biasOf(plan, o.lines, ch, r, i),
  };
}

/** Strain transfer on organ axis b at order k: strain per newton, through G(kω) on the sense axis. */
function strainTransfer(P: SensingPlan, b: number, k: number): readonly [number, number] {
  const st = P.stalk as StalkInfo;
  const g = st.perLoad[b] as number;
  const sm = P.plan.senseMode;
  if (!sm || !(P.plan.axes[b] as AxisPlan).dynamic) return [g, 0];
  const [re, im] = forceTransfer(sm, 2 * Math.PI * P.plan.frequency * k);
  return [g * re, g * im];
}

/** Synthesise Σ_k Re(W_k e^{ikωt}) over `beats` beats of n points from lines W_k = [re, im]. */
function synthesise(W: [number, number][], n: number, beats: number): number[] {
  const { cos, sin } = beatTable(n);
  const one = new Float64Array(n);
  W.forEach(([re, im], k) => {
    let m = 0;
    for (let j = 0; j < n; j++) {
      one[j] = (one[j] as number) + re * (cos[m] as number) - im * (sin[m] as number);
      m += k;
      if (m >= n) m -= n * Math.floor(m / n);
    }
  });
  const out = new Array<number>(n * beats);
  for (let j = 0; j < n * beats; j++) out[j] = one[j % n] as number;
  return out;
}

const timeAxis = (n: number, beats: number, f: number): number[] => Array.from({ length: n * beats }, (_, j) => j / (n * f));

/** A line W = re + i·im as a StrainLine (convention of `lineOf`). */
function strainLine(axis: StrainAxis, order: number, re: number, im: number): StrainLine {
  if (order === 0) {
    const { amplitude, phase } = lineOf([re, im], 0);
    return { axis, order, amplitude, phase };
  }
  const amplitude = Math.sqrt(re * re + im * im);
  const phase = amplitude === 0 ? 0 : Math.atan2(im, re) + 0;
  return { axis, order, amplitude, phase: phase <= -Math.PI ? Math.PI : phase };
}

function strainAnswer(P: SensingPlan, o: PreparedOrgan): StrainAnswer {
  const st = P.stalk as StalkInfo;
  const K1 = o.lines.orders, omega = P.model.motion.omega;
  const dynamicAxis = P.plan.senseMode ? (STRAIN_AXES[senseAxisIndex('rotary')] as StrainAxis) : null;
  const answer: StrainAnswer = {
    section: st.section,
    leverArm: st.lever,
    perLoad: { axial: st.perLoad[0], inPlane: st.perLoad[1], outOfPlane: st.perLoad[2] },
    dynamic: dynamicAxis,
  };
  if (P.scenario.output.lines) {
    const d = o.lines.data;
    const harmonics: StrainLine[] = [], rateInduced: StrainLine[] = [];
    const w0 = omega[0] as number, w1 = omega[1] as number, w2 = omega[2] as number;
    for (let b = 0; b < 3; b++) {
      const axis = STRAIN_AXES[b] as StrainAxis;
      for (let k = 0; k < K1; k++) {
        const [tr, ti] = strainTransfer(P, b, k);
        let tp = 0, tq = 0;
        for (const block of RATE_FREE) {
          const at = axisAt(o.lines, block, b, k);
          tp += d[at] as number;
          tq += d[at + 1] as number;
        }
        const c0 = unitAt(o.lines, BLOCK.coriolis, 0, b, k), c1 = unitAt(o.lines, BLOCK.coriolis, 1, b, k), c2 = unitAt(o.lines, BLOCK.coriolis, 2, b, k);
        const rp = w0 * (d[c0] as number) + w1 * (d[c1] as number) + w2 * (d[c2] as number);
        const rq = w0 * (d[c0 + 1] as number) + w1 * (d[c1 + 1] as number) + w2 * (d[c2 + 1] as number);
        tp += rp;
        tq += rq;
        harmonics.push(strainLine(axis, k, tr * tp + ti * tq, ti * tp - tr * tq));
        rateInduced.push(strainLine(axis, k, tr * rp + ti * rq, ti * rp - tr * rq));
      }
    }
    answer.harmonics = harmonics;
    answer.rateInduced = rateInduced;
  }
  if (P.scenario.output.series) {
    const { pointsPerBeat: n, beats } = P.scenario.sampling;
    const motion = o.role === 'mirror' ? mirroredMotion(P.model.motion) : P.model.motion;
    const beat = sampleOrgan(P.model.geometry, motion, n).beat;
    const series = { time: timeAxis(n, beats, P.plan.frequency) } as { time: number[] } & Record<StrainAxis, number[]>;
    const peak = {} as Record<StrainAxis, number>;
    for (let b = 0; b < 3; b++) {
      const axis = STRAIN_AXES[b] as StrainAxis;
      let values: number[];
      if (axis === dynamicAxis) {
        values = synthesise(Array.from({ length: K1 }, (_, k) => {
          const [tr, ti] = strainTransfer(P, b, k), [p, q] = totalLine(o.lines, omega, b, k);
          return throughPQ(p, q, tr, ti);
        }), n, beats);
      } else {
        const g = st.perLoad[b] as number, start = (TOTAL * N_AXES + 3 + b) * beat.n;
        values = Array.from({ length: n * beats }, (_, j) => g * (beat.data[start + (j % n)] as number));
      }
      series[axis] = values;
      peak[axis] = values.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
    }
    answer.series = series;
    answer.peak = peak;
  }
  return answer;
}

function senseModeAnswer(P: SensingPlan, o: PreparedOrgan): SenseModeAnswer {
  const sm = P.plan.senseMode as NonNullable<ReadPlan['senseMode']>;
  const drive = P.scenario.organ.drive;
  const b = senseAxisIndex(drive);
  const K1 = o.lines.orders, f = P.plan.frequency, omega = P.model.motion.omega;
  const answer: SenseModeAnswer = {
    axis: FRAME_AXES[drive][b] as FrameAxis,
    frequency: sm.frequency,
    quality: sm.quality,
    mass: sm.mass,
    stiffness: stiffness(sm),
    damping: damping(sm),
    thermalForceDensity: Math.sqrt(P.plan.thermalPsd),
  };
  const { lines, series } = P.scenario.output;
  if (!lines && !series) return answer;
  const Hs: [number, number][] = [];
  for (let k = 0; k < K1; k++) Hs.push(displacementTransfer(sm, 2 * Math.PI * f * k));
  const W: [number, number][] = [];
  for (let k = 0; k < K1; k++) {
    const [tr, ti] = Hs[k] as [number, number], [p, q] = totalLine(o.lines, omega, b, k);
    W.push(throughPQ(p, q, tr, ti));
  }
  if (lines) {
    const transfer: NonNullable<SenseModeAnswer['transfer']> = [];
    for (let k = 1; k < K1; k++) {
      const [re, im] = Hs[k] as [number, number];
      transfer.push({ order: k, frequency: k * f, magnitude: Math.sqrt(re * re + im * im), phase: Math.atan2(im, re), forceGain: stiffness(sm) * Math.sqrt(re * re + im * im) });
    }
    const perUnitRate = { roll: [], pitch: [], yaw: [] } as Record<RateAxis, SenseLine[]>;
    for (let i = 0; i < 3; i++) {
      const list = perUnitRate[RATE_AXES[i] as RateAxis];
      for (let k = 1; k < K1; k++) {
        const [tr, ti] = Hs[k] as [number, number];
        list.push(senseLine(k, through(o.lines.data, unitAt(o.lines, BLOCK.coriolis, i, b, k), tr, ti)));
      }
    }
    answer.transfer = transfer;
    answer.perUnitRate = perUnitRate;
    answer.displacement = W.map((w, k) => senseLine(k, w));
  }
  if (P.scenario.output.series) {
    const { pointsPerBeat: n, beats } = P.scenario.sampling;
    answer.series = { time: timeAxis(n, beats, f), displacement: synthesise(W, n, beats) };
  }
  return answer;
}

function pairAnswer(P: SensingPlan): PairSensing {
  const { pair } = P;
  const drive = P.scenario.organ.drive;
  const matrix = P.pairRows.map(({ organ, row }): PairRowAnswer => {
    const o = P.organs[organ] as PreparedOrgan;
    const at = row * CH.size;
    const a = P.plan.axes[o.channels[at + CH.b] as number] as AxisPlan;
    return {
      side: o.side,
      role: o.role,
      axis: FRAME_AXES[drive][o.channels[at + CH.b] as number] as FrameAxis,
      order: o.channels[at + CH.k] as number,
      quantity: a.quantity,
      unit: QUANTITY_UNIT[a.quantity],
      referencePhase: o.channels[at + CH.psi] as number,
      noise: Math.sqrt((o.channels[at + CH.psd] as number) / P.plan.integration),
      roll: o.channels[at + CH.K] as number,
      pitch: o.channels[at + CH.K + 1] as number,
      yaw: o.channels[at + CH.K + 2] as number,
    };
  });
  const axis = (a: RateAxis, i: number): PairAxis => {
    const rate = P.model.motion.omega[i] as number, min = pair.minimumRate[a];
    return { minimumRate: min, observable: pair.observable[a], detectable: min !== null && rate !== 0 ? Math.abs(rate) >= min : null };
  };
  return {
    organs: P.organs.length,
    channels: pair.channels,
    weighted: pair.weighted,
    roll: axis('roll', 0),
    pitch: axis('pitch', 1),
    yaw: axis('yaw', 2),
    conditionNumber: pair.conditionNumber,
    singularValues: pair.singularValues,
    covariance: pair.covariance,
    confusions: pair.confusions,
    matrix,
  };
}

/** The JSON-ready answer of a prepared plan. */
export function sensingAnswer(P: SensingPlan): SensingAnswer {
  const s = P.scenario;
  const drive = s.organ.drive;
  const organs = P.organs.map((o): OrganSensing => {
    const readAxes = P.plan.axes.map((a, b) => (a.read ? (FRAME_AXES[drive][b] as FrameAxis) : undefined)).filter((x): x is FrameAxis => x !== undefined);
    const quantity = P.plan.axes.find((a) => a.read)?.quantity ?? 'load';
    const out: OrganSensing = {
      side: o.side,
      role: o.role,
      read: { axes: readAxes, quantity, unit: QUANTITY_UNIT[quantity] },
      axes: { roll: axisAnswer(P, o, 0), pitch: axisAnswer(P, o, 1), yaw: axisAnswer(P, o, 2) },
    };
    if (P.stalk) out.strain = strainAnswer(P, o);
    if (P.plan.senseMode) out.senseMode = senseModeAnswer(P, o);
    return out;
  });
  return {
    version: VERSION,
    path: P.path,
    scenario: s,
    units: SENSING_UNITS,
    conventions: CONVENTIONS,
    warnings: P.warnings,
    integration: { time: P.plan.integration, beats: P.plan.integration * P.plan.frequency },
    organs,
    pair: pairAnswer(P),
  };
}

/** The sensing answer for a parsed scenario and its compiled model (`doc` as in `forcesOf`). */
export function sensingOf(s: Scenario, model: Model, doc: unknown = s): SensingResult {
  const p = prepare(s, model, true);
  return p.ok ? finiteAnswer(doc, { ok: true, answer: sensingAnswer(p.prepared) }) : p;
}

/** The sensing answer for a scenario document (design §9): validated like `forces`. */
export function sensing(doc: unknown): SensingResult {
  const parsed = parseScenario(doc);
  if (!parsed.ok) return parsed;
  const compiled = compile(parsed.scenario);
  if (!compiled.ok) return compiled;
  return sensingOf(parsed.scenario, compiled.model, doc);
}

// ---- sweeps over body rate ---------------------------------------------------------------------

export interface RateSweep {
  count: number;
  /** In-phase output of each organ's best channel for each axis: outputs[organ·3 + axis][n] (channel unit). */
  outputs: Float64Array[];
  /** |K_i Ω_i| / σ on that channel (NaN without a noise model or channel). */
  snr: Float64Array[];
  /** The pair's least-squares estimate [roll, pitch, yaw] (rad/s) per rate, 3 numbers per rate. */
  estimated: Float64Array;
}

/** In-phase coefficients of one channel: K (3), centrifugal form (6), rate-free lines (1). */
function channelCoefficients(P: SensingPlan, o: PreparedOrgan, row: number, out: Float64Array, at: number): void {
  const ch = o.channels, c = row * CH.size;
  const b = ch[c + CH.b] as number, k = ch[c + CH.k] as number, tr = ch[c + CH.tr] as number, ti = ch[c + CH.ti] as number;
  const psi = ch[c + CH.psi] as number, cp = Math.cos(psi), sp = Math.sin(psi);
  const inPhase = (w: [number, number]) => w[0] * cp + w[1] * sp;
  for (let i = 0; i < 3; i++) out[at + i] = ch[c + CH.K + i] as number;
  const Q = P.centrifugal as Float64Array, K1 = o.lines.orders, span = 3 * 2 * K1;
  const PAIRS = [[0, 0], [1, 1], [2, 2], [0, 1], [0, 2], [1, 2]] as const;
  PAIRS.forEach(([i, j], m) => {
    const sign = o.role === 'mirror' ? (MIRROR_SIGN[i] as number) * (MIRROR_SIGN[j] as number) : 1;
    const weight = i === j ? 1 : 2;
    out[at + 3 + m] = sign * weight * inPhase(through(Q, m * span + (b * K1 + k) * 2, tr, ti));
  });
  let s0 = 0;
  for (const block of [BLOCK.primary, BLOCK.gravity, BLOCK.translational]) s0 += inPhase(through(o.lines.data, axisAt(o.lines, block, b, k), tr, ti));
  out[at + 9] = s0;
}

/**
 * Outputs, SNR and the pair's rate estimate for many constant body rates (`rates`: roll, pitch,
 * yaw in rad/s, 3 numbers per rate), from one prepared plan. Each channel's in-phase output is
 * K·Ω + Σ Q_ij Ω_i Ω_j + (rate-free lines): Coriolis linear, centrifugal quadratic, exactly; the
 * estimate is G y with the pair's gain G, folded once into 3×3, 3×6 and 3×1 blocks.
 */
export function rateSweep(P: SensingPlan, rates: ArrayLike<number>): RateSweep {
  const count = Math.floor(rates.length / 3);
  if (!P.centrifugal) P.centrifugal = centrifugalForm(P.model, P.path, P.scenario.sampling.pointsPerBeat, P.scenario.sampling.harmonics);
  const nAxes = P.organs.length * 3;
  const best = new Float64Array(nAxes * 10);
  const sigma = new Float64Array(nAxes);
  P.organs.forEach((o, oi) => {
    for (let i = 0; i < 3; i++) {
      const r = o.best[i] as number;
      if (r < 0) {
        sigma[oi * 3 + i] = NaN;
        continue;
      }
      channelCoefficients(P, o, r, best, (oi * 3 + i) * 10);
      const S = o.channels[r * CH.size + CH.psd] as number;
      sigma[oi * 3 + i] = S > 0 ? Math.sqrt(S / P.plan.integration) : NaN;
    }
  });
  const n = P.pairRows.length, G = estimatorGain(P.pair);
  const row = new Float64Array(10);
  const fold = new Float64Array(30); // Ω̂ = fold[r·10 + 0..2]·Ω + fold[r·10 + 3..8]·q(Ω) + fold[r·10 + 9]
  P.pairRows.forEach(({ organ, row: rr }, j) => {
    channelCoefficients(P, P.organs[organ] as PreparedOrgan, rr, row, 0);
    for (let r = 0; r < 3; r++) for (let c = 0; c < 10; c++) fold[r * 10 + c] = (fold[r * 10 + c] as number) + (G[r * n + j] as number) * (row[c] as number);
  });
  const outputs = Array.from({ length: nAxes }, () => new Float64Array(count));
  const snr = Array.from({ length: nAxes }, () => new Float64Array(count));
  const estimated = new Float64Array(3 * count);
  for (let t = 0; t < count; t++) {
    const x = rates[3 * t] as number, y = rates[3 * t + 1] as number, z = rates[3 * t + 2] as number;
    const q0 = x * x, q1 = y * y, q2 = z * z, q3 = x * y, q4 = x * z, q5 = y * z;
    for (let a = 0; a < nAxes; a++) {
      const c = a * 10;
      const K0 = best[c] as number, K1 = best[c + 1] as number, K2 = best[c + 2] as number;
      (outputs[a] as Float64Array)[t] = K0 * x + K1 * y + K2 * z + (best[c + 3] as number) * q0 + (best[c + 4] as number) * q1 + (best[c + 5] as number) * q2 + (best[c + 6] as number) * q3 + (best[c + 7] as number) * q4 + (best[c + 8] as number) * q5 + (best[c + 9] as number);
      const i = a % 3, w = i === 0 ? x : i === 1 ? y : z;
      (snr[a] as Float64Array)[t] = Math.abs((best[c + i] as number) * w) / (sigma[a] as number);
    }
    for (let r = 0; r < 3; r++) {
      const c = r * 10;
      estimated[3 * t + r] = (fold[c] as number) * x + (fold[c + 1] as number) * y + (fold[c + 2] as number) * z + (fold[c + 3] as number) * q0 + (fold[c + 4] as number) * q1 + (fold[c + 5] as number) * q2 + (fold[c + 6] as number) * q3 + (fold[c + 7] as number) * q4 + (fold[c + 8] as number) * q5 + (fold[c + 9] as number);
    }
  }
  return { count, outputs, snr, estimated };
}
