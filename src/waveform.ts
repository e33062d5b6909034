/**
 * Stroke waveforms (design §3): the stroke coordinate (angle φ for a rotary organ, position x for a
 * linear one) and its exact time derivatives, evaluated on a grid of whole beats.
 *
 * Series form: s(t) = s̄ + Σ_k a_k cos kωt + b_k sin kωt (t = 0 at the waveform's origin).
 * Triangle form: s(t) = s̄ + S · asin(K sin ωt) / asin(K), K = cos(π r / 2), r = `rounding`:
 * near-constant velocity with smooth reversals that take about a fraction r of the beat;
 * r = 1 is the sine. Every derivative is analytic.
 */
import { Matrix, SVD } from 'ml-matrix';
import { LIMITS } from './limits.js';
import type { Waveform } from './scenario.js';

export interface SeriesWave {
  kind: 'series';
  mean: number;
  /** a_k at index k − 1. */
  cos: Float64Array;
  /** b_k at index k − 1. */
  sin: Float64Array;
}

export interface TriangleWave {
  kind: 'triangle';
  mean: number;
  amplitude: number;
  rounding: number;
}

export type Wave = SeriesWave | TriangleWave;

/** Report of a least-squares fit of a measured trace. */
export interface FitReport {
  harmonics: number;
  points: number;
  /** RMS of the residual, in the trace's SI unit (rad or m). */
  residualRms: number;
  /** Largest over smallest singular value of the design matrix. */
  conditionNumber: number;
  /** Time span of the trace in beats. */
  spanBeats: number;
}

/** The stroke of a scenario's organ as a Wave (measured traces are fitted here). */
export function strokeWave(
  waveform: Waveform,
  opts: { amplitude?: number; peakToPeak?: number; mean?: number; frequency: number },
): { wave: Wave; fit?: FitReport; error?: string } {
  const amplitude = opts.amplitude ?? (opts.peakToPeak ?? 0) / 2;
  const mean = opts.mean ?? 0;
  if (waveform === 'sine') return { wave: sine(mean, amplitude) };
  if (waveform === 'triangle') return { wave: { kind: 'triangle', mean, amplitude, rounding: 0.25 } };
  if ('triangle' in waveform) {
    const r = waveform.triangle.rounding;
    return { wave: r >= 1 ? sine(mean, amplitude) : { kind: 'triangle', mean, amplitude, rounding: r } };
  }
  if ('samples' in waveform) return fitTrace(waveform.samples.time, waveform.samples.values, opts.frequency, waveform.harmonics);
  return { wave: fromTerms(mean, waveform.harmonics) };
}

export const sine = (mean: number, amplitude: number): SeriesWave => ({
  kind: 'series',
  mean,
  cos: new Float64Array([0]),
  sin: new Float64Array([amplitude]),
});

/** A series from `{ order, cos, sin }` terms (repeated orders add). */
export function fromTerms(mean: number, terms: readonly { order: number; cos: number; sin: number }[]): SeriesWave {
  const top = Math.max(1, ...terms.map((t) => t.order));
  const cos = new Float64Array(top);
  const sin = new Float64Array(top);
  for (const t of terms) {
    cos[t.order - 1] = (cos[t.order - 1] ?? 0) + t.cos;
    sin[t.order - 1] = (sin[t.order - 1] ?? 0) + t.sin;
  }
  return { kind: 'series', mean, cos, sin };
}

/**
 * Least-squares fit of s(t) = s̄ + Σ_{k=1..K} a_k cos kωt + b_k sin kωt to a trace, by Householder
 * QR of the n × (2K+1) design matrix (column-major typed array, 2n(2K+1)² flops; backward stable,
 * as good as an SVD for the solve) and back substitution; the condition number is that of R, from
 * ml-matrix's SVD of the small (2K+1)² triangle (equal to the design matrix's). Refused when it is
 * too ill-conditioned to support K harmonics (a trace that covers too little of a beat, or too
 * coarsely). cos kωt, sin kωt come from cos ωt, sin ωt by the angle-addition recurrence.
 */
