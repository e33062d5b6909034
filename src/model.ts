/**
 * A scenario compiled for computation: geometry as orthonormal vectors, strokes as Waves,
 * masses lumped into the two moments that the loads need. Pure; no I/O.
 */
import type { Issue, Scenario } from './scenario.js';
import { add, cross, dot, mirrorY, scale, unit, type Vec3 } from './vec.js';
import { fromTerms, strokeWave, type FitReport, type Wave } from './waveform.js';

export interface Geometry {
  drive: 'rotary' | 'linear';
  frequency: number;
  /** Σ m_i: proof mass plus stalk (kg). */
  mass: number;
  /** Σ m_i s_i along the arm (kg·m): m L + m_s L_s / 2 (rotary); m (linear, times x(t)). */
  moment: number;
  hinge: Vec3;
  /** Rotary: rest a0, t0 = n × a0, normal n. Linear: drive d, sense s, cross d × s. */
  e1: Vec3;
  e2: Vec3;
  e3: Vec3;
  stroke: Wave;
  deviation?: Wave;
}

/** Body motion held constant over the beat (the `forces` and `sensing` routes). */
export interface Motion {
  /** Body rate Ω (rad/s), body axes: [roll, pitch, yaw]. */
  omega: Vec3;
  /** Ω̇ (rad/s²). */
  omegaDot: Vec3;
  /** Acceleration of the reference point (m/s²), body axes. */
  accel: Vec3;
  /** Gravity (m/s²), body axes. */
  gravity: Vec3;
}

export interface Model {
  geometry: Geometry;
  motion: Motion;
  fit?: FitReport;
  deviationFit?: FitReport;
  /** Side of the specified organ; its mirror has the other. */
  side: Side;
  mirror: boolean;
}

export type Side = 'right' | 'left' | 'midline';

export const STANDARD_GRAVITY = 9.80665; // m/s², CGPM 1901 (exact by definition)

/**
 * Gravity in body axes for an attitude given as ZYX Euler angles (yaw ψ, pitch θ, roll φ),
 * world axes north-east-down: g_b = g [−sin θ, sin φ cos θ, cos φ cos θ].
 */
export function gravityInBody(g: number, attitude: { roll: number; pitch: number }): Vec3 {
  const { roll, pitch } = attitude;
  return [-g * Math.sin(pitch), g * Math.sin(roll) * Math.cos(pitch), g * Math.cos(roll) * Math.cos(pitch)];
}

/**
 * The mirror organ (reflection P: y → −y, beating in phase) under body motion M equals the
 * specified organ under the mirrored motion Ω* = −PΩ, Ω̇* = −PΩ̇, a* = Pa, g* = Pg, with its
 * body-axis loads reflected by P and its organ-frame loads unchanged (design §2).
 */
export function mirroredMotion(m: Motion): Motion {
  const pseudo = (v: Vec3): Vec3 => [-v[0], v[1], -v[2]];
  return { omega: pseudo(m.omega), omegaDot: pseudo(m.omegaDot), accel: mirrorY(m.accel), gravity: mirrorY(m.gravity) };
}

export const sideOf = (y: number): Side => (y > 1e-15 ? 'right' : y < -1e-15 ? 'left' : 'midline');

export type CompileResult = { ok: true; model: Model } | { ok: false; issues: Issue[] };

/** Compile a parsed scenario; measured traces are fitted here. */
export function compile(s: Scenario): CompileResult {
  const o = s.organ;
  const issues: Issue[] = [];
  const st = strokeWave(o.waveform, { amplitude: o.amplitude, peakToPeak: o.peakToPeak, mean: o.mean, frequency: o.frequency });
  if (st.error) issues.push({ path: 'organ.waveform.samples', message: st.error });
  if (o.drive === 'rotary' && !st.error && st.wave.kind === 'series') {
    // A hinged beam cannot swing a full turn; a series that adds up to more is a unit slip or a
    // fit gone wild, and would send the aliasing estimate (Bessel orders ~ swing) out of bounds.
    let swing = 0;
    for (let k = 0; k < st.wave.cos.length; k++) swing += Math.hypot(st.wave.cos[k] as number, st.wave.sin[k] as number);
    if (!(swing < 2 * Math.PI)) issues.push({ path: 'organ.waveform', message: `the stroke's harmonics add up to ${swing.toPrecision(3)} rad, more than a full turn; expected a stroke within ±π (give angles as strings in degrees, or check samples.angleUnit)` });
  }
  let deviation: Wave | undefined;
  let deviationFit: FitReport | undefined;
  let geometry: Geometry;
  if (o.drive === 'rotary') {
    if (o.deviation) {
      const dv = 'samples' in o.deviation ? strokeWave(o.deviation, { frequency: o.frequency }) : { wave: fromTerms(o.deviation.mean, o.deviation.harmonics) };
      if (dv.error) issues.push({ path: 'organ.deviation.samples', message: dv.error });
      deviation = dv.wave;
      deviationFit = 'fit' in dv ? dv.fit : undefined;
    }
    const n = o.normal;
    const a0 = unit(add(o.rest, scale(n, -dot(o.rest, n)))); // remove the ≤1e-6 non-orthogonality exactly
    const ms = o.stalk?.mass ?? 0;
    const ls = o.stalk?.length ?? 0;
    geometry = {
      drive: 'rotary', frequency: o.frequency, mass: o.mass + ms, moment: o.mass * o.arm + (ms * ls) / 2,
      hinge: o.hinge, e1: a0, e2: cross(n, a0), e3: n, stroke: st.wave, deviation,
    };
  } else {
    const d = o.driveAxis;
    const sAxis = unit(add(o.senseAxis, scale(d, -dot(o.senseAxis, d))));
    geometry = { drive: 'linear', frequency: o.frequency, mass: o.mass, moment: o.mass, hinge: o.hinge, e1: d, e2: sAxis, e3: cross(d, sAxis), stroke: st.wave };
  }
  if (issues.length > 0) return { ok: false, issues };
  const b = s.body;
  const g = b.gravity === true ? STANDARD_GRAVITY : b.gravity === false ? 0 : b.gravity;
  const motion: Motion = {
    omega: [b.rate.roll, b.rate.pitch, b.rate.yaw],
    omegaDot: [0, 0, 0],
    accel: b.acceleration,
    gravity: gravityInBody(g, b.attitude),
  };
  const restPoint = o.drive === 'rotary' ? add(o.hinge, scale(geometry.e1, o.arm)) : o.hinge;
  return { ok: true, model: { geometry, motion, fit: st.fit, deviationFit, side: sideOf(restPoint[1]), mirror: o.mirror } };
}
