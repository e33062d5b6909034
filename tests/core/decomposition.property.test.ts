/**
 * The check that must always hold (design §4): the load decomposition equals the load computed
 * independently from the inertial-frame trajectory, −Σ m Rᵀ Ẍ + Σ m g, with R(t) from Rodrigues'
 * formula and Ẍ from an eighth-order central finite difference (tests/core/independent.ts).
 * Components are isolated without the core's formulas: Coriolis (odd in Ω) is half the difference
 * of the trajectories at +Ω and −Ω, centrifugal (even in Ω) their half sum minus the trajectory at
 * Ω = 0, primary the trajectory at Ω = 0 minus the translational and gravity loads.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { COMPONENTS, forces, type ForcesAnswer } from '../../src/index.js';
import {
  addV, crossV, dot, gravityBody, inertialLoad, mirrorV, normV, radialUnit, rotaryFrame, scaleV, seriesStroke, sineStroke, subV,
  triangleStroke, unitV, type PointMass, type RotaryGeom, type Stroke, type V3,
} from './independent.js';

const N = 32; // points per beat of the library's series
const CHECKED = [0, 3, 5, 8, 13, 16, 21, 27, 31]; // samples compared (the FD costs 9 trajectory points each)

const finiteIn = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true, noDefaultInfinity: true });

/** A random unit vector and a random unit vector perpendicular to it. */
const unitPair = fc
  .tuple(fc.tuple(finiteIn(-1, 1), finiteIn(-1, 1), finiteIn(-1, 1)), fc.tuple(finiteIn(-1, 1), finiteIn(-1, 1), finiteIn(-1, 1)))
  .filter(([a, b]) => normV(a) > 0.2 && normV(b) > 0.2 && normV(crossV(a, b)) > 0.2 * normV(a) * normV(b))
  .map(([a, b]): [V3, V3] => {
    const u = unitV(a);
    return [u, unitV(subV(b, scaleV(u, dot(b, u))))];
  });

const vec = (scale: number) => fc.tuple(finiteIn(-scale, scale), finiteIn(-scale, scale), finiteIn(-scale, scale));

/** Stroke waveforms: [document fields, waveform for the independent code given f and the stroke scale]. */
type WaveCase = { doc: Record<string, unknown>; stroke: (f: number) => Stroke };
const waveCase = (scale: number): fc.Arbitrary<WaveCase> =>
  fc.oneof(
    fc.record({ amp: finiteIn(0.05, 1.4), mean: finiteIn(-0.5, 0.5) }).map(({ amp, mean }) => ({
      doc: { waveform: 'sine', amplitude: amp * scale, mean: mean * scale },
      stroke: (f: number) => sineStroke(f, amp * scale, mean * scale),
    })),
    fc
      .record({
        mean: finiteIn(-0.3, 0.3),
        terms: fc.array(fc.record({ order: fc.integer({ min: 1, max: 4 }), cos: finiteIn(-0.5, 0.5), sin: finiteIn(-0.5, 0.5) }), { minLength: 1, maxLength: 4 }).filter((ts) => ts.some((h) => Math.hypot(h.cos, h.sin) > 0.02)),
      })
      .map(({ mean, terms }) => {
        const t = terms.map((h) => ({ order: h.order, cos: h.cos * scale, sin: h.sin * scale }));
        return { doc: { waveform: { harmonics: t }, mean: mean * scale }, stroke: (f: number) => seriesStroke(f, mean * scale, t) };
      }),
    fc.record({ amp: finiteIn(0.05, 1.2), rounding: finiteIn(0.2, 0.95), mean: finiteIn(-0.3, 0.3) }).map(({ amp, rounding, mean }) => ({
      doc: { waveform: { triangle: { rounding } }, amplitude: amp * scale, mean: mean * scale },
      stroke: (f: number) => triangleStroke(f, amp * scale, rounding, mean * scale),
    })),
  );

/** Body motion: constant rates as fractions of ω (zero included), acceleration, gravity, attitude. */
const motionCase = fc.record({
  rate: fc.oneof(fc.constant<V3>([0, 0, 0]), vec(0.4), fc.tuple(fc.constant(0), finiteIn(-0.4, 0.4), fc.constant(0))),
  accel: fc.oneof(fc.constant<V3>([0, 0, 0]), vec(60)),
  gravity: fc.boolean(),
  attitude: vec(1),
});

interface Expectation {
  /** Body-axis loads per component (expected), per checked sample. */
  body: Record<string, V3[]>;
  /** Organ frame (independent) per checked sample. */
  frame: [V3, V3, V3][];
}

