/**
 * Independent derivations for the core's tests. Nothing here imports from src/: positions are
 * written from the design's formulas (design §2, §3), rotations by Rodrigues' formula, and
 * accelerations by a finite difference of the inertial-frame trajectory, so that the core's
 * analytic kinematics and load decomposition are checked against something outside themselves.
 */

export type V3 = [number, number, number];

export const dot = (a: V3, b: V3): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
export const crossV = (a: V3, b: V3): V3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
export const addV = (a: V3, b: V3): V3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
export const subV = (a: V3, b: V3): V3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
export const scaleV = (a: V3, s: number): V3 => [a[0] * s, a[1] * s, a[2] * s];
export const normV = (a: V3): number => Math.hypot(a[0], a[1], a[2]);
export const unitV = (a: V3): V3 => scaleV(a, 1 / normV(a));
/** Reflection across the body's x–z plane (design §2). */
export const mirrorV = (a: V3): V3 => [a[0], -a[1], a[2]];

/** 3×3 matrices as row-major arrays of rows. */
export type M3 = [V3, V3, V3];
export const mulMV = (m: M3, v: V3): V3 => [dot(m[0], v), dot(m[1], v), dot(m[2], v)];
export const transpose = (m: M3): M3 => [
  [m[0][0], m[1][0], m[2][0]],
  [m[0][1], m[1][1], m[2][1]],
  [m[0][2], m[1][2], m[2][2]],
];

/** Rodrigues' rotation formula: R = I + sin θ K + (1 − cos θ) K², K = [k̂]×, θ = |w|. */
export function rodrigues(w: V3): M3 {
  const th = normV(w);
  // Below 1e-150 rad the rotation differs from I by less than any double can show.
  if (!(th > 1e-150)) return [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
  const [kx, ky, kz] = scaleV(w, 1 / th);
  const K: M3 = [[0, -kz, ky], [kz, 0, -kx], [-ky, kx, 0]];
  const s = Math.sin(th), c1 = 1 - Math.cos(th);
  const out: M3 = [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      let k2 = 0;
      for (let l = 0; l < 3; l++) k2 += (K[i] as V3)[l]! * (K[l] as V3)[j]!;
      (out[i] as V3)[j] = (out[i] as V3)[j]! + s * (K[i] as V3)[j]! + c1 * k2;
    }
  }
  return out;
}

/** Attitude ZYX (yaw ψ, pitch θ, roll φ): world (north-east-down) from body, R = Rz(ψ) Ry(θ) Rx(φ). */
export function attitudeMatrix(roll: number, pitch: number, yaw: number): M3 {
  const rz = rodrigues([0, 0, yaw]), ry = rodrigues([0, pitch, 0]), rx = rodrigues([roll, 0, 0]);
  const mul = (a: M3, b: M3): M3 => {
    const bt = transpose(b);
    return [
      [dot(a[0], bt[0]), dot(a[0], bt[1]), dot(a[0], bt[2])],
      [dot(a[1], bt[0]), dot(a[1], bt[1]), dot(a[1], bt[2])],
      [dot(a[2], bt[0]), dot(a[2], bt[1]), dot(a[2], bt[2])],
    ];
  };
  return mul(mul(rz, ry), rx);
}

/**
 * Gravity in body axes: the world's "down" vector [0, 0, g] expressed in body axes, g_b = Rᵀ [0, 0, g].
 */
export const gravityBody = (g: number, roll: number, pitch: number, yaw: number): V3 => mulMV(transpose(attitudeMatrix(roll, pitch, yaw)), [0, 0, g]);

/** A stroke coordinate as a plain function of time, from the waveform's definition (design §3). */
export type Stroke = (t: number) => number;

export function sineStroke(f: number, amplitude: number, mean = 0): Stroke {
  const w = 2 * Math.PI * f;
  return (t) => mean + amplitude * Math.sin(w * t);
}

export function seriesStroke(f: number, mean: number, terms: readonly { order: number; cos: number; sin: number }[]): Stroke {
  const w = 2 * Math.PI * f;
  return (t) => terms.reduce((s, h) => s + h.cos * Math.cos(h.order * w * t) + h.sin * Math.sin(h.order * w * t), mean);
}

/** The documented triangle: s̄ + S asin(K sin ωt)/asin K, K = cos(π r/2) (header of src/waveform.ts). */
export function triangleStroke(f: number, amplitude: number, rounding: number, mean = 0): Stroke {
  const w = 2 * Math.PI * f;
  const K = Math.cos((Math.PI * rounding) / 2);
  return (t) => mean + (amplitude * Math.asin(K * Math.sin(w * t))) / Math.asin(K);
}

/** Rotary organ geometry in body axes (design §2). */
export interface RotaryGeom {
  a0: V3;
  n: V3;
  hinge: V3;
}

/** e_r = cos θ (cos φ a0 + sin φ t0) + sin θ n with t0 = n × a0 (design §2). */
export function radialUnit(g: RotaryGeom, phi: number, theta: number): V3 {
  const t0 = crossV(g.n, g.a0);
  const inPlane = addV(scaleV(g.a0, Math.cos(phi)), scaleV(t0, Math.sin(phi)));
  return addV(scaleV(inPlane, Math.cos(theta)), scaleV(g.n, Math.sin(theta)));
}

