/**
 * Body-rate profiles of a maneuver (design §3): Ω(t) and Ω̇(t) per body axis, exact derivatives.
 *
 *   constant  Ω = r,                                   Ω̇ = 0
 *   pulse     Ω = (P/2)(1 − cos 2πu), u = (t − t₀)/D ∈ [0, 1], zero outside;
 *             Ω̇ = (πP/D) sin 2πu  (a raised-cosine bell: Ω and Ω̇ are continuous everywhere)
 *   sine      Ω = A sin(2πft + φ),                     Ω̇ = 2πfA cos(2πft + φ)
 *   samples   not-a-knot cubic spline through (tᵢ, Ωᵢ) (de Boor, A Practical Guide to Splines,
 *             ch. IV): Ω is C², so Ω̇ exists and is continuous; fourth-order accurate for a smooth
 *             trace. Two points give a line, three a parabola. Outside the trace the end rate is held
 *             (Ω̇ = 0 there).
 * Terms on one axis add.
 */
import type { AxisProfile, Maneuver, ProfileTerm } from './schema.js';

export interface Spline {
  kind: 'spline';
  t: Float64Array;
  y: Float64Array;
  /** Second derivatives at the knots. */
  m: Float64Array;
}

export type Term = Exclude<ProfileTerm, { kind: 'samples' }> | Spline;

export interface RateProfile {
  /** Terms per body axis in the order roll (x), pitch (y), yaw (z). */
  axes: [Term[], Term[], Term[]];
}

/** Compile a maneuver's profiles (splines are fitted here, once). */
export function rateProfile(m: Pick<Maneuver, 'roll' | 'pitch' | 'yaw'>): RateProfile {
  const axis = (p: AxisProfile | undefined): Term[] => (p ?? []).map((t) => (t.kind === 'samples' ? spline(t.time, t.rate) : t));
  return { axes: [axis(m.roll), axis(m.pitch), axis(m.yaw)] };
}

/**
 * The not-a-knot cubic spline through (t, y): second derivatives M from
 *   h_{i−1} M_{i−1} + 2(h_{i−1} + h_i) M_i + h_i M_{i+1} = 6(d_i − d_{i−1}),  i = 1..n−2,
 * with a continuous third derivative at t₁ and t_{n−2}; M₀ and M_{n−1} are eliminated so that the
 * system is tridiagonal (Thomas algorithm).
 */
export function spline(time: readonly number[], values: readonly number[]): Spline {
  const n = time.length;
  const t = Float64Array.from(time);
  const y = Float64Array.from(values);
  const m = new Float64Array(n);
  if (n === 3) {
    const h0 = (t[1] as number) - (t[0] as number), h1 = (t[2] as number) - (t[1] as number);
    const d0 = ((y[1] as number) - (y[0] as number)) / h0, d1 = ((y[2] as number) - (y[1] as number)) / h1;
    m.fill((2 * (d1 - d0)) / (h0 + h1));
  }
  if (n < 4) return { kind: 'spline', t, y, m };
  const h = new Float64Array(n - 1);
  const d = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) {
    h[i] = (t[i + 1] as number) - (t[i] as number);
    d[i] = ((y[i + 1] as number) - (y[i] as number)) / (h[i] as number);
  }
  // Unknowns M_1..M_{n−2}: sub-diagonal a, diagonal b, super-diagonal c, right side r.
  const k = n - 2;
  const a = new Float64Array(k), b = new Float64Array(k), c = new Float64Array(k), r = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    const i = j + 1;
    const hl = h[i - 1] as number, hr = h[i] as number;
    a[j] = hl;
    b[j] = 2 * (hl + hr);
    c[j] = hr;
    r[j] = 6 * ((d[i] as number) - (d[i - 1] as number));
  }
  const h0 = h[0] as number, h1 = h[1] as number;
  const hz = h[n - 2] as number, hy = h[n - 3] as number;
  // M_0 = ((h0 + h1) M_1 − h0 M_2) / h1 into the first row; likewise M_{n−1} into the last.
  b[0] = (b[0] as number) + (h0 * (h0 + h1)) / h1;
  c[0] = (c[0] as number) - (h0 * h0) / h1;
  b[k - 1] = (b[k - 1] as number) + (hz * (hy + hz)) / hy;
  a[k - 1] = (a[k - 1] as number) - (hz * hz) / hy;
  for (let j = 1; j < k; j++) {
    const w = (a[j] as number) / (b[j - 1] as number);
    b[j] = (b[j] as number) - w * (c[j - 1] as number);
    r[j] = (r[j] as number) - w * (r[j - 1] as number);
  }
  m[k] = (r[k - 1] as number) / (b[k - 1] as number);
  for (let j = k - 2; j >= 0; j--) m[j + 1] = ((r[j] as number) - (c[j] as number) * (m[j + 2] as number)) / (b[j] as number);
  m[0] = ((h0 + h1) * (m[1] as number) - h0 * (m[2] as number)) / h1;
  m[n - 1] = ((hy + hz) * (m[n - 2] as number) - hz * (m[n - 3] as number)) / hy;
  return { kind: 'spline', t, y, m };
}

