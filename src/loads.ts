/**
 * The load that the moving mass exerts on its support, sampled in time (design §4):
 *
 *   F = −Σm a_rel − Ω×(Ω×Σm r) − Ω̇×Σm r − 2 Ω×Σm v_rel − Σm a_ref + Σm g
 *       primary     centrifugal   angularAcceleration  coriolis  translational  gravity
 *
 * with Σm r = M h + μ e_r (hinge h, first moment μ along the arm) and all vectors in body axes.
 * Organ-frame components are projections on (e_r, e_t, e_n) (rotary) or (d, s, d×s) (linear).
 *
 * Layout of a LoadSeries: component c, axis a, sample j at data[(c·6 + a)·n + j], components and
 * axes in the order of components.ts.
 */
import { N_AXES, N_COMPONENTS } from './components.js';
import type { Geometry } from './model.js';
import type { WaveSamples } from './waveform.js';

export interface LoadSeries {
  /** Samples per series. */
  n: number;
  data: Float64Array;
}

/** Body motion per sample; `stride` 0 holds it constant (arrays of length 1), 1 gives a series. */
export interface MotionSeries {
  stride: 0 | 1;
  wx: Float64Array; wy: Float64Array; wz: Float64Array;
  dwx: Float64Array; dwy: Float64Array; dwz: Float64Array;
  ax: Float64Array; ay: Float64Array; az: Float64Array;
  gx: Float64Array; gy: Float64Array; gz: Float64Array;
}

export function constantMotion(m: { omega: number[]; omegaDot: number[]; accel: number[]; gravity: number[] }): MotionSeries {
  const one = (x: number | undefined) => new Float64Array([x ?? 0]);
  return {
    stride: 0,
    wx: one(m.omega[0]), wy: one(m.omega[1]), wz: one(m.omega[2]),
    dwx: one(m.omegaDot[0]), dwy: one(m.omegaDot[1]), dwz: one(m.omegaDot[2]),
    ax: one(m.accel[0]), ay: one(m.accel[1]), az: one(m.accel[2]),
    gx: one(m.gravity[0]), gy: one(m.gravity[1]), gz: one(m.gravity[2]),
  };
}

/**
 * Per-sample geometry: first moment Σm r (R), Σm v_rel (V), Σm a_rel (A), and the organ frame
 * (E1, E2, E3), each as x, y, z arrays of length n.
 */
export interface Kinematics {
  n: number;
  R: Float64Array[]; V: Float64Array[]; A: Float64Array[];
  E1: Float64Array[]; E2: Float64Array[]; E3: Float64Array[];
}