/**
 * Expected loads for one organ from the inertial trajectories at +Ω, −Ω and 0 (design §4 check).
 */
function expectFor(points: PointMass[], frame: (t: number) => [V3, V3, V3], totalMass: number, w: V3, a: V3, g: V3, f: number): Expectation {
  const h = 0.005 / (2 * Math.PI * f);
  const body: Record<string, V3[]> = Object.fromEntries(COMPONENTS.map((c) => [c, [] as V3[]]));
  const frames: [V3, V3, V3][] = [];
  for (const j of CHECKED) {
    const t = j / (N * f);
    const plus = inertialLoad(points, w, a, g, t, h);
    const minus = inertialLoad(points, scaleV(w, -1), a, g, t, h);
    const still = inertialLoad(points, [0, 0, 0], a, g, t, h);
    const translational = scaleV(a, -totalMass);
    const gravity = scaleV(g, totalMass);
    body.total!.push(plus);
    body.coriolis!.push(scaleV(subV(plus, minus), 0.5));
    body.centrifugal!.push(subV(scaleV(addV(plus, minus), 0.5), still));
    body.primary!.push(subV(subV(still, translational), gravity));
    body.angularAcceleration!.push([0, 0, 0]);
    body.translational!.push(translational);
    body.gravity!.push(gravity);
    frames.push(frame(t));
  }
  return { body, frame: frames };
}

/** Compare one organ of a forces answer with expectations; returns the worst relative error. */
function compareOrgan(answer: ForcesAnswer, organ: number, ex: Expectation, axes: readonly string[]): { worst: number; sumError: number } {
  const series = answer.organs[organ]?.series;
  if (!series) throw new Error('no series');
  let scale = 0;
  for (const v of ex.body.total!) scale = Math.max(scale, normV(v));
  let worst = 0;
  for (const c of COMPONENTS) {
    const byAxis = series.loads[c] as Record<string, number[]>;
    CHECKED.forEach((j, i) => {
      const e = ex.body[c]![i] as V3;
      const fr = ex.frame[i] as [V3, V3, V3];
      const want = [e[0], e[1], e[2], dot(e, fr[0]), dot(e, fr[1]), dot(e, fr[2])];
      axes.forEach((ax, ai) => {
        const got = byAxis[ax]?.[j] as number;
        worst = Math.max(worst, Math.abs(got - (want[ai] as number)) / scale);
      });
    });
  }
  // The total is the sum of the components, sample by sample, on every axis.
  let sumError = 0;
  for (const ax of axes) {
    for (let j = 0; j < N; j++) {
      const parts = COMPONENTS.slice(0, -1).reduce((s, c) => s + ((series.loads[c] as Record<string, number[]>)[ax]?.[j] as number), 0);
      sumError = Math.max(sumError, Math.abs(parts - ((series.loads.total as Record<string, number[]>)[ax]?.[j] as number)) / scale);
    }
  }
  return { worst, sumError };
}

