/**
 * Hand-derived cases first (a mass at radius r on a body turning at ω feels m r ω² outward), then
 * one condition changed at a time; and the mirror organ's symmetry (design §2).
 */
import { describe, expect, it } from 'vitest';
import { compile, forces, parseScenario, sampleOrgan, type ForcesAnswer } from '../../src/index.js';
import { COMPONENTS } from '../../src/components.js';
import { addV, mulMV, normV, radialUnit, scaleV, secondDerivative, subV, unitV, type M3, type V3 } from './independent.js';

const run = (doc: unknown): ForcesAnswer => {
  const r = forces(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.answer;
};
const DEG = Math.PI / 180;
const G0 = 9.80665; // standard gravity, CGPM 1901 (exact)

type Series = Record<string, Record<string, number[]>>;
const seriesOf = (a: ForcesAnswer, organ = 0): Series => a.organs[organ]?.series?.loads as unknown as Series;
const maxAbs = (xs: number[]) => xs.reduce((m, x) => Math.max(m, Math.abs(x)), 0);
const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;

/** A proof mass 1.5 mm to the right of the body's centre, on a linear organ with a tiny drive. */
const m = 2e-9, r = 1.5e-3;
const massOnArm = (rate: { roll?: number; pitch?: number; yaw?: number }, extra: Record<string, unknown> = {}) => ({
  organ: { drive: 'linear', mass: m, frequency: 1000, amplitude: 1e-15, driveAxis: [1, 0, 0], senseAxis: [0, 0, 1], hinge: [0, r, 0], mirror: false },
  body: { rate, ...extra },
  sampling: { pointsPerBeat: 16, harmonics: 2 },
});

describe('forces(scenario) on hand-derived cases', () => {
  it('a mass at radius r on a body yawing at ω loads its support with m r ω² outward (+y), nothing else', () => {
    const omega = 3; // rad/s
    const s = seriesOf(run(massOnArm({ yaw: omega })));
    // −m Ω×(Ω×r) with Ω = ω z, r = r y: +m r ω² y.
    expect(mean(s.centrifugal!.y!) / (m * r * omega ** 2)).toBeCloseTo(1, 9);
    expect(maxAbs(s.centrifugal!.x!)).toBeLessThan(1e-9 * m * r * omega ** 2);
    expect(maxAbs(s.centrifugal!.z!)).toBe(0);
    expect(mean(s.total!.y!) / (m * r * omega ** 2)).toBeCloseTo(1, 9);
  });

  it('the same mass under a pitch rate (about the axis through it) feels no centrifugal load; under roll it feels m r ω² outward (+y) too', () => {
    expect(maxAbs(seriesOf(run(massOnArm({ pitch: 3 }))).centrifugal!.y!)).toBeLessThan(1e-20);
    expect(mean(seriesOf(run(massOnArm({ roll: 3 }))).centrifugal!.y!) / (m * r * 9)).toBeCloseTo(1, 9);
  });

  it('a rotary organ: arm L along +y, tiny stroke, yaw ω gives a mean radial centrifugal load m L ω² (outward)', () => {
    const L = 0.9e-3, omega = 5;
    const a = run({ organ: { mass: m, arm: L, frequency: 150, amplitude: 1e-9, rest: [0, 1, 0], normal: [1, 0, 0], mirror: false }, body: { rate: { yaw: omega } }, sampling: { pointsPerBeat: 16, harmonics: 2 } });
    expect(mean(seriesOf(a).centrifugal!.radial!) / (m * L * omega ** 2)).toBeCloseTo(1, 9);
  });

  it('a body that does not turn has zero Coriolis (and centrifugal, angular-acceleration) load, series and lines', () => {
    const a = run({ organ: { mass: 6e-9, arm: 8.5e-4, frequency: 180, amplitude: '85 deg', rest: [0, 1, 0], normal: [0.906, 0, 0.423], hinge: ['0.3 mm', '0.45 mm', '-0.2 mm'] }, body: { acceleration: [3, 0, 1], gravity: true }, output: { path: 'sampled' } });
    for (const organ of [0, 1]) {
      for (const c of ['coriolis', 'centrifugal', 'angularAcceleration']) {
        for (const xs of Object.values(seriesOf(a, organ)[c]!)) expect(maxAbs(xs)).toBe(0);
        expect(a.organs[organ]!.harmonics.filter((l) => l.component === c).every((l) => l.amplitude === 0)).toBe(true);
      }
    }
  });

  it('Coriolis scales linearly with the rate and changes sign with it; centrifugal scales with its square', () => {
    const doc = (k: number) => ({
      organ: { mass: 6e-9, arm: 8.5e-4, frequency: 180, amplitude: '70 deg', rest: [0.1, 1, 0], normal: [1, -0.1, 0.4], hinge: [1e-4, 3e-4, 0] },
      body: { rate: { roll: k * 0.7, pitch: k * -0.2, yaw: k * 4 } },
      sampling: { pointsPerBeat: 64 },
    });
    const one = seriesOf(run(doc(1))), two = seriesOf(run(doc(2))), neg = seriesOf(run(doc(-1)));
    for (const ax of ['x', 'y', 'z', 'radial', 'tangential', 'normal']) {
      const c1 = one.coriolis![ax]!, f1 = one.centrifugal![ax]!;
      const scaleC = maxAbs(c1), scaleF = maxAbs(f1);
      expect(scaleC).toBeGreaterThan(0);
      two.coriolis![ax]!.forEach((x, j) => expect(Math.abs(x - 2 * (c1[j] as number))).toBeLessThan(1e-13 * scaleC));
      neg.coriolis![ax]!.forEach((x, j) => expect(Math.abs(x + (c1[j] as number))).toBeLessThan(1e-13 * scaleC));
      two.centrifugal![ax]!.forEach((x, j) => expect(Math.abs(x - 4 * (f1[j] as number))).toBeLessThan(1e-13 * scaleF));
      neg.centrifugal![ax]!.forEach((x, j) => expect(Math.abs(x - (f1[j] as number))).toBeLessThan(1e-13 * scaleF));
    }
  });

  it('gravity: level, the load is m g along +z (down, ISO 1151-1); pitched up 30°, it leans to −x: m g (−sin 30°, 0, cos 30°)', () => {
    const stalkMass = 1e-9;
    const base = { mass: m, arm: 1e-3, frequency: 100, amplitude: 0.5, rest: [0, 1, 0], normal: [1, 0, 0], stalk: { length: 1e-3, outerRadius: 4e-5, modulus: 5e9, mass: stalkMass } };
    const level = seriesOf(run({ organ: base, body: { gravity: true } })).gravity!;
    const M = m + stalkMass;
    expect(mean(level.z!)).toBeCloseTo(M * G0, 20);
    expect(maxAbs(level.x!)).toBe(0);
    expect(maxAbs(level.y!)).toBe(0);
    const up = seriesOf(run({ organ: base, body: { gravity: true, attitude: { pitch: '30 deg' } } })).gravity!;
    expect(mean(up.x!) / (M * G0)).toBeCloseTo(-0.5, 14);
    expect(mean(up.z!) / (M * G0)).toBeCloseTo(Math.cos(30 * DEG), 14);
    const custom = seriesOf(run({ organ: base, body: { gravity: '1.62 m/s^2' } })).gravity!; // a lunar gravity, any value
    expect(mean(custom.z!) / M).toBeCloseTo(1.62, 12);
  });

  it('a forward acceleration a of the reference point loads the support with −m a (backwards), on every sample', () => {
    const s = seriesOf(run(massOnArm({}, { acceleration: ['2 m/s^2', 0, 0] })));
    for (const x of s.translational!.x!) expect(x).toBeCloseTo(-m * 2, 22);
    expect(maxAbs(s.translational!.y!)).toBe(0);
  });

  it('sampleOrgan with a constant angular acceleration Ω̇ about a fixed axis matches the inertial trajectory; the component is −Ω̇×Σm r', () => {
    // Rotation angle β(t) = Ω0 τ + α τ²/2 about a fixed unit axis k (τ = t − t_j): at t_j the body
    // rate is Ω0 k and its rate of change α k, with R(t_j) = I; X(t) = R(t) r(t).
    const doc = { organ: { mass: m, arm: 8e-4, frequency: 120, amplitude: 1.1, rest: unitV([0.3, 1, 0.2]), normal: unitV([1, -0.3, 0]), hinge: [2e-4, 1e-4, -3e-4] } };
    const p = parseScenario(doc);
    if (!p.ok) throw new Error(JSON.stringify(p.issues));
    const c = compile(p.scenario);
    if (!c.ok) throw new Error(JSON.stringify(c.issues));
    const g = c.model.geometry;
    const k = unitV([0.4, -0.5, 0.77]);
    const omega0 = 40, alpha = 9000; // rad/s, rad/s²
    const N = 32;
    const beat = sampleOrgan(g, { omega: scaleV(k, omega0), omegaDot: scaleV(k, alpha), accel: [0, 0, 0], gravity: [0, 0, 0] }, N).beat;
    const beatNeg = sampleOrgan(g, { omega: scaleV(k, omega0), omegaDot: scaleV(k, -alpha), accel: [0, 0, 0], gravity: [0, 0, 0] }, N).beat;
    const a0 = g.e1 as V3, n = g.e3 as V3;
    const w = 2 * Math.PI * 120;
    const at = (c: number, axis: number, j: number, b = beat) => b.data[(c * 6 + axis) * N + j] as number;
    const AA = COMPONENTS.indexOf('angularAcceleration'), TOT = COMPONENTS.indexOf('total');
    const geom = { a0, n, hinge: [0, 0, 0] as V3 };
    const body = (t: number): V3 => addV(g.hinge as V3, scaleV(radialUnit(geom, 1.1 * Math.sin(w * t), 0), 8e-4));
    /** −m Ẍ at t_j for the rotation angle β(τ) = Ω0 τ ± α τ²/2 about k (eighth-order central difference). */
    const load = (tj: number, sign: number): V3 => {
      const X = (t: number): V3 => {
        const tau = t - tj;
        return mulMV(rodriguesAbout(k, omega0 * tau + (sign * alpha * tau * tau) / 2), body(t));
      };
      return scaleV(secondDerivative(X, tj, 0.004 / w), -m);
    };
    for (const j of [0, 5, 11, 23]) {
      const tj = j / (N * 120);
      const plus = load(tj, 1), minus = load(tj, -1);
      const aaExpected = scaleV(subV(plus, minus), 0.5);
      const scale = normV(plus);
      for (let axis = 0; axis < 3; axis++) {
        expect(Math.abs(at(TOT, axis, j) - (plus[axis] as number)) / scale, `total axis ${axis} j ${j}`).toBeLessThan(1e-7);
        expect(Math.abs(at(TOT, axis, j, beatNeg) - (minus[axis] as number)) / scale).toBeLessThan(1e-7);
        expect(Math.abs(at(AA, axis, j) - (aaExpected[axis] as number)) / scale, `angular acceleration axis ${axis} j ${j}`).toBeLessThan(1e-7);
      }
      expect(normV(aaExpected) / scale).toBeGreaterThan(0.01); // the component is not negligible here
    }
  });
});

/** Rodrigues' formula for a rotation by angle β about unit axis k. */
function rodriguesAbout(k: V3, beta: number): M3 {
  const [x, y, z] = k;
  const c = Math.cos(beta), s = Math.sin(beta), C = 1 - c;
  return [
    [c + x * x * C, x * y * C - z * s, x * z * C + y * s],
    [y * x * C + z * s, c + y * y * C, y * z * C - x * s],
    [z * x * C - y * s, z * y * C + x * s, c + z * z * C],
  ];
}

describe('forces(scenario): the mirror organ (design §2)', () => {
  const organ = { mass: 6e-9, arm: 8.5e-4, frequency: 180, amplitude: '80 deg', rest: [0.2, 1, -0.1], normal: [0.9, -0.1, 0.8], hinge: ['0.3 mm', '0.45 mm', '-0.2 mm'] };
  const answer = (rate: Record<string, number>) => run({ organ, body: { rate }, sampling: { pointsPerBeat: 64 } });
  const organAxes = ['radial', 'tangential', 'normal'];

  it('sits on the other side, with the reflected frame', () => {
    const a = answer({ yaw: 3 });
    expect(a.organs.map((o) => [o.side, o.role])).toEqual([['right', 'specified'], ['left', 'mirror']]);
    for (const ax of organAxes) {
      const f = a.organs[0]!.frame[ax]!, g = a.organs[1]!.frame[ax]!;
      expect(g).toEqual([f[0], -f[1], f[2]]);
    }
  });

  it('a pitch rate gives identical organ-frame signals on both organs, and body-axis y of opposite sign', () => {
    const a = answer({ pitch: 4 });
    const s0 = seriesOf(a, 0), s1 = seriesOf(a, 1);
    for (const c of COMPONENTS) {
      for (const ax of organAxes) s1[c]![ax]!.forEach((x, j) => expect(Math.abs(x - (s0[c]![ax]![j] as number))).toBeLessThanOrEqual(1e-15 * (maxAbs(s0.total![ax]!) + 1e-30)));
      s1[c]!.x!.forEach((x, j) => expect(x).toBeCloseTo(s0[c]!.x![j] as number, 25));
      s1[c]!.y!.forEach((x, j) => expect(x).toBeCloseTo(-(s0[c]!.y![j] as number), 25));
    }
    expect(maxAbs(s0.coriolis!.normal!)).toBeGreaterThan(0);
  });

  for (const axis of ['roll', 'yaw'] as const) {
    it(`a ${axis} rate gives Coriolis signals of opposite sign on the two organs (organ frame), primary identical`, () => {
      const a = answer({ [axis]: 4 });
      const s0 = seriesOf(a, 0), s1 = seriesOf(a, 1);
      for (const ax of organAxes) {
        const scale = maxAbs(s0.coriolis![ax]!);
        s1.coriolis![ax]!.forEach((x, j) => expect(Math.abs(x + (s0.coriolis![ax]![j] as number))).toBeLessThanOrEqual(1e-13 * scale));
        s1.primary![ax]!.forEach((x, j) => expect(x).toBe(s0.primary![ax]![j]));
      }
      expect(maxAbs(s0.coriolis!.normal!)).toBeGreaterThan(0);
      // The harmonic lines follow: equal amplitudes, phases π apart.
      const l0 = a.organs[0]!.harmonics.find((l) => l.component === 'coriolis' && l.axis === 'normal' && l.order === 1)!;
      const l1 = a.organs[1]!.harmonics.find((l) => l.component === 'coriolis' && l.axis === 'normal' && l.order === 1)!;
      expect(l1.amplitude / l0.amplitude).toBeCloseTo(1, 12);
      expect(Math.abs(Math.cos(l1.phase - l0.phase) + 1)).toBeLessThan(1e-12);
    });
  }
});
