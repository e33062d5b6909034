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
import type { Vec3 } from './vec.js';
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
interface Workspace { L: number; buf: Float64Array; ready: Uint8Array; J: Float64Array; J2: Float64Array; cs: Float64Array; terms: Float64Array }
const SLOTS = 26; // 24 products g·τ, one temporary, one spare
let ws: Workspace | undefined;
function workspace(L: number): Workspace {
  if (!ws || ws.L !== L) ws = { L, buf: new Float64Array(SLOTS * 2 * L), ready: new Uint8Array(SLOTS), J: new Float64Array(L + 1), J2: new Float64Array(L + 1), cs: new Float64Array(2 * L), terms: new Float64Array(3 * N_TERMS) };
  return ws;
}

/**
 * dst = s · cos u · src (orders shift by ±1; the top order is truncated). With P_L = Q_L = 0 and
 * Q_0 = 0: R_0 = P_1/2, R_1 = P_0 + P_2/2, R_k = (P_{k−1} + P_{k+1})/2; Q'_0 = 0, Q'_1 = Q_2/2,
 * Q'_k = (Q_{k−1} + Q_{k+1})/2. The ends are written outside the loop (L ≥ 3 here: K + 2 orders).
 */
function mulCos(b: Float64Array, L: number, src: number, dst: number, s: number): void {
  const P = src, Q = src + L, RP = dst, RQ = dst + L;
  b[RP] = s * ((b[P + 1] as number) / 2);
  b[RQ] = 0;
  b[RP + 1] = s * ((b[P] as number) + (b[P + 2] as number) / 2);
  b[RQ + 1] = s * ((b[Q + 2] as number) / 2);
  for (let k = 2; k < L - 1; k++) {
    b[RP + k] = s * (((b[P + k - 1] as number) + (b[P + k + 1] as number)) / 2);
    b[RQ + k] = s * (((b[Q + k - 1] as number) + (b[Q + k + 1] as number)) / 2);
  }
  b[RP + L - 1] = s * (((b[P + L - 2] as number) + 0) / 2);
  b[RQ + L - 1] = s * (((b[Q + L - 2] as number) + 0) / 2);
}

/**
 * dst = s · sin u · src: R_0 = Q_1/2, R_1 = Q_2/2, R_k = (Q_{k+1} − Q_{k−1})/2; Q'_0 = 0,
 * Q'_1 = P_0 − P_2/2, Q'_k = (P_{k−1} − P_{k+1})/2 (same ends as mulCos).
 */
function mulSin(b: Float64Array, L: number, src: number, dst: number, s: number): void {
  const P = src, Q = src + L, RP = dst, RQ = dst + L;
  b[RP] = s * ((b[Q + 1] as number) / 2);
  b[RQ] = 0;
  b[RP + 1] = s * ((b[Q + 2] as number) / 2);
  b[RQ + 1] = s * ((b[P] as number) - (b[P + 2] as number) / 2);
  for (let k = 2; k < L - 1; k++) {
    b[RP + k] = s * (((b[Q + k + 1] as number) - (b[Q + k - 1] as number)) / 2);
    b[RQ + k] = s * (((b[P + k - 1] as number) - (b[P + k + 1] as number)) / 2);
  }
  b[RP + L - 1] = s * ((0 - (b[Q + L - 2] as number)) / 2);
  b[RQ + L - 1] = s * (((b[P + L - 2] as number) - 0) / 2);
}

const G_ONE = 0, G_RATE = 1, G_ACC = 2, G_RATE2 = 3;
const T_ONE = 0, T_C = 1, T_S = 2, T_CC = 3, T_CS = 4, T_SS = 5;
const TIMES_C = [T_C, T_CC, T_CS] as const; // τ·cos φ for τ = 1, C, S
const TIMES_S = [T_S, T_CS, T_SS] as const; // τ·sin φ

