/**
 * Harmonic lines without sampling, for a constant body motion (design §4, "closed forms"):
 *
 * Rotary organ, sine stroke φ = φ̄ + Φ sin(ωt + δ), no deviation. By the Jacobi–Anger expansion
 * (Abramowitz & Stegun 9.1.42–43)
 *   cos(Φ sin u) = J_0(Φ) + 2 Σ_{k even} J_k(Φ) cos ku,   sin(Φ sin u) = 2 Σ_{k odd} J_k(Φ) sin ku,
 * and every load is a sum of terms  g(u) τ(u) W  with a constant body vector W, a time factor
 * g ∈ {1, φ̇, φ̈, φ̇²} (a few sinusoids in u) and τ ∈ {1, cos φ, sin φ}; the organ-frame projections
 * add τ·cos φ and τ·sin φ, written with cos 2φ and sin 2φ (J_k(2Φ)). Multiplying by cos u or sin u
 * shifts orders by one, so the lines up to K are exact with the Bessel series carried to K + 2.
 *
 * Linear organ, any harmonic-series stroke: every load is linear in x, ẋ, ẍ, so its lines are the
 * stroke's own coefficients times constant vectors.
 */
import { besselJ } from './bessel.js';
import { N_AXES, TOTAL } from './components.js';
import type { HarmonicTable } from './harmonics.js';
import type { Geometry, Motion } from './model.js';
import { cross, dot, scale, type Vec3 } from './vec.js';
import type { SeriesWave } from './waveform.js';

/** True when the closed form covers this organ (constant motion is the caller's business). */
export function closedFormApplies(g: Geometry): boolean {
  if (g.stroke.kind !== 'series') return false;
  if (g.drive === 'linear') return true;
  if (g.deviation) return false;
  for (let k = 2; k <= g.stroke.cos.length; k++) if (g.stroke.cos[k - 1] !== 0 || g.stroke.sin[k - 1] !== 0) return false;
  return true;
}

/**
 * Series live in one reusable buffer (the core is synchronous, so one workspace serves every
 * call): slot i holds P_0..P_{L−1} then Q_0..Q_{L−1} of Σ P_k cos ku + Q_k sin ku.
 */
interface Workspace { L: number; buf: Float64Array; ready: Uint8Array; J: Float64Array; J2: Float64Array }
const SLOTS = 26; // 24 products g·τ, one temporary, one spare
let ws: Workspace | undefined;
function workspace(L: number): Workspace {
  if (!ws || ws.L !== L) ws = { L, buf: new Float64Array(SLOTS * 2 * L), ready: new Uint8Array(SLOTS), J: new Float64Array(L + 1), J2: new Float64Array(L + 1) };
  return ws;
}

/** dst = s · cos u · src (orders shift by ±1; the top order is truncated). */
function mulCos(b: Float64Array, L: number, src: number, dst: number, s: number): void {
  const P = src, Q = src + L, RP = dst, RQ = dst + L;
  for (let k = 0; k < L; k++) {
    const pm = k >= 1 ? (b[P + k - 1] as number) : 0, pp = k + 1 < L ? (b[P + k + 1] as number) : 0;
    const qm = k >= 1 ? (b[Q + k - 1] as number) : 0, qp = k + 1 < L ? (b[Q + k + 1] as number) : 0;
    b[RP + k] = s * (k === 0 ? pp / 2 : k === 1 ? (b[P] as number) + pp / 2 : (pm + pp) / 2);
    b[RQ + k] = s * (k === 0 ? 0 : k === 1 ? qp / 2 : (qm + qp) / 2);
  }
}

/** dst = s · sin u · src. */
function mulSin(b: Float64Array, L: number, src: number, dst: number, s: number): void {
  const P = src, Q = src + L, RP = dst, RQ = dst + L;
  for (let k = 0; k < L; k++) {
    const pm = k >= 1 ? (b[P + k - 1] as number) : 0, pp = k + 1 < L ? (b[P + k + 1] as number) : 0;
    const qm = k >= 1 ? (b[Q + k - 1] as number) : 0, qp = k + 1 < L ? (b[Q + k + 1] as number) : 0;
    b[RP + k] = s * (k === 0 ? (L > 1 ? (b[Q + 1] as number) : 0) / 2 : k === 1 ? qp / 2 : (qp - qm) / 2);
    b[RQ + k] = s * (k === 0 ? 0 : k === 1 ? (b[P] as number) - pp / 2 : (pm - pp) / 2);
  }
}

const G_ONE = 0, G_RATE = 1, G_ACC = 2, G_RATE2 = 3;
const T_ONE = 0, T_C = 1, T_S = 2, T_CC = 3, T_CS = 4, T_SS = 5;
const TIMES_C = [T_C, T_CC, T_CS] as const; // τ·cos φ for τ = 1, C, S
const TIMES_S = [T_S, T_CS, T_SS] as const; // τ·sin φ

interface Term { g: number; tau: 0 | 1 | 2; w: Vec3 }