export function fitTrace(time: readonly number[], values: readonly number[], frequency: number, harmonics: number): { wave: Wave; fit?: FitReport; error?: string } {
  const n = time.length;
  const m = 2 * harmonics + 1;
  const w = 2 * Math.PI * frequency;
  const A = new Float64Array(m * n); // column j at j·n
  for (let i = 0; i < n; i++) {
    const u = w * (time[i] as number);
    const c1 = Math.cos(u), s1 = Math.sin(u);
    let c = c1, s = s1;
    A[i] = 1;
    for (let k = 1; k <= harmonics; k++) {
      A[(2 * k - 1) * n + i] = c;
      A[2 * k * n + i] = s;
      const cn = c * c1 - s * s1;
      s = s * c1 + c * s1;
      c = cn;
    }
  }
  const y = Float64Array.from(values);
  const diag = new Float64Array(m);
  for (let j = 0; j < m && j < n; j++) {
    const cj = j * n;
    let ss = 0;
    for (let i = j; i < n; i++) ss += (A[cj + i] as number) * (A[cj + i] as number);
    const ajj = A[cj + j] as number;
    const alpha = ajj > 0 ? -Math.sqrt(ss) : Math.sqrt(ss);
    diag[j] = alpha;
    const v0 = ajj - alpha;
    const vv = ss - ajj * ajj + v0 * v0; // ‖v‖², v = column j below the diagonal with v_j = a_jj − α
    if (!(vv > 0)) continue;
    A[cj + j] = v0;
    for (let k = j + 1; k <= m; k++) {
      const col = k < m ? A : y, ck = k < m ? k * n : 0;
      let d = 0;
      for (let i = j; i < n; i++) d += (A[cj + i] as number) * (col[ck + i] as number);
      const f = (2 * d) / vv;
      for (let i = j; i < n; i++) col[ck + i] = (col[ck + i] as number) - f * (A[cj + i] as number);
    }
  }
  const R = new Matrix(m, m);
  for (let j = 0; j < m; j++) {
    R.set(j, j, diag[j] as number);
    for (let k = j + 1; k < m; k++) R.set(j, k, A[k * n + j] as number);
  }
  const condition = n >= m && diag.every((d) => d !== 0) ? new SVD(R).condition : Infinity;
  const spanBeats = ((time[n - 1] as number) - (time[0] as number)) * frequency;
  if (!(condition < 1e8)) {
    return {
      wave: sine(0, 0),
      error: `the trace (${n} points over ${spanBeats.toPrecision(3)} beats) cannot support ${harmonics} harmonics at ${frequency} Hz: the fit is singular (condition number ${condition.toPrecision(3)}); use fewer harmonics or a trace that covers a whole beat`,
    };
  }
  const x = new Float64Array(m);
  for (let j = m - 1; j >= 0; j--) {
    let r = y[j] as number;
    for (let k = j + 1; k < m; k++) r -= (A[k * n + j] as number) * (x[k] as number);
    x[j] = r / (diag[j] as number);
  }
  const cos = new Float64Array(harmonics);
  const sin = new Float64Array(harmonics);
  for (let k = 1; k <= harmonics; k++) {
    cos[k - 1] = x[2 * k - 1] as number;
    sin[k - 1] = x[2 * k] as number;
  }
  const wave: SeriesWave = { kind: 'series', mean: x[0] as number, cos, sin };
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const r = (values[i] as number) - evaluateAt(wave, w * (time[i] as number));
    ss += r * r;
  }
  return { wave, fit: { harmonics, points: n, residualRms: Math.sqrt(ss / n), conditionNumber: condition, spanBeats } };
}

/**
 * The beat frequency of a trace from its upward crossings of its mean (Hz), for a hint when the
 * fit at the scenario's frequency is poor: a crossing counts once the trace has been below the
 * mean by a quarter of its half-range (hysteresis against noise), its time interpolated between
 * the samples around it; f = (crossings − 1) / (last − first). Undefined with fewer than three.
 */
export function beatFrequencyOf(time: readonly number[], values: readonly number[]): number | undefined {
  const n = Math.min(time.length, values.length);
  if (n < 8) return undefined;
  let mean = 0, lo = Infinity, hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const x = values[i] as number;
    mean += x;
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  mean /= n;
  const h = (hi - lo) / 8;
  if (!(h > 0)) return undefined;
  let armed = false, first = 0, last = 0, count = 0;
  for (let i = 1; i < n; i++) {
    const x = (values[i] as number) - mean;
    if (x < -h) armed = true;
    else if (armed && x >= 0) {
      const x0 = (values[i - 1] as number) - mean, t0 = time[i - 1] as number, t1 = time[i] as number;
      const tc = x0 < 0 ? t0 + ((t1 - t0) * -x0) / (x - x0) : t1;
      if (count === 0) first = tc;
      last = tc;
      count++;
      armed = false;
    }
  }
  return count >= 3 && last > first ? (count - 1) / (last - first) : undefined;
}

/** s at phase u = ωt (used by the fit's residual and by tests). */
export function evaluateAt(wave: Wave, u: number): number {
  if (wave.kind === 'triangle') return wave.mean + wave.amplitude * triangleShape(wave.rounding, u, 0);
  let s = wave.mean;
  for (let k = 1; k <= wave.cos.length; k++) s += (wave.cos[k - 1] ?? 0) * Math.cos(k * u) + (wave.sin[k - 1] ?? 0) * Math.sin(k * u);
  return s;
}

