/**
 * The closed forms of design §4 (Jacobi–Anger expansion, A&S 9.1.42–43) held against the lines
 * that `forces` reports on both paths, with Bessel values from the npm `bessel` package and from
 * A&S Table 9.1/9.2; and the closed-form path held equal to the sampled path on random geometry.
 */
import fc from 'fast-check';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { COMPONENTS, forces, type ForcesAnswer, type Line } from '../../src/index.js';
import { crossV, dot, normV, scaleV, subV, unitV, type V3 } from './independent.js';

const require = createRequire(import.meta.url);
const { besselj } = require('bessel') as { besselj: (x: number, n: number) => number };

const run = (doc: unknown): ForcesAnswer => {
  const r = forces(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.answer;
};

const line = (a: ForcesAnswer, organ: number, component: string, axis: string, order: number): Line => {
  const l = a.organs[organ]?.harmonics.find((x) => x.component === component && x.axis === axis && x.order === order);
  if (!l) throw new Error(`no line ${component} ${axis} ${order}`);
  return l;
};

/** A rotary organ whose rest and normal are not aligned with any body axis, turning about all three. */
const m = 6e-9, L = 8.5e-4, f = 180;
const w = 2 * Math.PI * f;
const a0 = unitV([0.2, 0.9, -0.1]);
const n = unitV(subV([0.9, 0, 0.45], scaleV(a0, dot([0.9, 0, 0.45], a0))));
const t0 = crossV(n, a0);
const rate: V3 = [1.1, -0.7, 5.2]; // rad/s
const scenario = (amplitude: number, path: 'closed-form' | 'sampled') => ({
  organ: { mass: m, arm: L, frequency: f, amplitude, rest: a0, normal: n, hinge: [3e-4, 4.5e-4, -2e-4] },
  body: { rate: { roll: rate[0], pitch: rate[1], yaw: rate[2] } },
  sampling: { pointsPerBeat: 256, harmonics: 9 },
  output: { series: false, path },
});

/** Coriolis·normal line k (design §4): 4 m L k ω |Ω·a0| |J_k(Φ)| (odd k), 4 m L k ω |Ω·t0| |J_k(Φ)| (even k). */
const coriolisNormal = (k: number, Jk: number) => 4 * m * L * k * w * Math.abs(dot(rate, k % 2 === 1 ? a0 : t0)) * Math.abs(Jk);

describe('forces(scenario) lines against the closed forms of design §4', () => {
  for (const path of ['closed-form', 'sampled'] as const) {
    it(`${path}: coriolis·normal of orders 1..9 equals 4 m L k ω |Ω·a0 or t0| |J_k(Φ)| with J from the npm bessel package`, () => {
      for (const amplitude of [0.35, 1.0, 1.48]) {
        const a = run(scenario(amplitude, path));
        expect(a.path).toBe(path);
        for (let k = 1; k <= 9; k++) {
          const got = line(a, 0, 'coriolis', 'normal', k).amplitude;
          // npm bessel errs by up to ~1.4e-7 absolute (tests/core/bessel.test.ts): compare in J units.
          const unitJ = coriolisNormal(k, 1);
          expect(Math.abs(got - coriolisNormal(k, besselj(amplitude, k))) / unitJ, `k=${k} Φ=${amplitude}`).toBeLessThan(2e-7);
        }
      }
    });

    it(`${path}: coriolis·normal lines at Φ = 1 and 2 rad equal the closed form with A&S Table 9.1/9.2 values (from memory, 10 decimals)`, () => {
      // A&S Table 9.1 (J1, J2) and 9.2 (J3..J5) at x = 1 and x = 2 (from memory; see bessel.test.ts).
      const table: Record<number, number[]> = {
        1: [0.4400505857, 0.1149034849, 0.0195633540, 0.0024766390, 0.0002497577],
        2: [0.5767248078, 0.3528340286, 0.1289432495],
      };
      for (const [x, values] of Object.entries(table)) {
        const a = run(scenario(Number(x), path));
        values.forEach((J, i) => {
          const k = i + 1;
          expect(Math.abs(line(a, 0, 'coriolis', 'normal', k).amplitude - coriolisNormal(k, J)) / coriolisNormal(k, 1), `k=${k} x=${x}`).toBeLessThan(6e-11);
        });
      }
    });

    it(`${path}: coriolis·radial is 2 m L Φ ω (Ω·n) at k = 1 only; primary·tangential is m L Φ ω² at k = 1 only; primary·radial is m L Φ² ω²/2 at k = 0 and 2`, () => {
      const amplitude = 1.2;
      const a = run(scenario(amplitude, path));
      const radial = 2 * m * L * amplitude * w * dot(rate, n);
      const r1 = line(a, 0, 'coriolis', 'radial', 1);
      // sign of (Ω·n) shows in the phase: φ̇ = Φω cos ωt, so the line is +|·| cos ωt (phase 0) or phase π.
      expect(Math.abs(r1.amplitude - Math.abs(radial)) / Math.abs(radial)).toBeLessThan(1e-12);
      expect(Math.abs(Math.cos(r1.phase) - Math.sign(radial))).toBeLessThan(1e-12);
      const tangential = m * L * amplitude * w * w;
      for (let k = 0; k <= 9; k++) {
        const cr = line(a, 0, 'coriolis', 'radial', k).amplitude;
        const pt = line(a, 0, 'primary', 'tangential', k).amplitude;
        const pr = line(a, 0, 'primary', 'radial', k).amplitude;
        if (k !== 1) expect(cr / Math.abs(radial), `coriolis radial k=${k}`).toBeLessThan(1e-12);
        expect(Math.abs(pt - (k === 1 ? tangential : 0)) / tangential, `primary tangential k=${k}`).toBeLessThan(1e-12);
        const want = k === 0 || k === 2 ? (m * L * amplitude ** 2 * w * w) / 2 : 0;
        expect(Math.abs(pr - want) / tangential, `primary radial k=${k}`).toBeLessThan(1e-12);
      }
      // primary·tangential = −m L φ̈ = m L Φ ω² sin ωt: phase −π/2 under x = A cos(kωt + ψ).
      expect(line(a, 0, 'primary', 'tangential', 1).phase).toBeCloseTo(-Math.PI / 2, 12);
    });
  }
});

// ---- closed-form path = sampled path ------------------------------------------------------------

const finiteIn = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true, noDefaultInfinity: true });
const vec = (s: number) => fc.tuple(finiteIn(-s, s), finiteIn(-s, s), finiteIn(-s, s));
/** Zero or at least `lo` in magnitude: products like Ω² of 1e-160 rad/s underflow to subnormals, where no path keeps relative precision. */
const physical = (lo: number, hi: number) => finiteIn(-hi, hi).filter((x) => x === 0 || Math.abs(x) >= lo);
const physicalVec = (lo: number, hi: number) => fc.tuple(physical(lo, hi), physical(lo, hi), physical(lo, hi));
const unitPair = fc
  .tuple(vec(1), vec(1))
  .filter(([a, b]) => normV(a) > 0.2 && normV(b) > 0.2 && normV(crossV(a, b)) > 0.2 * normV(a) * normV(b))
  .map(([a, b]): [V3, V3] => {
    const u = unitV(a);
    return [u, unitV(subV(b, scaleV(u, dot(b, u))))];
  });