/**
 * The g·τ·W terms of each component (design §4 with Σm r = M h + μ e_r, e_r = cos φ a0 + sin φ t0):
 *   primary        −μ ë_r = μ (φ̈ (sin φ a0 − cos φ t0) + φ̇² (cos φ a0 + sin φ t0))
 *   centrifugal    −Ω×(Ω×(M h + μ e_r)),   angularAcceleration −Ω̇×(M h + μ e_r)
 *   coriolis       −2 Ω×(μ φ̇ e_t) = 2μ φ̇ (sin φ Ω×a0 − cos φ Ω×t0)
 *   translational  −M a,   gravity M g
 * Term i belongs to component TERM_C[i] with time factor TERM_G[i] and τ = TERM_TAU[i]; its body
 * vector W goes to w[3i..3i+2] (a fixed scratch: nothing is allocated per call).
 */
const TERM_C = [0, 0, 0, 0, 1, 1, 1, 2, 2, 2, 3, 3, 4, 5] as const;
const TERM_G = [G_ACC, G_ACC, G_RATE2, G_RATE2, G_ONE, G_ONE, G_ONE, G_ONE, G_ONE, G_ONE, G_RATE, G_RATE, G_ONE, G_ONE] as const;
const TERM_TAU = [2, 1, 1, 2, 0, 1, 2, 0, 1, 2, 2, 1, 0, 0] as const;
const N_TERMS = TERM_C.length;

/** −Ω×(Ω×v)·s = (v|Ω|² − Ω(Ω·v))·s into w at i. */
function centrifugalInto(w: Float64Array, i: number, W: Vec3, v0: number, v1: number, v2: number, s: number): void {
  const w2 = W[0] * W[0] + W[1] * W[1] + W[2] * W[2], wv = W[0] * v0 + W[1] * v1 + W[2] * v2;
  w[i] = (v0 * w2 - W[0] * wv) * s;
  w[i + 1] = (v1 * w2 - W[1] * wv) * s;
  w[i + 2] = (v2 * w2 - W[2] * wv) * s;
}

/** (A × v)·s into w at i. */
function crossInto(w: Float64Array, i: number, A: Vec3, v0: number, v1: number, v2: number, s: number): void {
  w[i] = (A[1] * v2 - A[2] * v1) * s;
  w[i + 1] = (A[2] * v0 - A[0] * v2) * s;
  w[i + 2] = (A[0] * v1 - A[1] * v0) * s;
}

function rotaryTerms(w: Float64Array, M: number, mu: number, h: Vec3, a0x: number, a0y: number, a0z: number, t0x: number, t0y: number, t0z: number, m: Motion): void {
  const W = m.omega, Wd = m.omegaDot, A = m.accel, G = m.gravity;
  const h0 = h[0] * M, h1 = h[1] * M, h2 = h[2] * M;
  w[0] = a0x * mu; w[1] = a0y * mu; w[2] = a0z * mu;
  w[3] = -t0x * mu; w[4] = -t0y * mu; w[5] = -t0z * mu;
  w[6] = a0x * mu; w[7] = a0y * mu; w[8] = a0z * mu;
  w[9] = t0x * mu; w[10] = t0y * mu; w[11] = t0z * mu;
  centrifugalInto(w, 12, W, h0, h1, h2, 1);
  centrifugalInto(w, 15, W, a0x, a0y, a0z, mu);
  centrifugalInto(w, 18, W, t0x, t0y, t0z, mu);
  crossInto(w, 21, Wd, h0, h1, h2, -1);
  crossInto(w, 24, Wd, a0x, a0y, a0z, -mu);
  crossInto(w, 27, Wd, t0x, t0y, t0z, -mu);
  crossInto(w, 30, W, a0x, a0y, a0z, 2 * mu);
  crossInto(w, 33, W, t0x, t0y, t0z, -2 * mu);
  w[36] = A[0] * -M; w[37] = A[1] * -M; w[38] = A[2] * -M;
  w[39] = G[0] * M; w[40] = G[1] * M; w[41] = G[2] * M;
}