/** Organ frame (e_r, e_t, e_n) with e_t = −sin φ a0 + cos φ t0 and e_n = e_r × e_t (design §2). */
export function rotaryFrame(g: RotaryGeom, phi: number, theta: number): [V3, V3, V3] {
  const t0 = crossV(g.n, g.a0);
  const er = radialUnit(g, phi, theta);
  const et = addV(scaleV(g.a0, -Math.sin(phi)), scaleV(t0, Math.cos(phi)));
  return [er, et, crossV(er, et)];
}

/**
 * Inertial position of the reference point for a body that starts at rest in attitude (identity)
 * and turns at a constant body rate w while its reference point accelerates at a constant a_b in
 * body axes: Ẍ_ref = R(t) a_b with R(t) = exp(t[w]×). Integrated twice in closed form (Rodrigues):
 * X_ref = [t²/2 I + (Wt − sin Wt)/W² K + (t²/2 − (1 − cos Wt)/W²) K²] a_b, W = |w|, K = [ŵ]×
 * (series for small Wt, where the closed form cancels).
 */
export function referencePosition(w: V3, aBody: V3, t: number): V3 {
  const W0 = normV(w);
  const W = W0 > 1e-150 ? W0 : 0;
  const x = W * t;
  let s1: number, s2: number; // (Wt − sin Wt)/W², t²/2 − (1 − cos Wt)/W²
  if (Math.abs(x) < 0.05) {
    const t2 = t * t, x2 = x * x;
    s1 = W * t2 * t * (1 / 6 - x2 / 120 + (x2 * x2) / 5040 - (x2 * x2 * x2) / 362880);
    s2 = W * W * t2 * t2 * (1 / 24 - x2 / 720 + (x2 * x2) / 40320 - (x2 * x2 * x2) / 3628800);
  } else {
    s1 = (x - Math.sin(x)) / (W * W);
    s2 = (t * t) / 2 - (1 - Math.cos(x)) / (W * W);
  }
  const Ka = W === 0 ? ([0, 0, 0] as V3) : crossV(scaleV(w, 1 / W), aBody);
  const KKa = W === 0 ? ([0, 0, 0] as V3) : crossV(scaleV(w, 1 / W), Ka);
  return addV(addV(scaleV(aBody, (t * t) / 2), scaleV(Ka, s1)), scaleV(KKa, s2));
}

/** Eighth-order central second difference: coefficients of f(t + i h), i = −4..4 (Fornberg 1988). */
const D2 = [-1 / 560, 8 / 315, -1 / 5, 8 / 5, -205 / 72, 8 / 5, -1 / 5, 8 / 315, -1 / 560] as const;

export function secondDerivative(f: (t: number) => V3, t: number, h: number): V3 {
  const out: V3 = [0, 0, 0];
  for (let i = -4; i <= 4; i++) {
    const c = D2[i + 4] as number;
    const x = f(t + i * h);
    out[0] += c * x[0];
    out[1] += c * x[1];
    out[2] += c * x[2];
  }
  return scaleV(out, 1 / (h * h));
}

/** A point mass of the organ: its mass and its position from the reference point in body axes. */
export interface PointMass {
  mass: number;
  bodyPosition: (t: number) => V3;
}

/**
 * The load on the support (body axes) from the inertial-frame trajectory: for each point mass,
 * X(t) = X_ref(t) + R(t) r_body(t), F = Σ −m Rᵀ Ẍ + m g_b (design §4, "check that must always hold").
 */
export function inertialLoad(points: readonly PointMass[], w: V3, aBody: V3, gBody: V3, t: number, h: number): V3 {
  const Rt = transpose(rodrigues(scaleV(w, t)));
  let F: V3 = [0, 0, 0];
  for (const p of points) {
    const X = (tau: number): V3 => addV(referencePosition(w, aBody, tau), mulMV(rodrigues(scaleV(w, tau)), p.bodyPosition(tau)));
    const acc = secondDerivative(X, t, h);
    F = addV(F, addV(scaleV(mulMV(Rt, acc), -p.mass), scaleV(gBody, p.mass)));
  }
  return F;
}

/** Mulberry32: a small seeded PRNG for reproducible noise. */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates by the Box–Muller transform. */
export function gaussian(uniform: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

/** J_n(x) = (1/π) ∫_0^π cos(nτ − x sin τ) dτ (A&S 9.1.21), trapezoidal rule (exponentially exact for this periodic integrand). */
export function besselIntegral(n: number, x: number, points = 400): number {
  // The integrand extended to [0, 2π] is periodic and smooth; the trapezoidal rule over the full
  // period equals (1/2π) Σ cos(nτ_j − x sin τ_j) · 2π / points.
  let s = 0;
  for (let j = 0; j < points; j++) {
    const tau = (2 * Math.PI * j) / points;
    s += Math.cos(n * tau - x * Math.sin(tau));
  }
  return s / points;
}