const body = fc.record({ rate: physicalVec(1e-6, 400), accel: physicalVec(1e-6, 30), gravity: fc.boolean(), attitude: vec(1) }).map((b) => ({
  rate: { roll: b.rate[0], pitch: b.rate[1], yaw: b.rate[2] }, acceleration: b.accel, gravity: b.gravity,
  attitude: { roll: b.attitude[0], pitch: b.attitude[1], yaw: b.attitude[2] },
}));

/**
 * Largest |difference| of (p, q) per component, relative to that component's largest line, over
 * both organs. The scale has a floor of 1e-6 of the largest line of the whole answer: where a
 * component cancels to rounding noise (a mass almost on the rotation axis has centrifugal loads of
 * 1e-7 of M Ω² r), both paths carry only that noise.
 */
function pathDifference(closed: ForcesAnswer, sampled: ForcesAnswer): number {
  let worst = 0;
  const floor = 1e-6 * Math.max(...closed.organs.flatMap((o) => o.harmonics.map((l) => l.amplitude)));
  for (let o = 0; o < closed.organs.length; o++) {
    const cl = closed.organs[o]?.harmonics ?? [];
    const sa = sampled.organs[o]?.harmonics ?? [];
    expect(cl.length).toBe(sa.length);
    for (const c of COMPONENTS) {
      const idx = cl.map((l, i) => [l, i] as const).filter(([l]) => l.component === c);
      const scale = Math.max(floor, ...idx.map(([l]) => l.amplitude), ...idx.map(([, i]) => sa[i]?.amplitude ?? 0));
      if (scale === 0) continue;
      for (const [l, i] of idx) {
        const s = sa[i] as Line;
        expect([s.component, s.axis, s.order]).toEqual([l.component, l.axis, l.order]);
        const dp = Math.abs(l.amplitude * Math.cos(l.phase) - s.amplitude * Math.cos(s.phase));
        const dq = Math.abs(l.amplitude * Math.sin(l.phase) - s.amplitude * Math.sin(s.phase));
        worst = Math.max(worst, dp / scale, dq / scale);
      }
    }
  }
  return worst;
}

