import { describe, expect, it } from 'vitest';
import { gravityInBody } from '../../src/model.js';
import { fromEuler, gravitySeries, integrateAttitude, toEuler, type Quaternion } from '../../src/turn/attitude.js';
import { axisAt, rateProfile, sampleAxis, type RateProfile } from '../../src/turn/profiles.js';

type M3 = number[][];
const mul = (a: M3, b: M3): M3 => a.map((row) => [0, 1, 2].map((j) => row.reduce((s, x, k) => s + x * (b[k]?.[j] ?? 0), 0)));
const skew = (v: number[]): M3 => [[0, -(v[2] ?? 0), v[1] ?? 0], [v[2] ?? 0, 0, -(v[0] ?? 0)], [-(v[1] ?? 0), v[0] ?? 0, 0]];

/** Rotation matrix of a unit quaternion (body → world). */
const matrixOf = (w: number, x: number, y: number, z: number): M3 => [
  [1 - 2 * (y * y + z * z), 2 * (x * y - w * z), 2 * (x * z + w * y)],
  [2 * (x * y + w * z), 1 - 2 * (x * x + z * z), 2 * (y * z - w * x)],
  [2 * (x * z - w * y), 2 * (y * z + w * x), 1 - 2 * (x * x + y * y)],
];

/** Rodrigues' rotation formula: exp([k]× θ) = I + sin θ K + (1 − cos θ) K², |k| = 1. */
const rodrigues = (axis: number[], angle: number): M3 => {
  const K = skew(axis);
  const K2 = mul(K, K);
  return [0, 1, 2].map((i) => [0, 1, 2].map((j) => (i === j ? 1 : 0) + Math.sin(angle) * (K[i]?.[j] ?? 0) + (1 - Math.cos(angle)) * (K2[i]?.[j] ?? 0)));
};

/** Run the attitude over n samples of step h for a profile, as the turn engine does. */
function attitudeOf(profile: RateProfile, q0: Quaternion, h: number, n: number) {
  const three = () => [new Float64Array(n), new Float64Array(n), new Float64Array(n)] as [Float64Array, Float64Array, Float64Array];
  const rate = three(), mid = three();
  const scratch = new Float64Array(n);
  for (let a = 0; a < 3; a++) {
    sampleAxis(profile.axes[a] ?? [], h, n, rate[a] as Float64Array, scratch);
    sampleAxis(profile.axes[a] ?? [], h, n - 1, mid[a] as Float64Array, scratch, h / 2);
  }
  const out = { w: new Float64Array(n), x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n) };
  const report = integrateAttitude(q0, rate, mid, h, n, out);
  return { out, report };
}

/**
 * Independent reference: Ṙ = R [Ω]× on the rotation matrix, integrated with the 5th-order
 * Dormand–Prince weights (Hairer, Nørsett & Wanner, Solving ODEs I, Table II.5.2) at fixed step.
 */
function referenceMatrix(profile: RateProfile, R0: M3, t1: number, steps: number): M3 {
  const c = [0, 1 / 5, 3 / 10, 4 / 5, 8 / 9, 1];
  const A = [[], [1 / 5], [3 / 40, 9 / 40], [44 / 45, -56 / 15, 32 / 9], [19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729], [9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656]];
  const b = [35 / 384, 0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84];
  const omega = (t: number) => profile.axes.map((terms) => axisAt(terms, t).rate);
  const f = (R: M3, t: number) => mul(R, skew(omega(t)));
  const axpy = (R: M3, ks: M3[], ws: number[], h: number): M3 => R.map((row, i) => row.map((x, j) => x + h * ks.reduce((s, K, m) => s + (ws[m] ?? 0) * (K[i]?.[j] ?? 0), 0)));
  let R = R0;
  const h = t1 / steps;
  for (let s = 0; s < steps; s++) {
    const t = s * h;
    const ks: M3[] = [];
    for (let i = 0; i < 6; i++) ks.push(f(axpy(R, ks, A[i] ?? [], h), t + (c[i] ?? 0) * h));
    R = axpy(R, ks, b, h);
  }
  return R;
}

const maxDiff = (a: M3, b: M3) => Math.max(...a.flatMap((row, i) => row.map((x, j) => Math.abs(x - (b[i]?.[j] ?? 0)))));