/**
 * Add one term's lines to a component's six axes: body axes W·(g τ), radial (W·a0)(g τ cos φ) +
 * (W·t0)(g τ sin φ), tangential −(W·a0)(g τ sin φ) + (W·t0)(g τ cos φ), normal (W·n)(g τ).
 * `base`, `sc`, `ss` are the slots of g τ, g τ cos φ and g τ sin φ; a zero weight adds nothing.
 */
function addTerm(pq: Float64Array, at: number, K1: number, b: Float64Array, L: number, base: number, sc: number, ss: number, V0: number, V1: number, V2: number, wa: number, wt: number, wn: number): void {
  const step = 2 * K1;
  for (let k = 0; k < K1; k++) {
    const bp = b[base + k] as number, bq = b[base + L + k] as number;
    const cp = b[sc + k] as number, cq = b[sc + L + k] as number;
    const sp = b[ss + k] as number, sq = b[ss + L + k] as number;
    let o = at + 2 * k;
    if (V0 !== 0) { pq[o] = (pq[o] as number) + V0 * bp; pq[o + 1] = (pq[o + 1] as number) + V0 * bq; }
    o += step;
    if (V1 !== 0) { pq[o] = (pq[o] as number) + V1 * bp; pq[o + 1] = (pq[o + 1] as number) + V1 * bq; }
    o += step;
    if (V2 !== 0) { pq[o] = (pq[o] as number) + V2 * bp; pq[o + 1] = (pq[o + 1] as number) + V2 * bq; }
    o += step;
    if (wa !== 0) { pq[o] = (pq[o] as number) + wa * cp; pq[o + 1] = (pq[o + 1] as number) + wa * cq; }
    if (wt !== 0) { pq[o] = (pq[o] as number) + wt * sp; pq[o + 1] = (pq[o + 1] as number) + wt * sq; }
    o += step;
    if (wa !== 0) { pq[o] = (pq[o] as number) + -wa * sp; pq[o + 1] = (pq[o + 1] as number) + -wa * sq; }
    if (wt !== 0) { pq[o] = (pq[o] as number) + wt * cp; pq[o + 1] = (pq[o + 1] as number) + wt * cq; }
    o += step;
    if (wn !== 0) { pq[o] = (pq[o] as number) + wn * bp; pq[o + 1] = (pq[o + 1] as number) + wn * bq; }
  }
}

function addScaled(pq: Float64Array, at: number, orders: number, b: Float64Array, L: number, slot: number, s: number): void {
  if (s === 0) return;
  for (let k = 0; k < orders; k++) {
    pq[at + 2 * k] = (pq[at + 2 * k] as number) + s * (b[slot + k] as number);
    pq[at + 2 * k + 1] = (pq[at + 2 * k + 1] as number) + s * (b[slot + L + k] as number);
  }
}

/**
 * Shift the lines of the components flagged in `touched` by a time advance δ/ω: f(u) = f₀(u + δ)
 * (the others are zero; the total is summed afterwards). `cs` holds cos kδ, sin kδ (scratch).
 */
function advance(pq: Float64Array, orders: number, delta: number, cs: Float64Array, touched: number): void {
  if (delta === 0) return;
  for (let k = 1; k < orders; k++) {
    cs[2 * k] = Math.cos(k * delta);
    cs[2 * k + 1] = Math.sin(k * delta);
  }
  const span = N_AXES * orders * 2;
  for (let c = 0; c < TOTAL; c++) {
    if ((touched & (1 << c)) === 0) continue;
    for (let base = c * span; base < (c + 1) * span; base += 2 * orders) {
      for (let k = 1; k < orders; k++) {
        const co = cs[2 * k] as number, si = cs[2 * k + 1] as number;
        const p = pq[base + 2 * k] as number, q = pq[base + 2 * k + 1] as number;
        pq[base + 2 * k] = p * co + q * si;
        pq[base + 2 * k + 1] = -p * si + q * co;
      }
    }
  }
}