/**
 * g(u) = asin(K sin u)/asin(K) and its derivatives with respect to u (order 0, 1 or 2):
 * g' = K cos u / (asin K √(1 − K² sin² u)), g'' = −K (1 − K²) sin u / (asin K (1 − K² sin² u)^{3/2}).
 */
export function triangleShape(rounding: number, u: number, order: 0 | 1 | 2): number {
  const k = Math.cos((Math.PI * rounding) / 2);
  const s = Math.sin(u);
  const ak = Math.asin(k);
  if (order === 0) return Math.asin(k * s) / ak;
  const q = 1 - k * k * s * s;
  if (order === 1) return (k * Math.cos(u)) / (ak * Math.sqrt(q));
  return (-k * (1 - k * k) * s) / (ak * q * Math.sqrt(q));
}

/** Buffers for s, ds/dt, d²s/dt² over one beat of n points. */
export interface WaveSamples {
  s: Float64Array;
  v: Float64Array;
  a: Float64Array;
}

/**
 * Sample s, ṡ, s̈ at u_j = 2πj/n, j = 0..n−1 (one beat) into `out`. Series terms use a table of
 * cos/sin(2πm/n) indexed by (k·j mod n), so every sample is exact and nothing is allocated per sample.
 */
export function sampleBeat(wave: Wave, frequency: number, n: number, table: BeatTable, out: WaveSamples): WaveSamples {
  const w = 2 * Math.PI * frequency;
  const { s, v, a } = out;
  if (wave.kind === 'triangle') {
    const amp = wave.amplitude;
    for (let j = 0; j < n; j++) {
      const u = (2 * Math.PI * j) / n;
      s[j] = wave.mean + amp * triangleShape(wave.rounding, u, 0);
      v[j] = amp * w * triangleShape(wave.rounding, u, 1);
      a[j] = amp * w * w * triangleShape(wave.rounding, u, 2);
    }
    return out;
  }
  s.fill(wave.mean, 0, n);
  v.fill(0, 0, n);
  a.fill(0, 0, n);
  const { cos: ct, sin: st } = table;
  for (let k = 1; k <= wave.cos.length; k++) {
    const ak = wave.cos[k - 1] as number;
    const bk = wave.sin[k - 1] as number;
    if (ak === 0 && bk === 0) continue;
    const kw = k * w;
    const kw2 = kw * kw;
    let m = 0;
    for (let j = 0; j < n; j++) {
      const c = ct[m] as number;
      const sn = st[m] as number;
      const x = ak * c + bk * sn;
      s[j] = (s[j] as number) + x;
      v[j] = (v[j] as number) + kw * (bk * c - ak * sn);
      a[j] = (a[j] as number) - kw2 * x;
      m += k;
      if (m >= n) m -= n * Math.floor(m / n);
    }
  }
  return out;
}

/** cos and sin of 2πm/n for m = 0..n−1. */
export interface BeatTable {
  n: number;
  cos: Float64Array;
  sin: Float64Array;
}

const tables = new Map<number, BeatTable>();

/** The (cached, read-only) table for n points per beat. */
export function beatTable(n: number): BeatTable {
  let t = tables.get(n);
  if (!t) {
    const cos = new Float64Array(n);
    const sin = new Float64Array(n);
    for (let m = 0; m < n; m++) {
      cos[m] = Math.cos((2 * Math.PI * m) / n);
      sin[m] = Math.sin((2 * Math.PI * m) / n);
    }
    t = { n, cos, sin };
    if (tables.size > 64) tables.clear();
    tables.set(n, t);
  }
  return t;
}

/** Highest order with content above `rel` of the largest, for aliasing warnings (triangle: estimated). */
export function contentOrder(wave: Wave, rel = 1e-9): number {
  if (wave.kind === 'series') {
    let top = 0;
    let peak = 0;
    for (let k = 1; k <= wave.cos.length; k++) peak = Math.max(peak, Math.hypot(wave.cos[k - 1] ?? 0, wave.sin[k - 1] ?? 0));
    for (let k = 1; k <= wave.cos.length; k++) if (Math.hypot(wave.cos[k - 1] ?? 0, wave.sin[k - 1] ?? 0) > rel * peak) top = k;
    return top;
  }
  // asin(K sin u) has odd harmonics decaying like ρ^k, ρ = (1 − √(1−K²)) / K.
  const k = Math.cos((Math.PI * wave.rounding) / 2);
  const rho = (1 - Math.sqrt(1 - k * k)) / k;
  return rho <= 0 ? 1 : Math.min(LIMITS.pointsPerBeat, Math.ceil(Math.log(rel) / Math.log(rho)));
}