/** −Ω×(Ω×v) = v|Ω|² − Ω(Ω·v). */
const centrifugal = (w: Vec3, v: Vec3): Vec3 => {
  const w2 = dot(w, w), wv = dot(w, v);
  return [v[0] * w2 - w[0] * wv, v[1] * w2 - w[1] * wv, v[2] * w2 - w[2] * wv];
};

/** Terms g·τ·W of each component (index as in COMPONENTS; total omitted). */
function rotaryTerms(M: number, mu: number, h: Vec3, a0: Vec3, t0: Vec3, m: Motion): Term[][] {
  const W = m.omega, Wd = m.omegaDot, Mh = scale(h, M);
  return [
    [{ g: G_ACC, tau: 2, w: scale(a0, mu) }, { g: G_ACC, tau: 1, w: scale(t0, -mu) }, { g: G_RATE2, tau: 1, w: scale(a0, mu) }, { g: G_RATE2, tau: 2, w: scale(t0, mu) }],
    [{ g: G_ONE, tau: 0, w: centrifugal(W, Mh) }, { g: G_ONE, tau: 1, w: scale(centrifugal(W, a0), mu) }, { g: G_ONE, tau: 2, w: scale(centrifugal(W, t0), mu) }],
    [{ g: G_ONE, tau: 0, w: scale(cross(Wd, Mh), -1) }, { g: G_ONE, tau: 1, w: scale(cross(Wd, a0), -mu) }, { g: G_ONE, tau: 2, w: scale(cross(Wd, t0), -mu) }],
    [{ g: G_RATE, tau: 2, w: scale(cross(W, a0), 2 * mu) }, { g: G_RATE, tau: 1, w: scale(cross(W, t0), -2 * mu) }],
    [{ g: G_ONE, tau: 0, w: scale(m.accel, -M) }],
    [{ g: G_ONE, tau: 0, w: scale(m.gravity, M) }],
  ];
}

function addScaled(pq: Float64Array, at: number, orders: number, b: Float64Array, L: number, slot: number, s: number): void {
  if (s === 0) return;
  for (let k = 0; k < orders; k++) {
    pq[at + 2 * k] = (pq[at + 2 * k] as number) + s * (b[slot + k] as number);
    pq[at + 2 * k + 1] = (pq[at + 2 * k + 1] as number) + s * (b[slot + L + k] as number);
  }
}

/** Shift every line by a time advance δ/ω: f(u) = f₀(u + δ). */
function advance(pq: Float64Array, orders: number, delta: number): void {
  if (delta === 0) return;
  for (let base = 0; base < pq.length; base += 2 * orders) {
    for (let k = 1; k < orders; k++) {
      const c = Math.cos(k * delta), s = Math.sin(k * delta);
      const p = pq[base + 2 * k] as number, q = pq[base + 2 * k + 1] as number;
      pq[base + 2 * k] = p * c + q * s;
      pq[base + 2 * k + 1] = -p * s + q * c;
    }
  }
}

function sumTotal(pq: Float64Array, orders: number): void {
  const tot = TOTAL * N_AXES * orders * 2;
  pq.fill(0, tot, tot + N_AXES * orders * 2);
  for (let c = 0; c < TOTAL; c++) {
    const at = c * N_AXES * orders * 2;
    for (let i = 0; i < N_AXES * orders * 2; i++) pq[tot + i] = (pq[tot + i] as number) + (pq[at + i] as number);
  }
}

/** Lines of every component and axis, orders 0..K, into `out` (allocHarmonics(K)). */
export function closedFormHarmonics(g: Geometry, m: Motion, out: HarmonicTable): HarmonicTable {
  return g.drive === 'rotary' ? rotary(g, m, out) : linear(g, m, out);
}