/** The total's lines: the sum of the components' (those flagged in `touched`; the others are zero). */
function sumTotal(pq: Float64Array, orders: number, touched = 0x3f): void {
  const span = N_AXES * orders * 2;
  const tot = TOTAL * span;
  let first = -1;
  for (let c = 0; c < TOTAL; c++) {
    if ((touched & (1 << c)) === 0) continue;
    const at = c * span;
    if (first < 0) {
      pq.copyWithin(tot, at, at + span);
      first = c;
    } else for (let i = 0; i < span; i++) pq[tot + i] = (pq[tot + i] as number) + (pq[at + i] as number);
  }
  if (first < 0) pq.fill(0, tot, tot + span);
}

const TMP = 24;
const slotOf = (L: number, i: number): number => i * 2 * L;

/** Offset of the series g·τ in the workspace, computed on first use from the τ series. */
function seriesSlot(W: Workspace, gi: number, ti: number, amp: number, w: number): number {
  const L = W.L, b = W.buf, key = gi * 6 + ti;
  if (W.ready[key] === 0) {
    if (gi === G_RATE) mulCos(b, L, slotOf(L, ti), slotOf(L, key), amp * w);
    else if (gi === G_ACC) mulSin(b, L, slotOf(L, ti), slotOf(L, key), -amp * w * w);
    else {
      mulCos(b, L, slotOf(L, ti), slotOf(L, TMP), 1);
      mulCos(b, L, slotOf(L, TMP), slotOf(L, key), amp * amp * w * w);
    }
    W.ready[key] = 1;
  }
  return slotOf(L, key);
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
  const w0 = 2 * Math.PI * g.frequency;
  const cm = Math.cos(wave.mean), sm = Math.sin(wave.mean);
  const e1 = g.e1, e2 = g.e2, n = g.e3;
  // a0 = e1 cos φ̄ + e2 sin φ̄, t0 = e2 cos φ̄ − e1 sin φ̄ (scalars: no allocation per call)
  const a0x = cm * e1[0] + sm * e2[0], a0y = cm * e1[1] + sm * e2[1], a0z = cm * e1[2] + sm * e2[2];
  const t0x = cm * e2[0] - sm * e1[0], t0y = cm * e2[1] - sm * e1[1], t0z = cm * e2[2] - sm * e1[2];

  const W = workspace(L);
  const b = W.buf;
  b.fill(0, 0, 6 * 2 * L); // the six τ series; every product series is written whole when first used
  W.ready.fill(0);
  const J = besselJ(amp, L, W.J), J2 = besselJ(2 * amp, L, W.J2);
  const sC = slotOf(L, T_C), sCC = slotOf(L, T_CC), sSS = slotOf(L, T_SS), sS = slotOf(L, T_S), sCS = slotOf(L, T_CS);
  b[slotOf(L, T_ONE)] = 1;
  for (let k = 0; k < L; k++) {
    const jk = J[k] as number, j2k = J2[k] as number;
    if (k % 2 === 0) {
      b[sC + k] = k === 0 ? jk : 2 * jk; // cos φ
      const c2 = k === 0 ? j2k : 2 * j2k; // cos 2φ
      b[sCC + k] = (k === 0 ? 0.5 : 0) + c2 / 2;
      b[sSS + k] = (k === 0 ? 0.5 : 0) - c2 / 2;
    } else {
      b[sS + L + k] = 2 * jk; // sin φ
      b[sCS + L + k] = j2k; // sin 2φ / 2
    }
  }
  for (let t = 0; t < 6; t++) W.ready[t] = 1;
  const pq = out.pq;
  pq.fill(0);
  const w = W.terms;
  rotaryTerms(w, g.mass, g.moment, g.hinge, a0x, a0y, a0z, t0x, t0y, t0z, m);
  const step = K1 * 2;
  let touched = 0;
  for (let i = 0; i < N_TERMS; i++) {
    const V0 = w[3 * i] as number, V1 = w[3 * i + 1] as number, V2 = w[3 * i + 2] as number;
    if (V0 === 0 && V1 === 0 && V2 === 0) continue;
    touched |= 1 << (TERM_C[i] as number);
    const gi = TERM_G[i] as number, tau = TERM_TAU[i] as 0 | 1 | 2;
    const base = seriesSlot(W, gi, tau, amp, w0);
    const sc = seriesSlot(W, gi, TIMES_C[tau], amp, w0), ss = seriesSlot(W, gi, TIMES_S[tau], amp, w0);
    const wa = V0 * a0x + V1 * a0y + V2 * a0z, wt = V0 * t0x + V1 * t0y + V2 * t0z, wn = V0 * n[0] + V1 * n[1] + V2 * n[2];
    addTerm(pq, (TERM_C[i] as number) * N_AXES * step, K1, b, L, base, sc, ss, V0, V1, V2, wa, wt, wn);
  }
  advance(pq, K1, delta, W.cs, touched);
  sumTotal(pq, K1, touched);
  return out;
}

