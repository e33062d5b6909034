/**
 * The organ-frame lines that a sensor at the base can read, split by how they depend on the body
 * motion (design §4): per unit rate (Coriolis, linear in Ω), per unit angular acceleration (linear
 * in Ω̇), the centrifugal line at the organ's rate (quadratic in Ω), and the lines that do not
 * depend on the rate (primary, gravity, translational). Axes b = 0, 1, 2 are the organ frame
 * (radial, tangential, normal for a rotary organ; drive, sense, cross for a linear one); a line is
 * the pair (p, q) of p cos kωt + q sin kωt (harmonics.ts).
 *
 * Closed forms (rotary sine stroke without deviation, θ = 0; linear harmonic-series stroke), with
 * e_r = cos φ a0 + sin φ t0, e_t = −sin φ a0 + cos φ t0, e_n = n, R = M h + μ e_r, V = μ φ̇ e_t:
 *   Coriolis −2Ω×V:        radial 2μ φ̇ (Ω·n), tangential 0, normal −2μ (φ̇ cos φ Ω·a0 + φ̇ sin φ Ω·t0)
 *   angular acc. −Ω̇×R:    −Ω̇×(M h) projected, plus tangential −μ Ω̇·n, normal μ Ω̇·e_t
 *   primary −μ(φ̈ e_t − φ̇² e_r): radial μ φ̇², tangential −μ φ̈
 *   centrifugal R|Ω|² − Ω(Ω·R): radial μ(|Ω|² − (Ω·e_r)²), tangential −μ (Ω·e_t)(Ω·e_r),
 *                               normal −μ (Ω·n)(Ω·e_r), plus the hinge term projected
 * with cos φ, sin φ from the Jacobi–Anger expansion (Abramowitz & Stegun 9.1.42–43) and
 * φ̇ cos φ = d(sin φ)/dt, φ̇ sin φ = −d(cos φ)/dt. Linear organ (frame d, s, d×s constant):
 *   Coriolis −2M ẋ Ω×d: sense −2M ẋ Ω·(d×s), cross 2M ẋ Ω·s; angular acc. −M x Ω̇×d likewise;
 *   primary −M ẍ on drive; centrifugal M x (d|Ω|² − Ω(Ω·d)) projected, plus the hinge terms.
 * Otherwise the lines come from the core's sampled loads (one beat per motion).
 *
 * The mirror organ (design §2) equals the specified one under Ω* = DΩ, D = diag(−1, 1, −1), with
 * unchanged organ-frame loads: its per-unit-rate lines are the specified ones times d_i.
 */
import { besselJ } from '../bessel.js';
import { allocHarmonics, lineIndex, loadHarmonics } from '../harmonics.js';
import { sampleOrgan, type Path } from '../forces.js';
import { mirroredMotion, type Geometry, type Model, type Motion } from '../model.js';
import { cross, dot, type Vec3 } from '../vec.js';
import { beatTable, type SeriesWave } from '../waveform.js';

/** D = diag(−1, 1, −1): the mirror organ's rate signs for roll, pitch, yaw. */
export const MIRROR_SIGN = [-1, 1, -1] as const;

/**
 * Lines of one organ, orders 0..K, in one array. Per-unit lines at ((i·3 + b)·K1 + k)·2 for body
 * axis i (roll, pitch, yaw) and organ axis b; per-axis lines at (b·K1 + k)·2 in their block.
 */
export interface OrganLines {
  orders: number;
  data: Float64Array;
}

export const BLOCK = { coriolis: 0, angularAcceleration: 9, primary: 18, centrifugal: 21, gravity: 24, translational: 27 } as const;
const BLOCKS = 30;

export const allocLines = (K: number): OrganLines => ({ orders: K + 1, data: new Float64Array(BLOCKS * (K + 1) * 2) });

/** Offset of a per-unit line (coriolis, angularAcceleration). */
export const unitAt = (L: OrganLines, block: number, i: number, b: number, k: number): number => ((block + i * 3 + b) * L.orders + k) * 2;
/** Offset of a per-axis line (primary, centrifugal, gravity, translational). */
export const axisAt = (L: OrganLines, block: number, b: number, k: number): number => ((block + b) * L.orders + k) * 2;

/** Copy the specified organ's lines into the mirror's, applying D to the per-unit lines. */
function mirrorUnits(src: OrganLines, dst: OrganLines): void {
  const span = 3 * dst.orders * 2;
  for (const block of [BLOCK.coriolis, BLOCK.angularAcceleration]) {
    for (let i = 0; i < 3; i++) {
      const at = (block + i * 3) * dst.orders * 2;
      const s = MIRROR_SIGN[i] as number;
      for (let j = 0; j < span; j++) dst.data[at + j] = s * (src.data[at + j] as number);
    }
  }
  const p = BLOCK.primary * dst.orders * 2;
  dst.data.set(src.data.subarray(p, p + span), p);
}