describe('forces(scenario) decomposition against the inertial-frame trajectory (design §4)', () => {
  it('holds for rotary organs: random geometry, hinge, stalk, waveform, deviation, rates, acceleration, gravity, mirror', () => {
    fc.assert(
      fc.property(
        unitPair,
        vec(1e-3),
        fc.record({ mass: finiteIn(1e-9, 1e-7), arm: finiteIn(2e-4, 2e-3), f: finiteIn(40, 400) }),
        fc.option(fc.record({ mass: finiteIn(1e-10, 5e-8), length: finiteIn(1e-4, 2e-3) }), { nil: undefined }),
        waveCase(1),
        fc.option(fc.record({ mean: finiteIn(-0.2, 0.2), terms: fc.array(fc.record({ order: fc.integer({ min: 1, max: 3 }), cos: finiteIn(-0.3, 0.3), sin: finiteIn(-0.3, 0.3) }), { minLength: 1, maxLength: 3 }) }), { nil: undefined }),
        motionCase,
        (pair, hinge, o, stalk, wave, dev, motion) => {
          const [a0, n] = pair;
          const w = 2 * Math.PI * o.f;
          const rate = scaleV(motion.rate, w);
          const doc = {
            organ: {
              drive: 'rotary', mass: o.mass, arm: o.arm, frequency: o.f, rest: a0, normal: n, hinge, mirror: true, ...wave.doc,
              ...(dev ? { deviation: { harmonics: dev.terms, mean: dev.mean } } : {}),
              ...(stalk ? { stalk: { length: stalk.length, outerRadius: 4e-5, modulus: 5e9, mass: stalk.mass } } : {}),
            },
            body: { rate: { roll: rate[0], pitch: rate[1], yaw: rate[2] }, acceleration: motion.accel, gravity: motion.gravity, attitude: { roll: motion.attitude[0], pitch: motion.attitude[1], yaw: motion.attitude[2] } },
            sampling: { pointsPerBeat: N, beats: 1, harmonics: 4 },
            output: { series: true, path: 'sampled' },
          };
          const r = forces(doc);
          if (!r.ok) throw new Error(JSON.stringify(r.issues));
          const phi = wave.stroke(o.f);
          const theta: Stroke = dev ? seriesStroke(o.f, dev.mean, dev.terms) : () => 0;
          const g = motion.gravity ? gravityBody(9.80665, motion.attitude[0], motion.attitude[1], motion.attitude[2]) : ([0, 0, 0] as V3);
          const totalMass = o.mass + (stalk?.mass ?? 0);
          for (const mirror of [false, true]) {
            const P = (v: V3): V3 => (mirror ? mirrorV(v) : v);
            const geom: RotaryGeom = { a0, n, hinge };
            const at = (s: number) => (t: number): V3 => P(addV(hinge, scaleV(radialUnit(geom, phi(t), theta(t)), s)));
            const points: PointMass[] = [{ mass: o.mass, bodyPosition: at(o.arm) }];
            if (stalk) points.push({ mass: stalk.mass, bodyPosition: at(stalk.length / 2) });
            const frame = (t: number) => rotaryFrame(geom, phi(t), theta(t)).map(P) as [V3, V3, V3];
            const ex = expectFor(points, frame, totalMass, rate, motion.accel, g, o.f);
            const { worst, sumError } = compareOrgan(r.answer, mirror ? 1 : 0, ex, ['x', 'y', 'z', 'radial', 'tangential', 'normal']);
            expect(worst, `${mirror ? 'mirror' : 'specified'} organ`).toBeLessThan(1e-6);
            expect(sumError).toBeLessThan(1e-12);
          }
        },
      ),
      { numRuns: 60, seed: 20261201 },
    );
  });

  it('holds for linear organs: random axes, rest position, waveform, rates, acceleration, gravity, mirror', () => {
    fc.assert(
      fc.property(
        unitPair,
        vec(1e-3),
        fc.record({ mass: finiteIn(1e-10, 1e-7), f: finiteIn(100, 20000) }),
        waveCase(1e-5),
        motionCase,
        (pair, hinge, o, wave, motion) => {
          const [d, s] = pair;
          const w = 2 * Math.PI * o.f;
          // Rates as fractions of ω (unphysical at kHz, but they make every component comparable in size).
          const rate = scaleV(motion.rate, w);
          const doc = {
            organ: { drive: 'linear', mass: o.mass, frequency: o.f, driveAxis: d, senseAxis: s, hinge, mirror: true, ...wave.doc },
            body: { rate: { roll: rate[0], pitch: rate[1], yaw: rate[2] }, acceleration: motion.accel, gravity: motion.gravity, attitude: { roll: motion.attitude[0], pitch: motion.attitude[1], yaw: motion.attitude[2] } },
            sampling: { pointsPerBeat: N, beats: 1, harmonics: 4 },
            output: { series: true, path: 'sampled' },
          };
          const r = forces(doc);
          if (!r.ok) throw new Error(JSON.stringify(r.issues));
          const x = wave.stroke(o.f);
          const g = motion.gravity ? gravityBody(9.80665, motion.attitude[0], motion.attitude[1], motion.attitude[2]) : ([0, 0, 0] as V3);
          for (const mirror of [false, true]) {
            const P = (v: V3): V3 => (mirror ? mirrorV(v) : v);
            const points: PointMass[] = [{ mass: o.mass, bodyPosition: (t) => P(addV(hinge, scaleV(d, x(t)))) }];
            const fr: [V3, V3, V3] = [P(d), P(s), P(crossV(d, s))];
            const ex = expectFor(points, () => fr, o.mass, rate, motion.accel, g, o.f);
            const { worst, sumError } = compareOrgan(r.answer, mirror ? 1 : 0, ex, ['x', 'y', 'z', 'drive', 'sense', 'cross']);
            expect(worst, `${mirror ? 'mirror' : 'specified'} organ`).toBeLessThan(1e-6);
            expect(sumError).toBeLessThan(1e-12);
          }
        },
      ),
      { numRuns: 60, seed: 7 },
    );
  });
});