function rotary(g: Geometry, m: Motion, out: HarmonicTable): HarmonicTable {
  const wave = g.stroke as SeriesWave;
  const K1 = out.orders;
  const L = K1 + 2;
  const a1 = wave.cos[0] ?? 0, b1 = wave.sin[0] ?? 0;
  const amp = Math.hypot(a1, b1);
  const delta = Math.atan2(a1, b1);
  const w = 2 * Math.PI * g.frequency;
  const cm = Math.cos(wave.mean), sm = Math.sin(wave.mean);
  const a0: Vec3 = [cm * g.e1[0] + sm * g.e2[0], cm * g.e1[1] + sm * g.e2[1], cm * g.e1[2] + sm * g.e2[2]];
  const t0: Vec3 = [cm * g.e2[0] - sm * g.e1[0], cm * g.e2[1] - sm * g.e1[1], cm * g.e2[2] - sm * g.e1[2]];
  const n = g.e3;

  const W = workspace(L);
  const b = W.buf;
  b.fill(0);
  W.ready.fill(0);
  const J = besselJ(amp, L, W.J), J2 = besselJ(2 * amp, L, W.J2);
  const slot = (i: number) => i * 2 * L;
  b[slot(T_ONE)] = 1;
  for (let k = 0; k < L; k++) {
    const jk = J[k] as number, j2k = J2[k] as number;
    if (k % 2 === 0) {
      b[slot(T_C) + k] = k === 0 ? jk : 2 * jk; // cos φ
      const c2 = k === 0 ? j2k : 2 * j2k; // cos 2φ
      b[slot(T_CC) + k] = (k === 0 ? 0.5 : 0) + c2 / 2;
      b[slot(T_SS) + k] = (k === 0 ? 0.5 : 0) - c2 / 2;
    } else {
      b[slot(T_S) + L + k] = 2 * jk; // sin φ
      b[slot(T_CS) + L + k] = j2k; // sin 2φ / 2
    }
  }
  for (let t = 0; t < 6; t++) W.ready[t] = 1;
  const TMP = 24;
  /** Offset of the series g·τ, computed on first use. */
  const series = (gi: number, ti: number): number => {
    const key = gi * 6 + ti;
    if (W.ready[key] === 0) {
      if (gi === G_RATE) mulCos(b, L, slot(ti), slot(key), amp * w);
      else if (gi === G_ACC) mulSin(b, L, slot(ti), slot(key), -amp * w * w);
      else {
        mulCos(b, L, slot(ti), slot(TMP), 1);
        mulCos(b, L, slot(TMP), slot(key), amp * amp * w * w);
      }
      W.ready[key] = 1;
    }
    return slot(key);
  };

  const pq = out.pq;
  pq.fill(0);
  const terms = rotaryTerms(g.mass, g.moment, g.hinge, a0, t0, m);
  for (let c = 0; c < TOTAL; c++) {
    const at = c * N_AXES * K1 * 2;
    const step = K1 * 2;
    for (const term of terms[c] as Term[]) {
      const V = term.w;
      if (V[0] === 0 && V[1] === 0 && V[2] === 0) continue;
      const base = series(term.g, term.tau);
      addScaled(pq, at, K1, b, L, base, V[0]);
      addScaled(pq, at + step, K1, b, L, base, V[1]);
      addScaled(pq, at + 2 * step, K1, b, L, base, V[2]);
      const wa = dot(V, a0), wt = dot(V, t0);
      const sc = series(term.g, TIMES_C[term.tau]), ss = series(term.g, TIMES_S[term.tau]);
      addScaled(pq, at + 3 * step, K1, b, L, sc, wa);
      addScaled(pq, at + 3 * step, K1, b, L, ss, wt);
      addScaled(pq, at + 4 * step, K1, b, L, ss, -wa);
      addScaled(pq, at + 4 * step, K1, b, L, sc, wt);
      addScaled(pq, at + 5 * step, K1, b, L, base, dot(V, n));
    }
  }
  advance(pq, K1, delta);
  sumTotal(pq, K1);
  return out;
}

function linear(g: Geometry, m: Motion, out: HarmonicTable): HarmonicTable {
  const wave = g.stroke as SeriesWave;
  const K1 = out.orders;
  const L = K1;
  const W = workspace(L);
  const b = W.buf;
  b.fill(0);
  const w = 2 * Math.PI * g.frequency;
  const ONE = 0, X = 2 * L, XD = 4 * L, XDD = 6 * L; // slots of 1, x, ẋ, ẍ
  b[ONE] = 1;
  b[X] = wave.mean;
  for (let k = 1; k < K1 && k <= wave.cos.length; k++) {
    const a = wave.cos[k - 1] as number, c = wave.sin[k - 1] as number, kw = k * w;
    b[X + k] = a; b[X + L + k] = c;
    b[XD + k] = kw * c; b[XD + L + k] = -kw * a;
    b[XDD + k] = -kw * kw * a; b[XDD + L + k] = -kw * kw * c;
  }
  const M = g.mass, d = g.e1, Om = m.omega, Wd = m.omegaDot, Mh = scale(g.hinge, M);
  const terms: [number, Vec3][][] = [
    [[XDD, scale(d, -M)]],
    [[ONE, centrifugal(Om, Mh)], [X, scale(centrifugal(Om, d), M)]],
    [[ONE, scale(cross(Wd, Mh), -1)], [X, scale(cross(Wd, d), -M)]],
    [[XD, scale(cross(Om, d), -2 * M)]],
    [[ONE, scale(m.accel, -M)]],
    [[ONE, scale(m.gravity, M)]],
  ];
  const pq = out.pq;
  pq.fill(0);
  const axes = [g.e1, g.e2, g.e3];
  const step = K1 * 2;
  for (let c = 0; c < TOTAL; c++) {
    const at = c * N_AXES * step;
    for (const [f, V] of terms[c] as [number, Vec3][]) {
      for (let i = 0; i < 3; i++) addScaled(pq, at + i * step, K1, b, L, f, V[i] as number);
      for (let i = 0; i < 3; i++) addScaled(pq, at + (3 + i) * step, K1, b, L, f, dot(V, axes[i] as Vec3));
    }
  }
  sumTotal(pq, K1);
  return out;
}
