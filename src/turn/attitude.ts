/**
 * Body attitude during a maneuver (design §3): the unit quaternion q = (w, x, y, z) that takes
 * body axes (ISO 1151-1: x forward, y right, z down) to world axes north–east–down, driven by the
 * body rates Ω (body axes):
 *
 *   q̇ = ½ q ⊗ (0, Ω)
 *
 * integrated by the classical fourth-order Runge–Kutta method on the sample grid (Ω at the step's
 * start, middle and end, evaluated from the profiles, never interpolated), renormalised after every
 * step. Gravity in body axes is g_b = Rᵀ(q) (0, 0, g) = g (2(xz − wy), 2(yz + wx), 1 − 2(x² + y²)).
 */

/** Quaternion series, component arrays of length n. */
export interface QuaternionSeries {
  w: Float64Array;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
}

export type Quaternion = [number, number, number, number];

/**
 * The attitude of ZYX Euler angles (yaw ψ, then pitch θ, then roll φ; aerospace convention):
 * q = q_z(ψ) ⊗ q_y(θ) ⊗ q_x(φ).
 */
export function fromEuler(a: { roll: number; pitch: number; yaw: number }): Quaternion {
  const cr = Math.cos(a.roll / 2), sr = Math.sin(a.roll / 2);
  const cp = Math.cos(a.pitch / 2), sp = Math.sin(a.pitch / 2);
  const cy = Math.cos(a.yaw / 2), sy = Math.sin(a.yaw / 2);
  return [
    cy * cp * cr + sy * sp * sr,
    cy * cp * sr - sy * sp * cr,
    cy * sp * cr + sy * cp * sr,
    sy * cp * cr - cy * sp * sr,
  ];
}

/** ZYX Euler angles (rad) of a unit quaternion; pitch in [−π/2, π/2]. */
export function toEuler(w: number, x: number, y: number, z: number): { roll: number; pitch: number; yaw: number } {
  const s = Math.max(-1, Math.min(1, 2 * (w * y - z * x)));
  return {
    roll: Math.atan2(2 * (w * x + y * z), 1 - 2 * (x * x + y * y)),
    pitch: Math.asin(s),
    yaw: Math.atan2(2 * (w * z + x * y), 1 - 2 * (y * y + z * z)),
  };
}

export interface AttitudeReport {
  /** Largest | |q| − 1 | seen before a renormalisation. */
  normDrift: number;
}

const k = new Float64Array(16);

/** ½ q ⊗ (0, ω) into k[at..at+3]. */
function slope(w: number, x: number, y: number, z: number, ox: number, oy: number, oz: number, at: number): void {
  k[at] = -0.5 * (x * ox + y * oy + z * oz);
  k[at + 1] = 0.5 * (w * ox + y * oz - z * oy);
  k[at + 2] = 0.5 * (w * oy + z * ox - x * oz);
  k[at + 3] = 0.5 * (w * oz + x * oy - y * ox);
}

/**
 * Integrate the attitude over n samples of step h from q0 (normalised here). `half` holds Ω on the
 * half-step grid t = i·h/2, i = 0..2n−2 (x, y, z arrays), so that RK4 finds Ω at t, t + h/2, t + h.
 * Writes q at every sample into `out`; returns the normalisation drift.
 */
export function integrateAttitude(q0: Quaternion, half: readonly [Float64Array, Float64Array, Float64Array], h: number, n: number, out: QuaternionSeries): AttitudeReport {
  const [hx, hy, hz] = half;
  const n0 = Math.hypot(...q0);
  let w = q0[0] / n0, x = q0[1] / n0, y = q0[2] / n0, z = q0[3] / n0;
  let drift = 0;
  out.w[0] = w; out.x[0] = x; out.y[0] = y; out.z[0] = z;
  for (let j = 0; j + 1 < n; j++) {
    const i = 2 * j;
    const ax = hx[i] as number, ay = hy[i] as number, az = hz[i] as number;
    const bx = hx[i + 1] as number, by = hy[i + 1] as number, bz = hz[i + 1] as number;
    const cx = hx[i + 2] as number, cy = hy[i + 2] as number, cz = hz[i + 2] as number;
    slope(w, x, y, z, ax, ay, az, 0);
    const g = h / 2;
    slope(w + g * (k[0] as number), x + g * (k[1] as number), y + g * (k[2] as number), z + g * (k[3] as number), bx, by, bz, 4);
    slope(w + g * (k[4] as number), x + g * (k[5] as number), y + g * (k[6] as number), z + g * (k[7] as number), bx, by, bz, 8);
    slope(w + h * (k[8] as number), x + h * (k[9] as number), y + h * (k[10] as number), z + h * (k[11] as number), cx, cy, cz, 12);
    const s = h / 6;
    w += s * ((k[0] as number) + 2 * (k[4] as number) + 2 * (k[8] as number) + (k[12] as number));
    x += s * ((k[1] as number) + 2 * (k[5] as number) + 2 * (k[9] as number) + (k[13] as number));
    y += s * ((k[2] as number) + 2 * (k[6] as number) + 2 * (k[10] as number) + (k[14] as number));
    z += s * ((k[3] as number) + 2 * (k[7] as number) + 2 * (k[11] as number) + (k[15] as number));
    const nq = Math.sqrt(w * w + x * x + y * y + z * z);
    const d = Math.abs(nq - 1);
    if (d > drift) drift = d;
    w /= nq; x /= nq; y /= nq; z /= nq;
    out.w[j + 1] = w; out.x[j + 1] = x; out.y[j + 1] = y; out.z[j + 1] = z;
  }
  return { normDrift: drift };
}

/** Gravity g_b = Rᵀ(q)(0, 0, g) in body axes at every sample, into gx, gy, gz. */
export function gravitySeries(q: QuaternionSeries, g: number, n: number, gx: Float64Array, gy: Float64Array, gz: Float64Array): void {
  for (let j = 0; j < n; j++) {
    const w = q.w[j] as number, x = q.x[j] as number, y = q.y[j] as number, z = q.z[j] as number;
    gx[j] = 2 * g * (x * z - w * y);
    gy[j] = 2 * g * (y * z + w * x);
    gz[j] = g * (1 - 2 * (x * x + y * y));
  }
}