describe('forces(scenario): the closed-form path equals the sampled path', () => {
  it('for rotary organs with a sine stroke (random geometry, hinge, stalk, mean, rates, acceleration, gravity), both organs, all components and axes', () => {
    fc.assert(
      fc.property(
        unitPair, physicalVec(1e-9, 1e-3), finiteIn(0.02, 1.5), finiteIn(-0.6, 0.6), fc.boolean(), fc.option(finiteIn(1e-9, 3e-8), { nil: undefined }), body,
        ([rest, normal], hinge, amplitude, mean, startCos, stalkMass, b) => {
          const organ = {
            mass: 6e-9, arm: 8.5e-4, frequency: 170, rest, normal, hinge, amplitude, mean,
            // a phase shift of the stroke origin: the closed form must carry it too
            ...(startCos ? { amplitude: undefined, mean, waveform: { harmonics: [{ order: 1, cos: amplitude * 0.6, sin: amplitude * 0.8 }] } } : {}),
            ...(stalkMass ? { stalk: { length: 7e-4, outerRadius: 4e-5, modulus: 5e9, mass: stalkMass } } : {}),
          };
          const doc = (path: string) => ({ organ, body: b, sampling: { pointsPerBeat: 64, harmonics: 12 }, output: { series: false, path } });
          const closed = run(doc('closed-form')), sampled = run(doc('sampled'));
          expect(closed.path).toBe('closed-form');
          expect(sampled.path).toBe('sampled');
          expect(pathDifference(closed, sampled)).toBeLessThan(1e-9);
        },
      ),
      { numRuns: 80, seed: 42 },
    );
  });

  it('for linear organs with a harmonic-series stroke, both organs, all components and axes', () => {
    fc.assert(
      fc.property(
        unitPair, physicalVec(1e-9, 1e-3), fc.array(fc.record({ order: fc.integer({ min: 1, max: 5 }), cos: physical(1e-12, 5e-6), sin: physical(1e-12, 5e-6) }), { minLength: 1, maxLength: 5 }), physical(1e-12, 2e-6), body,
        ([driveAxis, senseAxis], hinge, terms, mean, b) => {
          const organ = { drive: 'linear', mass: 2e-9, frequency: 14000, driveAxis, senseAxis, hinge, mean, waveform: { harmonics: terms } };
          const doc = (path: string) => ({ organ, body: b, sampling: { pointsPerBeat: 64, harmonics: 8 }, output: { series: false, path } });
          expect(pathDifference(run(doc('closed-form')), run(doc('sampled')))).toBeLessThan(1e-9);
        },
      ),
      { numRuns: 60, seed: 43 },
    );
  });

  it("refuses 'closed-form' where it does not apply (a triangle stroke), naming output.path", () => {
    const r = forces({ organ: { mass: 6e-9, arm: 8.5e-4, frequency: 170, amplitude: 1, waveform: 'triangle', rest: [0, 1, 0], normal: [1, 0, 0] }, output: { path: 'closed-form' } });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues.map((i) => i.path)).toEqual(['output.path']);
  });
});