describe('integrateAttitude', () => {
  it('at a constant rate follows the closed-form rotation of Rodrigues\' formula', () => {
    const omega = [1.7, -0.9, 26.2]; // rad/s, body axes
    const profile = rateProfile({ roll: [{ kind: 'constant', rate: omega[0] as number }], pitch: [{ kind: 'constant', rate: omega[1] as number }], yaw: [{ kind: 'constant', rate: omega[2] as number }] });
    const att = { roll: 0.2, pitch: -0.1, yaw: 1 };
    const q0 = fromEuler(att);
    const h = 1 / (256 * 200), n = 40 * 256;
    const { out } = attitudeOf(profile, q0, h, n);
    const R0 = matrixOf(...q0);
    const rate = Math.hypot(...omega);
    for (const j of [1, 100, 5000, n - 1]) {
      const expected = mul(R0, rodrigues(omega.map((x) => x / rate), rate * j * h));
      const got = matrixOf(out.w[j] as number, out.x[j] as number, out.y[j] as number, out.z[j] as number);
      expect(maxDiff(got, expected)).toBeLessThan(1e-11);
    }
  });

  it('over a pulse with a roll sine agrees with an independent 5th-order integration of the rotation matrix', () => {
    const profile = rateProfile({
      yaw: [{ kind: 'pulse', peak: 26.18, duration: 0.06, start: 0.04 }],
      roll: [{ kind: 'sine', amplitude: 3.49, frequency: 12, phase: 0.4 }],
      pitch: [{ kind: 'pulse', peak: -8, duration: 0.03, start: 0.07 }],
    });
    const q0 = fromEuler({ roll: 0.1, pitch: 0.3, yaw: -0.5 });
    // a coarse grid (16 points per beat at 200 Hz) so that the comparison has something to resolve
    const h = 1 / (16 * 200), n = 40 * 16 + 1;
    const { out } = attitudeOf(profile, q0, h, n);
    const ref = referenceMatrix(profile, matrixOf(...q0), (n - 1) * h, 6400);
    const got = matrixOf(out.w[n - 1] as number, out.x[n - 1] as number, out.y[n - 1] as number, out.z[n - 1] as number);
    expect(maxDiff(got, ref)).toBeLessThan(1e-8);
    // and the body did turn: about 90° of yaw from the pulse (P D / 2 = 0.785 rad)
    expect(maxDiff(got, matrixOf(...q0))).toBeGreaterThan(0.5);
  });

  it('keeps the quaternion normalised at every sample', () => {
    const profile = rateProfile({ yaw: [{ kind: 'sine', amplitude: 40, frequency: 30, phase: 0 }], roll: [{ kind: 'constant', rate: 15 }] });
    const n = 20_000;
    const { out, report } = attitudeOf(profile, [1, 0, 0, 0], 1e-4, n);
    let worst = 0;
    for (let j = 0; j < n; j++) worst = Math.max(worst, Math.abs(Math.hypot(out.w[j] as number, out.x[j] as number, out.y[j] as number, out.z[j] as number) - 1));
    expect(worst).toBeLessThan(1e-15); // a few ulp
    expect(report.normDrift).toBeLessThan(1e-10);
  });
});

describe('gravity in body axes', () => {
  it('fromEuler(attitude) gives the gravity of the core\'s gravityInBody (ZYX Euler)', () => {
    for (const att of [{ roll: 0.3, pitch: -0.4, yaw: 2 }, { roll: -2.5, pitch: 1.2, yaw: -1 }]) {
      const q = fromEuler(att);
      const gx = new Float64Array(1), gy = new Float64Array(1), gz = new Float64Array(1);
      gravitySeries({ w: Float64Array.of(q[0]), x: Float64Array.of(q[1]), y: Float64Array.of(q[2]), z: Float64Array.of(q[3]) }, 9.80665, 1, gx, gy, gz);
      const g = gravityInBody(9.80665, att);
      expect(gx[0]).toBeCloseTo(g[0], 13);
      expect(gy[0]).toBeCloseTo(g[1], 13);
      expect(gz[0]).toBeCloseTo(g[2], 13);
      const back = toEuler(...q);
      expect(back.roll).toBeCloseTo(att.roll, 13);
      expect(back.pitch).toBeCloseTo(att.pitch, 13);
      expect(back.yaw).toBeCloseTo(att.yaw, 13);
    }
  });

  it('turns with the body: a level roll at rate p gives g (0, sin pt, cos pt) (hand-derived)', () => {
    const p = 10;
    const profile = rateProfile({ roll: [{ kind: 'constant', rate: p }] });
    const h = 1e-4, n = 2001;
    const { out } = attitudeOf(profile, [1, 0, 0, 0], h, n);
    const gx = new Float64Array(n), gy = new Float64Array(n), gz = new Float64Array(n);
    gravitySeries(out, 9.80665, n, gx, gy, gz);
    for (const j of [0, 500, 1234, 2000]) {
      expect(gx[j]).toBeCloseTo(0, 12);
      expect(gy[j]).toBeCloseTo(9.80665 * Math.sin(p * j * h), 10);
      expect(gz[j]).toBeCloseTo(9.80665 * Math.cos(p * j * h), 10);
    }
  });
});