/** Linear organ terms: component, and series slot (0: 1, 1: x, 2: ẋ, 3: ẍ), in component order. */
const LIN_C = [0, 1, 1, 2, 2, 3, 4, 5] as const;
const LIN_SLOT = [3, 0, 1, 0, 1, 2, 0, 0] as const;

function linear(g: Geometry, m: Motion, out: HarmonicTable): HarmonicTable {
  const wave = g.stroke as SeriesWave;
  const K1 = out.orders;
  const L = K1;
  const W = workspace(L);
  const b = W.buf;
  b.fill(0, 0, 8 * L); // the slots of 1, x, ẋ, ẍ
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
  // The terms (design §4 with Σm r = M (h + x d)): component LIN_C[i], series in slot
  // LIN_SLOT[i] (1, x, ẋ or ẍ), body vector in w[3i..3i+2] (a fixed scratch: nothing is allocated).
  const M = g.mass, d = g.e1, Om = m.omega, Wd = m.omegaDot, A = m.accel, G = m.gravity;
  const h0 = g.hinge[0] * M, h1 = g.hinge[1] * M, h2 = g.hinge[2] * M;
  const tw = W.terms;
  tw[0] = d[0] * -M; tw[1] = d[1] * -M; tw[2] = d[2] * -M; // primary: −M ẍ d
  centrifugalInto(tw, 3, Om, h0, h1, h2, 1); // centrifugal: −Ω×(Ω×M h) − M x Ω×(Ω×d)
  centrifugalInto(tw, 6, Om, d[0], d[1], d[2], M);
  crossInto(tw, 9, Wd, h0, h1, h2, -1); // angular acceleration: −Ω̇×M h − M x Ω̇×d
  crossInto(tw, 12, Wd, d[0], d[1], d[2], -M);
  crossInto(tw, 15, Om, d[0], d[1], d[2], -2 * M); // Coriolis: −2 M ẋ Ω×d
  tw[18] = A[0] * -M; tw[19] = A[1] * -M; tw[20] = A[2] * -M; // translational
  tw[21] = G[0] * M; tw[22] = G[1] * M; tw[23] = G[2] * M; // gravity
  const pq = out.pq;
  pq.fill(0);
  const e2 = g.e2, e3 = g.e3;
  const step = K1 * 2;
  for (let i = 0; i < LIN_C.length; i++) {
    const at = (LIN_C[i] as number) * N_AXES * step, f = (LIN_SLOT[i] as number) * 2 * L;
    const V0 = tw[3 * i] as number, V1 = tw[3 * i + 1] as number, V2 = tw[3 * i + 2] as number;
    addScaled(pq, at, K1, b, L, f, V0);
    addScaled(pq, at + step, K1, b, L, f, V1);
    addScaled(pq, at + 2 * step, K1, b, L, f, V2);
    addScaled(pq, at + 3 * step, K1, b, L, f, V0 * d[0] + V1 * d[1] + V2 * d[2]);
    addScaled(pq, at + 4 * step, K1, b, L, f, V0 * e2[0] + V1 * e2[1] + V2 * e2[2]);
    addScaled(pq, at + 5 * step, K1, b, L, f, V0 * e3[0] + V1 * e3[1] + V2 * e3[2]);
  }
  sumTotal(pq, K1);
  return out;
}