export function allocKinematics(n: number): Kinematics {
  const three = () => [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  return { n, R: three(), V: three(), A: three(), E1: three(), E2: three(), E3: three() };
}

/**
 * Fill the kinematics of a rotary organ from stroke samples φ, φ̇, φ̈ and optional deviation θ:
 * e_r = cos θ q + sin θ n, e_t = p, e_n = cos θ n − sin θ q, with q = cos φ a0 + sin φ t0 and
 * p = −sin φ a0 + cos φ t0;
 * ė_r = −θ̇ sθ q + cθ φ̇ p + θ̇ cθ n;
 * ë_r = (−θ̈ sθ − θ̇² cθ − cθ φ̇²) q + (cθ φ̈ − 2 θ̇ φ̇ sθ) p + (θ̈ cθ − θ̇² sθ) n.
 * Linear organ: Σm r = m (h + x d), Σm v = m ẋ d, Σm a = m ẍ d; frame constant.
 */
export function kinematics(g: Geometry, stroke: WaveSamples, deviation: WaveSamples | undefined, k: Kinematics): Kinematics {
  const { n } = k;
  const [a0x, a0y, a0z] = g.e1;
  const [t0x, t0y, t0z] = g.e2;
  const [nx, ny, nz] = g.e3;
  const M = g.mass;
  const mu = g.moment;
  const hx = M * g.hinge[0], hy = M * g.hinge[1], hz = M * g.hinge[2];
  const [Rx, Ry, Rz] = k.R as [Float64Array, Float64Array, Float64Array];
  const [Vx, Vy, Vz] = k.V as [Float64Array, Float64Array, Float64Array];
  const [Ax, Ay, Az] = k.A as [Float64Array, Float64Array, Float64Array];
  const [E1x, E1y, E1z] = k.E1 as [Float64Array, Float64Array, Float64Array];
  const [E2x, E2y, E2z] = k.E2 as [Float64Array, Float64Array, Float64Array];
  const [E3x, E3y, E3z] = k.E3 as [Float64Array, Float64Array, Float64Array];
  const { s, v, a } = stroke;
  if (g.drive === 'linear') {
    for (let j = 0; j < n; j++) {
      const x = mu * (s[j] as number), xd = mu * (v[j] as number), xdd = mu * (a[j] as number);
      Rx[j] = hx + x * a0x; Ry[j] = hy + x * a0y; Rz[j] = hz + x * a0z;
      Vx[j] = xd * a0x; Vy[j] = xd * a0y; Vz[j] = xd * a0z;
      Ax[j] = xdd * a0x; Ay[j] = xdd * a0y; Az[j] = xdd * a0z;
      E1x[j] = a0x; E1y[j] = a0y; E1z[j] = a0z;
      E2x[j] = t0x; E2y[j] = t0y; E2z[j] = t0z;
      E3x[j] = nx; E3y[j] = ny; E3z[j] = nz;
    }
    return k;
  }
  const th = deviation?.s, thd = deviation?.v, thdd = deviation?.a;
  for (let j = 0; j < n; j++) {
    const phi = s[j] as number, phid = v[j] as number, phidd = a[j] as number;
    const C = Math.cos(phi), S = Math.sin(phi);
    const qx = C * a0x + S * t0x, qy = C * a0y + S * t0y, qz = C * a0z + S * t0z;
    const px = C * t0x - S * a0x, py = C * t0y - S * a0y, pz = C * t0z - S * a0z;
    let ct = 1, st = 0, td = 0, tdd = 0;
    if (th) {
      const t = th[j] as number;
      ct = Math.cos(t); st = Math.sin(t); td = (thd as Float64Array)[j] as number; tdd = (thdd as Float64Array)[j] as number;
    }
    // e_r, ė_r, ë_r as coefficients on (q, p, n)
    const rq = ct, rn = st;
    const vq = -td * st, vp = ct * phid, vn = td * ct;
    const aq = -tdd * st - td * td * ct - ct * phid * phid, ap = ct * phidd - 2 * td * phid * st, an = tdd * ct - td * td * st;
    Rx[j] = hx + mu * (rq * qx + rn * nx); Ry[j] = hy + mu * (rq * qy + rn * ny); Rz[j] = hz + mu * (rq * qz + rn * nz);
    Vx[j] = mu * (vq * qx + vp * px + vn * nx); Vy[j] = mu * (vq * qy + vp * py + vn * ny); Vz[j] = mu * (vq * qz + vp * pz + vn * nz);
    Ax[j] = mu * (aq * qx + ap * px + an * nx); Ay[j] = mu * (aq * qy + ap * py + an * ny); Az[j] = mu * (aq * qz + ap * pz + an * nz);
    E1x[j] = ct * qx + st * nx; E1y[j] = ct * qy + st * ny; E1z[j] = ct * qz + st * nz;
    E2x[j] = px; E2y[j] = py; E2z[j] = pz;
    E3x[j] = ct * nx - st * qx; E3y[j] = ct * ny - st * qy; E3z[j] = ct * nz - st * qz;
  }
  return k;
}

/** Allocate a LoadSeries of n samples (7 components × 6 axes). */
export const allocLoads = (n: number): LoadSeries => ({ n, data: new Float64Array(N_COMPONENTS * N_AXES * n) });

/**
 * Loads from kinematics and body motion into `out` (samples offset..offset+n of a series of
 * length out.n, so that long runs can be filled piecewise). The motion is indexed from `motionOffset`.
 */
export function loads(k: Kinematics, m: MotionSeries, M: number, out: LoadSeries, offset = 0, motionOffset = 0): LoadSeries {
  const { n } = k;
  const N = out.n;
  const d = out.data;
  const [Rx, Ry, Rz] = k.R as [Float64Array, Float64Array, Float64Array];
  const [Vx, Vy, Vz] = k.V as [Float64Array, Float64Array, Float64Array];
  const [Ax, Ay, Az] = k.A as [Float64Array, Float64Array, Float64Array];
  const st = m.stride;
  const base = (c: number, axis: number) => (c * N_AXES + axis) * N + offset;
  const P = base(0, 0);
  const cs = base(1, 0) - P; // one component further
  let at: number;
  for (let j = 0; j < n; j++) {
    const i = (motionOffset + j) * st;
    const wx = m.wx[i] as number, wy = m.wy[i] as number, wz = m.wz[i] as number;
    const dwx = m.dwx[i] as number, dwy = m.dwy[i] as number, dwz = m.dwz[i] as number;
    const rx = Rx[j] as number, ry = Ry[j] as number, rz = Rz[j] as number;
    const vx = Vx[j] as number, vy = Vy[j] as number, vz = Vz[j] as number;
    // primary −Σm a_rel
    const px = -(Ax[j] as number), py = -(Ay[j] as number), pz = -(Az[j] as number);
    // centrifugal −Ω×(Ω×R) = R|Ω|² − Ω(Ω·R)
    const w2 = wx * wx + wy * wy + wz * wz, wr = wx * rx + wy * ry + wz * rz;
    const cx = rx * w2 - wx * wr, cy = ry * w2 - wy * wr, cz = rz * w2 - wz * wr;
    // angular acceleration −Ω̇×R
    const ex = -(dwy * rz - dwz * ry), ey = -(dwz * rx - dwx * rz), ez = -(dwx * ry - dwy * rx);
    // Coriolis −2Ω×V
    const ox = -2 * (wy * vz - wz * vy), oy = -2 * (wz * vx - wx * vz), oz = -2 * (wx * vy - wy * vx);
    // translational −M a_ref, gravity M g
    const tx = -M * (m.ax[i] as number), ty = -M * (m.ay[i] as number), tz = -M * (m.az[i] as number);
    const gx = M * (m.gx[i] as number), gy = M * (m.gy[i] as number), gz = M * (m.gz[i] as number);
    // total: the sum of the components
    const sx = px + cx + ex + ox + tx + gx, sy = py + cy + ey + oy + ty + gy, sz = pz + cz + ez + oz + tz + gz;
    at = P + j; d[at] = px; d[at + N] = py; d[at + 2 * N] = pz;
    at = P + j + 1 * cs; d[at] = cx; d[at + N] = cy; d[at + 2 * N] = cz;
    at = P + j + 2 * cs; d[at] = ex; d[at + N] = ey; d[at + 2 * N] = ez;
    at = P + j + 3 * cs; d[at] = ox; d[at + N] = oy; d[at + 2 * N] = oz;
    at = P + j + 4 * cs; d[at] = tx; d[at + N] = ty; d[at + 2 * N] = tz;
    at = P + j + 5 * cs; d[at] = gx; d[at + N] = gy; d[at + 2 * N] = gz;
    at = P + j + 6 * cs; d[at] = sx; d[at + N] = sy; d[at + 2 * N] = sz;
  }
  // Organ-frame projections of every component, one small loop each (a component that is zero on
  // every sample, e.g. gravity when it is off, projects to zeros without the arithmetic).
  for (let c = 0; c < N_COMPONENTS; c++) {
    const a = P + c * cs;
    if (isZero(d, a, n) && isZero(d, a + N, n) && isZero(d, a + 2 * N, n)) {
      d.fill(0, a + 3 * N, a + 3 * N + n);
      d.fill(0, a + 4 * N, a + 4 * N + n);
      d.fill(0, a + 5 * N, a + 5 * N + n);
    } else projectOnFrame(d, a, N, n, k);
  }
  return out;
}

/** True when d[at..at+n) holds only zeros. */
function isZero(d: Float64Array, at: number, n: number): boolean {
  for (let j = at; j < at + n; j++) if (d[j] !== 0) return false;
  return true;
}

/**
 * Series (x, y, z) at d[at + {0, 1, 2}·N + j] projected on the organ frame into the next three
 * series: (F·E1, F·E2, F·E3) at d[at + {3, 4, 5}·N + j], j < n.
 */
function projectOnFrame(d: Float64Array, at: number, N: number, n: number, k: Kinematics): void {
  const [E1x, E1y, E1z] = k.E1 as [Float64Array, Float64Array, Float64Array];
  const [E2x, E2y, E2z] = k.E2 as [Float64Array, Float64Array, Float64Array];
  const [E3x, E3y, E3z] = k.E3 as [Float64Array, Float64Array, Float64Array];
  for (let j = 0; j < n; j++) {
    const x = d[at + j] as number, y = d[at + N + j] as number, z = d[at + 2 * N + j] as number;
    d[at + 3 * N + j] = x * (E1x[j] as number) + y * (E1y[j] as number) + z * (E1z[j] as number);
    d[at + 4 * N + j] = x * (E2x[j] as number) + y * (E2y[j] as number) + z * (E2z[j] as number);
    d[at + 5 * N + j] = x * (E3x[j] as number) + y * (E3y[j] as number) + z * (E3z[j] as number);
  }
}