// ---- closed form: rotary --------------------------------------------------------------------

const SLOT = { C: 0, S: 1, CC: 2, CS: 3, SS: 4, PD: 5, PDD: 6, PD2: 7, PDC: 8, PDS: 9 } as const;
const N_SLOTS = 10;

interface RotaryBasis {
  K1: number;
  /** slot s: p_k at [s·2K1 + k], q_k at [s·2K1 + K1 + k]. */
  buf: Float64Array;
  J: Float64Array;
  J2: Float64Array;
  a0: Vec3;
  t0: Vec3;
  n: Vec3;
  M: number;
  mu: number;
  h: Vec3;
}

let basisCache: RotaryBasis | undefined;

function rotaryBasis(g: Geometry, K1: number): RotaryBasis {
  if (!basisCache || basisCache.K1 !== K1) {
    basisCache = { K1, buf: new Float64Array(N_SLOTS * 2 * K1), J: new Float64Array(K1 + 1), J2: new Float64Array(K1 + 1), a0: [0, 0, 0], t0: [0, 0, 0], n: [0, 0, 0], M: 0, mu: 0, h: [0, 0, 0] };
  }
  const B = basisCache;
  const wave = g.stroke as SeriesWave;
  const a1 = wave.cos[0] ?? 0, b1 = wave.sin[0] ?? 0;
  const amp = Math.hypot(a1, b1), delta = Math.atan2(a1, b1);
  const w = 2 * Math.PI * g.frequency;
  const cm = Math.cos(wave.mean), sm = Math.sin(wave.mean);
  for (let c = 0; c < 3; c++) {
    const e1 = g.e1[c] as number, e2 = g.e2[c] as number;
    B.a0[c] = cm * e1 + sm * e2;
    B.t0[c] = cm * e2 - sm * e1;
    B.n[c] = g.e3[c] as number;
    B.h[c] = g.hinge[c] as number;
  }
  B.M = g.mass;
  B.mu = g.moment;
  const b = B.buf;
  b.fill(0);
  const J = besselJ(amp, K1, B.J), J2 = besselJ(2 * amp, K1, B.J2);
  const P = (s: number, k: number) => s * 2 * K1 + k;
  const Q = (s: number, k: number) => s * 2 * K1 + K1 + k;
  for (let k = 0; k < K1; k++) {
    const jk = J[k] as number, j2k = J2[k] as number;
    if (k % 2 === 0) {
      b[P(SLOT.C, k)] = k === 0 ? jk : 2 * jk;
      const c2 = k === 0 ? j2k : 2 * j2k;
      b[P(SLOT.CC, k)] = (k === 0 ? 0.5 : 0) + c2 / 2;
      b[P(SLOT.SS, k)] = (k === 0 ? 0.5 : 0) - c2 / 2;
      b[Q(SLOT.PDS, k)] = k * w * (b[P(SLOT.C, k)] as number);
    } else {
      b[Q(SLOT.S, k)] = 2 * jk;
      b[Q(SLOT.CS, k)] = j2k;
      b[P(SLOT.PDC, k)] = k * w * 2 * jk;
    }
  }
  if (K1 > 1) {
    b[P(SLOT.PD, 1)] = amp * w;
    b[Q(SLOT.PDD, 1)] = -amp * w * w;
  }
  b[P(SLOT.PD2, 0)] = (amp * amp * w * w) / 2;
  if (K1 > 2) b[P(SLOT.PD2, 2)] = (amp * amp * w * w) / 2;
  if (delta !== 0) {
    for (let s = 0; s < N_SLOTS; s++) {
      for (let k = 1; k < K1; k++) {
        const c = Math.cos(k * delta), sn = Math.sin(k * delta);
        const p = b[P(s, k)] as number, q = b[Q(s, k)] as number;
        b[P(s, k)] = p * c + q * sn;
        b[Q(s, k)] = -p * sn + q * c;
      }
    }
  }
  return B;
}

/** dst[(b·K1 + k)·2] += coefficient × slot series. */
function addSlot(B: RotaryBasis, dst: Float64Array, at: number, slot: number, coef: number): void {
  if (coef === 0) return;
  const K1 = B.K1, src = slot * 2 * K1;
  for (let k = 0; k < K1; k++) {
    dst[at + 2 * k] = (dst[at + 2 * k] as number) + coef * (B.buf[src + k] as number);
    dst[at + 2 * k + 1] = (dst[at + 2 * k + 1] as number) + coef * (B.buf[src + K1 + k] as number);
  }
}

