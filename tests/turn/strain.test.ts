import { describe, expect, it } from 'vitest';
import { turn, type TurnAnswer } from '../../src/turn/turn.js';

const deg = Math.PI / 180;
const base = {
  mass: '7 ug', arm: '0.9 mm', frequency: '200 Hz', amplitude: '80 deg', rest: [0, 1, 0], normal: [0.89, 0, 0.45], hinge: ['0.3 mm', '0.45 mm', '-0.2 mm'],
};
const stalk = { length: '0.8 mm', outerRadius: '40 um', innerRadius: '30 um', modulus: '5 GPa' };
const maneuver = { duration: '60 ms', yaw: { pulse: { peak: '1500 deg/s', duration: '40 ms', start: '10 ms' } }, roll: { sine: { amplitude: '300 deg/s', frequency: '20 Hz' } } };

function answer(doc: unknown): TurnAnswer {
  const r = turn(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.answer;
}

type V = [number, number, number];
const cross = (a: V, b: V): V => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const dot = (a: V, b: V) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const add = (...vs: V[]): V => vs.reduce((s, v) => [s[0] + v[0], s[1] + v[1], s[2] + v[2]], [0, 0, 0] as V);
const mul = (v: V, k: number): V => [v[0] * k, v[1] * k, v[2] * k];

// Frame of the organ: a0 = (0, 1, 0), n = normalised (0.89, 0, 0.45), t0 = n × a0.
const nn = Math.hypot(0.89, 0.45);
const n: V = [0.89 / nn, 0, 0.45 / nn];
const a0: V = [0, 1, 0];
const t0 = cross(n, a0);
const h: V = [0.3e-3, 0.45e-3, -0.2e-3];
const E = 5e9, ro = 40e-6, ri = 30e-6;
const I = (Math.PI * (ro ** 4 - ri ** 4)) / 4; // tube, Roark's Formulas for Stress and Strain, Table A.1

/**
 * Independent check: the stalk as `segments` point masses (midpoint rule) plus the knob at L; the
 * base moment of the inertial loads dF_i = m_i (g − a_ref − a_i), with the inertial acceleration
 * of element i at r_i = h + s_i e_r written out (rotating-frame kinematics), summed as
 * M = Σ s_i e_r × dF_i; then ε = −M·e c/(E I) on the outer fibre (Roark Table 8.1, σ = M c / I).
 */
function baseStrain(a: TurnAnswer, j: number, stalkMass: number, segments = 4000): { out: number; inPlane: number } {
  const s = a.series;
  if (!s) throw new Error('series');
  const t = s.time[j] as number;
  const w = 2 * Math.PI * 200, Phi = 80 * deg;
  const phi = Phi * Math.sin(w * t), pd = Phi * w * Math.cos(w * t), pdd = -Phi * w * w * Math.sin(w * t);
  const er = add(mul(a0, Math.cos(phi)), mul(t0, Math.sin(phi)));
  const et = add(mul(a0, -Math.sin(phi)), mul(t0, Math.cos(phi)));
  const W: V = [(s.rate.roll as number[])[j] as number, (s.rate.pitch as number[])[j] as number, (s.rate.yaw as number[])[j] as number];
  const dW: V = [(s.angularAcceleration.roll as number[])[j] as number, (s.angularAcceleration.pitch as number[])[j] as number, (s.angularAcceleration.yaw as number[])[j] as number];
  const g: V = [(s.gravity.x as number[])[j] as number, (s.gravity.y as number[])[j] as number, (s.gravity.z as number[])[j] as number];
  let M: V = [0, 0, 0];
  const element = (mi: number, si: number) => {
    const r = add(h, mul(er, si));
    const v = mul(et, si * pd);
    const arel = add(mul(et, si * pdd), mul(er, -si * pd * pd));
    const acc = add(arel, cross(dW, r), cross(W, cross(W, r)), mul(cross(W, v), 2));
    const dF = mul(add(g, mul(acc, -1)), mi);
    M = add(M, cross(mul(er, si), dF));
  };
  element(7e-9, 0.9e-3);
  for (let i = 0; i < segments; i++) element(stalkMass / segments, ((i + 0.5) / segments) * 0.8e-3);
  // A normal load F_n at lever ℓ gives M·e_t = −ℓ F_n (e_r × e_n = −e_t); a tangential one M·e_n = ℓ F_t.
  return { out: (dot(M, et) * ro) / (E * I), inPlane: (-dot(M, n) * ro) / (E * I) };
}

describe('turn(doc) stalk strain', () => {
  for (const stalkMass of [0, 1e-9]) {
    it(`equals the base moment of the inertial loads summed along the arm (stalk mass ${stalkMass} kg)`, () => {
      const a = answer({ organ: { ...base, stalk: { ...stalk, mass: stalkMass } }, body: { maneuver, gravity: true }, sampling: { pointsPerBeat: 64, harmonics: 4 } });
      const st = a.series?.organs[0]?.strain;
      if (!st) throw new Error('no strain');
      for (const j of [5, 200, 333, 470, 700]) {
        const ref = baseStrain(a, j, stalkMass);
        expect(Math.abs((st.outOfPlane as number[])[j] as number - ref.out)).toBeLessThan(1e-7 * Math.abs(ref.out) + 1e-15);
        expect(Math.abs((st.inPlane as number[])[j] as number - ref.inPlane)).toBeLessThan(1e-7 * Math.abs(ref.inPlane) + 1e-15);
      }
    });
  }

  it('reports the peak of every strain with its organ, time and beat, and it is the series maximum', () => {
    const a = answer({ organ: { ...base, stalk }, body: { maneuver }, sampling: { pointsPerBeat: 64, harmonics: 4 } });
    const p = a.peakStrain;
    if (!p) throw new Error('no peak');
    for (const kind of ['axial', 'inPlane', 'outOfPlane'] as const) {
      let best = 0;
      for (const o of a.series?.organs ?? []) best = Math.max(best, ...(o.strain?.[kind] as number[]).map(Math.abs));
      expect(Math.abs(p[kind].value)).toBe(best);
      expect(p[kind].beat).toBe(Math.floor(p[kind].time * 200 + 1e-9));
    }
    // the out-of-plane peak comes with the turn, not before it
    expect(p.outOfPlane.time).toBeGreaterThan(0.01);
    expect(p.organs).toHaveLength(2);
  });

  it('has no strain without a stalk', () => {
    const a = answer({ organ: base, body: { maneuver }, sampling: { pointsPerBeat: 32, harmonics: 3 }, output: { series: false } });
    expect(a.peakStrain).toBeUndefined();
  });
});
