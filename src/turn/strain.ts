/**
 * Stalk strain at the base over a maneuver, at the full sample rate (design §6, §7), from the
 * organ-frame total load and the stalk section of the sensing layer (sensing/strain.ts):
 *
 *   ε_axial      = F_r / (E A)
 *   ε_inPlane    = k_t(ℓ_J) (F_t − U_t) + k_t(ℓ_U) U_t
 *   ε_outOfPlane = k_n(ℓ_J) (F_n − U_n) + k_n(ℓ_U) U_n
 *
 * with k_b(ℓ) the strain per newton on organ axis b for a lever arm ℓ (`strainPerLoad`). Loads that
 * grow along the arm (primary, Coriolis, the arm terms of centrifugal and angular acceleration) act
 * at ℓ_J = J/μ (`leverArm`); the part that is uniform along the arm,
 *   U = M (g − a_ref) − Ω × (Ω × M h) − Ω̇ × M h     (body axes, projected on e_t and e_n),
 * acts at ℓ_U = μ/M. The two levers agree for a massless stalk (both L).
 */
import type { Kinematics, LoadSeries, MotionSeries } from '../loads.js';
import { N_AXES, TOTAL } from '../components.js';
import type { Geometry } from '../model.js';
import type { Organ } from '../scenario.js';
import { leverArm, section, strainPerLoad } from '../sensing/strain.js';

export const STRAIN_KINDS = ['axial', 'inPlane', 'outOfPlane'] as const;
export type StrainKind = (typeof STRAIN_KINDS)[number];

export interface StrainPlan {
  /** Strain per newton on [radial, tangential, normal] at the arm lever ℓ_J. */
  arm: [number, number, number];
  /** The same at the uniform-load lever ℓ_U = μ/M. */
  uniform: [number, number, number];
  /** M h (kg·m), body axes. */
  Mh: [number, number, number];
  M: number;
}

/** The strain plan of a rotary organ with a stalk; undefined otherwise. */
export function strainPlan(organ: Organ, g: Geometry): StrainPlan | undefined {
  if (organ.drive !== 'rotary' || !organ.stalk) return undefined;
  const sec = section(organ.stalk);
  return {
    arm: strainPerLoad(organ.stalk, sec, leverArm(organ)),
    uniform: strainPerLoad(organ.stalk, sec, g.moment / g.mass),
    Mh: [g.mass * g.hinge[0], g.mass * g.hinge[1], g.mass * g.hinge[2]],
    M: g.mass,
  };
}

/**
 * Strain of one beat (a one-beat LoadSeries, its kinematics and the motion from `motionOffset`)
 * into out[kind][offset + j].
 */
export function beatStrain(p: StrainPlan, beat: LoadSeries, k: Kinematics, m: MotionSeries, motionOffset: number, out: readonly [Float64Array, Float64Array, Float64Array], offset: number): void {
  const n = beat.n, d = beat.data;
  const R = (TOTAL * N_AXES + 3) * n, T = R + n, Nn = T + n;
  const [ax, ay, az] = out;
  const [hx, hy, hz] = p.Mh;
  const M = p.M;
  const [e2x, e2y, e2z] = k.E2 as [Float64Array, Float64Array, Float64Array];
  const [e3x, e3y, e3z] = k.E3 as [Float64Array, Float64Array, Float64Array];
  const [kr, ktA, knA] = p.arm;
  const ktU = p.uniform[1], knU = p.uniform[2];
  for (let j = 0; j < n; j++) {
    const i = motionOffset + j;
    const wx = m.wx[i] as number, wy = m.wy[i] as number, wz = m.wz[i] as number;
    const dwx = m.dwx[i] as number, dwy = m.dwy[i] as number, dwz = m.dwz[i] as number;
    // Ω × M h, then −Ω × (Ω × M h), and −Ω̇ × M h
    const cx = wy * hz - wz * hy, cy = wz * hx - wx * hz, cz = wx * hy - wy * hx;
    const ux = -(wy * cz - wz * cy) - (dwy * hz - dwz * hy) + M * ((m.gx[i] as number) - (m.ax[i] as number));
    const uy = -(wz * cx - wx * cz) - (dwz * hx - dwx * hz) + M * ((m.gy[i] as number) - (m.ay[i] as number));
    const uz = -(wx * cy - wy * cx) - (dwx * hy - dwy * hx) + M * ((m.gz[i] as number) - (m.az[i] as number));
    const ut = ux * (e2x[j] as number) + uy * (e2y[j] as number) + uz * (e2z[j] as number);
    const un = ux * (e3x[j] as number) + uy * (e3y[j] as number) + uz * (e3z[j] as number);
    ax[offset + j] = kr * (d[R + j] as number);
    ay[offset + j] = ktA * ((d[T + j] as number) - ut) + ktU * ut;
    az[offset + j] = knA * ((d[Nn + j] as number) - un) + knU * un;
  }
}

export interface StrainPeak {
  /** The strain of largest magnitude (signed). */
  value: number;
  time: number;
  beat: number;
}

/** The sample of largest |ε| in x[0..count) (the first, on ties). */
export function peakOf(x: Float64Array, count: number, dt: number, pointsPerBeat: number): StrainPeak {
  let at = 0, best = -1;
  for (let j = 0; j < count; j++) {
    const v = Math.abs(x[j] as number);
    if (v > best) {
      best = v;
      at = j;
    }
  }
  return { value: x[at] as number, time: at * dt, beat: Math.floor(at / pointsPerBeat) };
}