/** Lines of a constant body vector W on the rotating frame: W·e_r, W·e_t, W·n (3 axes at `at`). */
function constantRotary(B: RotaryBasis, W: Vec3, dst: Float64Array, at: number): void {
  const wa = dot(W, B.a0), wt = dot(W, B.t0), step = 2 * B.K1;
  addSlot(B, dst, at, SLOT.C, wa);
  addSlot(B, dst, at, SLOT.S, wt);
  addSlot(B, dst, at + step, SLOT.S, -wa);
  addSlot(B, dst, at + step, SLOT.C, wt);
  dst[at + 2 * step] = (dst[at + 2 * step] as number) + dot(W, B.n);
}

/** −Ω×(Ω×v) = v|Ω|² − Ω(Ω·v). */
const centrifugalOf = (w: Vec3, v: Vec3): Vec3 => {
  const w2 = dot(w, w), wv = dot(w, v);
  return [v[0] * w2 - w[0] * wv, v[1] * w2 - w[1] * wv, v[2] * w2 - w[2] * wv];
};

/** Motion-dependent lines of a rotary organ: centrifugal at Ω, gravity, translational. */
function rotaryMotionLines(B: RotaryBasis, m: Motion, L: OrganLines): void {
  const d = L.data, step = 2 * B.K1, mu = B.mu, Mh: Vec3 = [B.M * B.h[0], B.M * B.h[1], B.M * B.h[2]];
  const W = m.omega;
  const al = dot(W, B.a0), be = dot(W, B.t0), ga = dot(W, B.n), w2 = dot(W, W);
  const c = axisAt(L, BLOCK.centrifugal, 0, 0);
  d.fill(0, c, c + 3 * step);
  d[c] = mu * w2;
  addSlot(B, d, c, SLOT.CC, -mu * al * al);
  addSlot(B, d, c, SLOT.CS, -2 * mu * al * be);
  addSlot(B, d, c, SLOT.SS, -mu * be * be);
  addSlot(B, d, c + step, SLOT.CS, -mu * (be * be - al * al));
  addSlot(B, d, c + step, SLOT.CC, -mu * al * be);
  addSlot(B, d, c + step, SLOT.SS, mu * al * be);
  addSlot(B, d, c + 2 * step, SLOT.C, -mu * ga * al);
  addSlot(B, d, c + 2 * step, SLOT.S, -mu * ga * be);
  constantRotary(B, centrifugalOf(W, Mh), d, c);
  const g = axisAt(L, BLOCK.gravity, 0, 0), t = axisAt(L, BLOCK.translational, 0, 0);
  d.fill(0, g, g + 3 * step);
  d.fill(0, t, t + 3 * step);
  constantRotary(B, [B.M * m.gravity[0], B.M * m.gravity[1], B.M * m.gravity[2]], d, g);
  constantRotary(B, [-B.M * m.accel[0], -B.M * m.accel[1], -B.M * m.accel[2]], d, t);
}

function rotaryUnitLines(B: RotaryBasis, L: OrganLines): void {
  const d = L.data, step = 2 * B.K1, mu = B.mu;
  const p = axisAt(L, BLOCK.primary, 0, 0);
  addSlot(B, d, p, SLOT.PD2, mu);
  addSlot(B, d, p + step, SLOT.PDD, -mu);
  for (let i = 0; i < 3; i++) {
    const al = B.a0[i] as number, be = B.t0[i] as number, ga = B.n[i] as number;
    const c = unitAt(L, BLOCK.coriolis, i, 0, 0);
    addSlot(B, d, c, SLOT.PD, 2 * mu * ga);
    addSlot(B, d, c + 2 * step, SLOT.PDC, -2 * mu * al);
    addSlot(B, d, c + 2 * step, SLOT.PDS, -2 * mu * be);
    const a = unitAt(L, BLOCK.angularAcceleration, i, 0, 0);
    const e: Vec3 = [0, 0, 0];
    e[i] = 1;
    constantRotary(B, cross([B.M * B.h[0], B.M * B.h[1], B.M * B.h[2]], e), d, a); // −e×(Mh) = (Mh)×e
    d[a + step] = (d[a + step] as number) - mu * ga;
    addSlot(B, d, a + 2 * step, SLOT.S, -mu * al);
    addSlot(B, d, a + 2 * step, SLOT.C, mu * be);
  }
}

// ---- closed form: linear --------------------------------------------------------------------

