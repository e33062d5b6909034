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

/**
 * Integrate the attitude over n samples of step h from q0 (normalised here). `rate` holds Ω at the
 * samples t_j = j·h and `mid` at the midpoints t_j + h/2 (x, y, z arrays), so that RK4 finds Ω at
 * t, t + h/2 and t + h. Writes q at every sample into `out`; returns the normalisation drift.
 * The four slopes ½ q ⊗ (0, ω) are written out in place (no calls, no allocation per step).
 */
export function integrateAttitude(
  q0: Quaternion,
  rate: readonly [Float64Array, Float64Array, Float64Array],
  mid: readonly [Float64Array, Float64Array, Float64Array],
  h: number,
  n: number,
  out: QuaternionSeries,
): AttitudeReport {
  const [rx, ry, rz] = rate;
  const [mx, my, mz] = mid;
  const n0 = Math.hypot(...q0);
  let w = q0[0] / n0, x = q0[1] / n0, y = q0[2] / n0, z = q0[3] / n0;
  let drift = 0;
  const g = h / 2, s = h / 6;
  out.w[0] = w; out.x[0] = x; out.y[0] = y; out.z[0] = z;
  for (let j = 0; j + 1 < n; j++) {
    const ax = rx[j] as number, ay = ry[j] as number, az = rz[j] as number;
    const bx = mx[j] as number, by = my[j] as number, bz = mz[j] as number;
    const cx = rx[j + 1] as number, cy = ry[j + 1] as number, cz = rz[j + 1] as number;
    // k1 at (q, Ω(t))
    const k1w = -0.5 * (x * ax + y * ay + z * az), k1x = 0.5 * (w * ax + y * az - z * ay);
    const k1y = 0.5 * (w * ay + z * ax - x * az), k1z = 0.5 * (w * az + x * ay - y * ax);
    // k2 at (q + h/2 k1, Ω(t + h/2))
    let pw = w + g * k1w, px = x + g * k1x, py = y + g * k1y, pz = z + g * k1z;
    const k2w = -0.5 * (px * bx + py * by + pz * bz), k2x = 0.5 * (pw * bx + py * bz - pz * by);
    const k2y = 0.5 * (pw * by + pz * bx - px * bz), k2z = 0.5 * (pw * bz + px * by - py * bx);
    // k3 at (q + h/2 k2, Ω(t + h/2))
    pw = w + g * k2w; px = x + g * k2x; py = y + g * k2y; pz = z + g * k2z;
    const k3w = -0.5 * (px * bx + py * by + pz * bz), k3x = 0.5 * (pw * bx + py * bz - pz * by);
    const k3y = 0.5 * (pw * by + pz * bx - px * bz), k3z = 0.5 * (pw * bz + px * by - py * bx);
    // k4 at (q + h k3, Ω(t + h))
    pw = w + h * k3w; px = x + h * k3x; py = y + h * k3y; pz = z + h * k3z;
    const k4w = -0.5 * (px * cx + py * cy + pz * cz), k4x = 0.5 * (pw * cx + py * cz - pz * cy);
    const k4y = 0.5 * (pw * cy + pz * cx - px * cz), k4z = 0.5 * (pw * cz + px * cy - py * cx);
    w += s * (k1w + 2 * k2w + 2 * k3w + k4w);
    x += s * (k1x + 2 * k2x + 2 * k3x + k4x);
    y += s * (k1y + 2 * k2y + 2 * k3y + k4y);
    z += s * (k1z + 2 * k2z + 2 * k3z + k4z);
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