/** Index i with t_i ≤ x < t_{i+1}, searched forward from `from` (a cursor for increasing x). */
function interval(t: Float64Array, x: number, from: number): number {
  let i = from;
  const last = t.length - 2;
  if (i > last || x < (t[i] as number)) i = 0;
  while (i < last && x >= (t[i + 1] as number)) i++; // x = t_{n−1} stays in the last interval
  return i;
}

/**
 * Add one spline's Ω and Ω̇ at x into out[0], out[1]; returns the interval (the next cursor).
 * With A = (t_{i+1} − x)/h, B = (x − t_i)/h:
 *   y = A y_i + B y_{i+1} + ((A³ − A) M_i + (B³ − B) M_{i+1}) h²/6,
 *   y' = d_i − (3A² − 1) h M_i / 6 + (3B² − 1) h M_{i+1} / 6.
 */
function splineAt(s: Spline, x: number, cursor: number, out: Float64Array): number {
  const { t, y, m } = s;
  const n = t.length;
  if (x < (t[0] as number)) {
    out[0] = (out[0] as number) + (y[0] as number);
    return 0;
  }
  if (x > (t[n - 1] as number)) {
    out[0] = (out[0] as number) + (y[n - 1] as number);
    return n - 2;
  }
  const i = interval(t, x, cursor);
  const ti = t[i] as number, h = (t[i + 1] as number) - ti;
  const A = ((t[i + 1] as number) - x) / h, B = (x - ti) / h;
  const mi = m[i] as number, mj = m[i + 1] as number, yi = y[i] as number, yj = y[i + 1] as number;
  out[0] = (out[0] as number) + A * yi + B * yj + (((A * A * A - A) * mi + (B * B * B - B) * mj) * h * h) / 6;
  out[1] = (out[1] as number) + (yj - yi) / h + ((-(3 * A * A - 1) * mi + (3 * B * B - 1) * mj) * h) / 6;
  return i;
}

/** Add one analytic term's Ω and Ω̇ at t into out[0], out[1]. */
function termAt(term: Exclude<Term, Spline>, t: number, out: Float64Array): void {
  switch (term.kind) {
    case 'constant':
      out[0] = (out[0] as number) + term.rate;
      return;
    case 'pulse': {
      const u = (t - term.start) / term.duration;
      if (u <= 0 || u >= 1) return;
      const x = 2 * Math.PI * u;
      out[0] = (out[0] as number) + 0.5 * term.peak * (1 - Math.cos(x));
      out[1] = (out[1] as number) + ((Math.PI * term.peak) / term.duration) * Math.sin(x);
      return;
    }
    case 'sine': {
      const w = 2 * Math.PI * term.frequency;
      const x = w * t + term.phase;
      out[0] = (out[0] as number) + term.amplitude * Math.sin(x);
      out[1] = (out[1] as number) + w * term.amplitude * Math.cos(x);
    }
  }
}

const scratch = new Float64Array(2);

/** Ω and Ω̇ of one axis at time t (rad/s, rad/s²). */
export function axisAt(terms: readonly Term[], t: number): { rate: number; acceleration: number } {
  scratch[0] = 0;
  scratch[1] = 0;
  for (const term of terms) {
    if (term.kind === 'spline') splineAt(term, t, 0, scratch);
    else termAt(term, t, scratch);
  }
  return { rate: scratch[0] as number, acceleration: scratch[1] as number };
}

/**
 * Sample one axis on the grid t_j = t0 + j·dt, j = 0..count−1: Ω into `rate`, Ω̇ into
 * `acceleration` (overwritten). No allocation; splines walk their knots with a cursor.
 */
export function sampleAxis(terms: readonly Term[], dt: number, count: number, rate: Float64Array, acceleration: Float64Array, t0 = 0): void {
  rate.fill(0, 0, count);
  acceleration.fill(0, 0, count);
  for (const term of terms) {
    let cursor = 0;
    for (let j = 0; j < count; j++) {
      scratch[0] = 0;
      scratch[1] = 0;
      const t = t0 + j * dt;
      if (term.kind === 'spline') cursor = splineAt(term, t, cursor, scratch);
      else termAt(term, t, scratch);
      rate[j] = (rate[j] as number) + (scratch[0] as number);
      acceleration[j] = (acceleration[j] as number) + (scratch[1] as number);
    }
  }
}

/** Time span [first, last] of the sampled traces on an axis, for the coverage warning. */
export function traceSpans(terms: readonly Term[]): [number, number][] {
  return terms.filter((t): t is Spline => t.kind === 'spline').map((s) => [s.t[0] as number, s.t[s.t.length - 1] as number]);
}