/** Lines of x, ẋ, ẍ (orders 0..K) of a linear organ's stroke. */
function strokeLines(g: Geometry, K1: number, x: Float64Array, xd: Float64Array, xdd: Float64Array): void {
  const wave = g.stroke as SeriesWave;
  const w = 2 * Math.PI * g.frequency;
  x.fill(0); xd.fill(0); xdd.fill(0);
  x[0] = wave.mean;
  for (let k = 1; k < K1 && k <= wave.cos.length; k++) {
    const a = wave.cos[k - 1] as number, c = wave.sin[k - 1] as number, kw = k * w;
    x[2 * k] = a; x[2 * k + 1] = c;
    xd[2 * k] = kw * c; xd[2 * k + 1] = -kw * a;
    xdd[2 * k] = -kw * kw * a; xdd[2 * k + 1] = -kw * kw * c;
  }
}

let linearWs: { K1: number; x: Float64Array; xd: Float64Array; xdd: Float64Array } | undefined;

function addScaled(dst: Float64Array, at: number, src: Float64Array, coef: number): void {
  if (coef === 0) return;
  for (let i = 0; i < src.length; i++) dst[at + i] = (dst[at + i] as number) + coef * (src[i] as number);
}

function linearLines(g: Geometry, m: Motion, L: OrganLines, units: boolean): void {
  const K1 = L.orders;
  if (!linearWs || linearWs.K1 !== K1) linearWs = { K1, x: new Float64Array(2 * K1), xd: new Float64Array(2 * K1), xdd: new Float64Array(2 * K1) };
  const { x, xd, xdd } = linearWs;
  strokeLines(g, K1, x, xd, xdd);
  const d = L.data, M = g.mass, step = 2 * K1;
  const axes = [g.e1, g.e2, g.e3] as const;
  const Mh: Vec3 = [M * g.hinge[0], M * g.hinge[1], M * g.hinge[2]];
  const constant = (W: Vec3, at: number) => {
    for (let b = 0; b < 3; b++) d[at + b * step] = (d[at + b * step] as number) + dot(W, axes[b] as Vec3);
  };
  const [dd, s, e3] = axes;
  if (units) {
    addScaled(d, axisAt(L, BLOCK.primary, 0, 0), xdd, -M);
    for (let i = 0; i < 3; i++) {
      const c = unitAt(L, BLOCK.coriolis, i, 0, 0);
      addScaled(d, c + step, xd, -2 * M * (e3[i] as number));
      addScaled(d, c + 2 * step, xd, 2 * M * (s[i] as number));
      const a = unitAt(L, BLOCK.angularAcceleration, i, 0, 0);
      const e: Vec3 = [0, 0, 0];
      e[i] = 1;
      constant(cross(Mh, e), a);
      addScaled(d, a + step, x, -M * (e3[i] as number));
      addScaled(d, a + 2 * step, x, M * (s[i] as number));
    }
  }
  const W = m.omega;
  const c = axisAt(L, BLOCK.centrifugal, 0, 0), gr = axisAt(L, BLOCK.gravity, 0, 0), tr = axisAt(L, BLOCK.translational, 0, 0);
  d.fill(0, c, c + 3 * step);
  d.fill(0, gr, gr + 3 * step);
  d.fill(0, tr, tr + 3 * step);
  const cd = centrifugalOf(W, dd);
  for (let b = 0; b < 3; b++) addScaled(d, c + b * step, x, M * dot(cd, axes[b] as Vec3));
  constant(centrifugalOf(W, Mh), c);
  constant([M * m.gravity[0], M * m.gravity[1], M * m.gravity[2]], gr);
  constant([-M * m.accel[0], -M * m.accel[1], -M * m.accel[2]], tr);
}

// ---- sampled path (the core's loads) ---------------------------------------------------------

const COMPONENT = { primary: 0, centrifugal: 1, angularAcceleration: 2, coriolis: 3, translational: 4, gravity: 5 } as const;

function sampledTable(g: Geometry, m: Motion, n: number, K: number) {
  const t = allocHarmonics(K);
  return loadHarmonics(sampleOrgan(g, m, n).beat, n, beatTable(n), K, t);
}

function copyComponent(t: ReturnType<typeof allocHarmonics>, component: number, L: OrganLines, at: number): void {
  for (let b = 0; b < 3; b++) {
    const src = lineIndex(t, component, 3 + b, 0);
    L.data.set(t.pq.subarray(src, src + 2 * t.orders), at + b * 2 * L.orders);
  }
}

const still = (m: Motion, omega: Vec3): Motion => ({ omega, omegaDot: [0, 0, 0], accel: m.accel, gravity: m.gravity });

/** The lines of the specified organ and (when the model has one) its mirror, orders 0..K. */
export function organLines(model: Model, path: Path, pointsPerBeat: number, K: number, out?: { specified: OrganLines; mirror: OrganLines }): { specified: OrganLines; mirror: OrganLines } {
  const res = out ?? { specified: allocLines(K), mirror: allocLines(K) };
  const g = model.geometry, m = model.motion;
  const spec = res.specified, mir = res.mirror;
  spec.data.fill(0);
  mir.data.fill(0);
  const mm = mirroredMotion(m);
  if (path === 'closed-form' && g.drive === 'rotary') {
    const B = rotaryBasis(g, spec.orders);
    rotaryUnitLines(B, spec);
    rotaryMotionLines(B, m, spec);
    mirrorUnits(spec, mir);
    rotaryMotionLines(B, mm, mir);
  } else if (path === 'closed-form') {
    linearLines(g, m, spec, true);
    mirrorUnits(spec, mir);
    linearLines(g, mm, mir, false);
  } else {
    for (let i = 0; i < 3; i++) {
      const e: Vec3 = [0, 0, 0];
      e[i] = 1;
      const t = sampledTable(g, { omega: e, omegaDot: e, accel: [0, 0, 0], gravity: [0, 0, 0] }, pointsPerBeat, K);
      copyComponent(t, COMPONENT.coriolis, spec, unitAt(spec, BLOCK.coriolis, i, 0, 0));
      copyComponent(t, COMPONENT.angularAcceleration, spec, unitAt(spec, BLOCK.angularAcceleration, i, 0, 0));
    }
    const ts = sampledTable(g, still(m, m.omega), pointsPerBeat, K);
    for (const [name, c] of [['primary', COMPONENT.primary], ['centrifugal', COMPONENT.centrifugal], ['gravity', COMPONENT.gravity], ['translational', COMPONENT.translational]] as const) {
      copyComponent(ts, c, spec, axisAt(spec, BLOCK[name], 0, 0));
    }
    mirrorUnits(spec, mir);
    const tm = sampledTable(g, still(mm, mm.omega), pointsPerBeat, K);
    for (const [name, c] of [['centrifugal', COMPONENT.centrifugal], ['gravity', COMPONENT.gravity], ['translational', COMPONENT.translational]] as const) {
      copyComponent(tm, c, mir, axisAt(mir, BLOCK[name], 0, 0));
    }
  }
  return res;
}

/**
 * The centrifugal lines as a quadratic form in Ω for the specified organ: 6 blocks of 3 axes
 * (pairs 00, 11, 22, 01, 02, 12) with line(Ω) = Σ_i Ω_i² Q_ii + Σ_{i<j} 2 Ω_i Ω_j Q_ij
 * (polarisation of the lines at e_i and e_i + e_j). The mirror's form is Q_ij d_i d_j.
 */
export function centrifugalForm(model: Model, path: Path, pointsPerBeat: number, K: number): Float64Array {
  const K1 = K + 1, span = 3 * 2 * K1;
  const Q = new Float64Array(6 * span);
  const L = allocLines(K);
  const g = model.geometry;
  const zero: Motion = { omega: [0, 0, 0], omegaDot: [0, 0, 0], accel: [0, 0, 0], gravity: [0, 0, 0] };
  const B = path === 'closed-form' && g.drive === 'rotary' ? rotaryBasis(g, K1) : undefined;
  const at = (omega: Vec3, dst: number) => {
    const m = { ...zero, omega };
    if (B) rotaryMotionLines(B, m, L);
    else if (path === 'closed-form') linearLines(g, m, L, false);
    else {
      const t = sampledTable(g, m, pointsPerBeat, K);
      copyComponent(t, COMPONENT.centrifugal, L, axisAt(L, BLOCK.centrifugal, 0, 0));
    }
    const c = axisAt(L, BLOCK.centrifugal, 0, 0);
    Q.set(L.data.subarray(c, c + span), dst * span);
  };
  const PAIRS = [[0, 1], [0, 2], [1, 2]] as const;
  for (let i = 0; i < 3; i++) {
    const e: Vec3 = [0, 0, 0];
    e[i] = 1;
    at(e, i);
  }
  PAIRS.forEach(([i, j], m) => {
    const e: Vec3 = [0, 0, 0];
    e[i] = 1;
    e[j] = 1;
    at(e, 3 + m);
    for (let x = 0; x < span; x++) Q[(3 + m) * span + x] = ((Q[(3 + m) * span + x] as number) - (Q[i * span + x] as number) - (Q[j * span + x] as number)) / 2;
  });
  return Q;
}

