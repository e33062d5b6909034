import { describe, expect, it } from 'vitest';
import { COMPONENTS, N_AXES } from '../../src/components.js';
import { forces, organNumbers, sampleOrgan } from '../../src/forces.js';
import { allocHarmonics, loadHarmonics } from '../../src/harmonics.js';
import { compile, mirroredMotion, type Model } from '../../src/model.js';
import { parseScenario, type Scenario } from '../../src/scenario.js';
import { fromEuler } from '../../src/turn/attitude.js';
import { rateProfile } from '../../src/turn/profiles.js';
import { allocTurn, runTurn, turnPlan } from '../../src/turn/run.js';
import { turn } from '../../src/turn/turn.js';
import { beatTable } from '../../src/waveform.js';

const organ = {
  drive: 'rotary', mass: '6 ug', arm: '0.85 mm', frequency: '180 Hz', amplitude: '85 deg',
  rest: [0, 1, 0], normal: [0.906, 0, 0.423], hinge: ['0.3 mm', '0.45 mm', '-0.2 mm'],
  stalk: { length: '0.8 mm', outerRadius: '40 um', innerRadius: '30 um', modulus: '5 GPa', mass: '1 ug' },
};

/** Values as numbers with −0 read as 0 (the kernels may differ in the sign of an exact zero). */
const plain = (x: ArrayLike<number>): number[] => Array.from(x, (v) => v + 0);

function setup(doc: unknown): { s: Scenario; model: Model } {
  const p = parseScenario(doc);
  if (!p.ok) throw new Error(JSON.stringify(p.issues));
  const c = compile(p.scenario);
  if (!c.ok) throw new Error(JSON.stringify(c.issues));
  return { s: p.scenario, model: c.model };
}

describe('runTurn at a constant rate', () => {
  // Yaw about the vertical from a level attitude keeps gravity at (0, 0, g) in body axes exactly,
  // so the run is the core's steady state, beat after beat.
  const { s, model } = setup({ organ, body: { rate: { roll: '0 deg/s', pitch: '0 deg/s', yaw: '300 deg/s' }, gravity: true, acceleration: ['0.5 m/s^2', 0, '-1 m/s^2'] } });
  const n = 128;
  const plan = turnPlan(180, n, 6 / 180);
  const ws = allocTurn(plan.samples, n);
  const run = runTurn({ geometry: model.geometry, profile: rateProfile({ yaw: [{ kind: 'constant', rate: s.body.rate.yaw }] }), attitude: fromEuler(s.body.attitude), gravity: 9.80665, acceleration: s.body.acceleration, mirror: true }, plan, ws);

  it('reproduces the core\'s one-beat loads (sampleOrgan) exactly, beat for beat, both organs', () => {
    expect(run.organs).toHaveLength(2);
    const specified = sampleOrgan(model.geometry, model.motion, n).beat;
    const mirror = organNumbers(model, { mirror: true, path: 'sampled', pointsPerBeat: n, harmonics: 8, series: true }).beat;
    expect(model.motion.gravity[2]).toBeCloseTo(9.80665, 15);
    for (let b = 0; b < plan.beats; b++) {
      expect(plain(run.organs[0]?.[b]?.data ?? [])).toEqual(plain(specified.data));
      expect(plain(run.organs[1]?.[b]?.data ?? [])).toEqual(plain(mirror?.data ?? []));
    }
  });

  it('gives every beat the harmonic lines of the core (organNumbers on the sampled path), exactly', () => {
    const core = organNumbers(model, { mirror: false, path: 'sampled', pointsPerBeat: n, harmonics: 8, series: false }).table;
    const closed = organNumbers(model, { mirror: false, path: 'closed-form', pointsPerBeat: n, harmonics: 8, series: false }).table;
    const t = allocHarmonics(8);
    for (let b = 0; b < plan.beats; b++) {
      loadHarmonics(run.organs[0]?.[b] ?? { n: 0, data: new Float64Array(0) }, n, beatTable(n), 8, t);
      expect(plain(t.pq)).toEqual(plain(core.pq));
    }
    // and the closed form (Jacobi–Anger, A&S 9.1.42–43) agrees with both to rounding
    let worst = 0, scale = 0;
    for (let i = 0; i < t.pq.length; i++) {
      worst = Math.max(worst, Math.abs((t.pq[i] as number) - (closed.pq[i] as number)));
      scale = Math.max(scale, Math.abs(closed.pq[i] as number));
    }
    expect(worst / scale).toBeLessThan(1e-11);
  });

  it('holds the angular-acceleration load at zero and the body rate constant', () => {
    const aa = COMPONENTS.indexOf('angularAcceleration');
    for (const beat of run.organs[0] ?? []) expect(plain(beat.data.subarray(aa * N_AXES * n, (aa + 1) * N_AXES * n)).every((x) => x === 0)).toBe(true);
    expect(run.motion.wz.subarray(0, plan.samples).every((x) => x === s.body.rate.yaw)).toBe(true);
  });
});

describe('turn(doc) without a maneuver', () => {
  it('gives, beat for beat, the series of forces(doc) at the same constant rate (both organs, all components)', () => {
    const doc = { organ, body: { rate: { roll: '100 deg/s', pitch: '-40 deg/s', yaw: '300 deg/s' } }, sampling: { pointsPerBeat: 64, beats: 3, harmonics: 4 } };
    const f = forces({ ...doc, sampling: { ...doc.sampling, beats: 1 } });
    const t = turn(doc);
    if (!f.ok || !t.ok) throw new Error('refused');
    const series = t.answer.series;
    expect(series?.decimate).toEqual({ every: 1 });
    expect(series?.time).toHaveLength(3 * 64);
    for (const [o, organAnswer] of f.answer.organs.entries()) {
      const loads = organAnswer.series?.loads as Record<string, Record<string, number[]>>;
      const turned = series?.organs[o]?.loads as unknown as Record<string, Record<string, number[]>>;
      expect(series?.organs[o]?.role).toBe(organAnswer.role);
      expect(series?.organs[o]?.side).toBe(organAnswer.side);
      for (const c of COMPONENTS) {
        for (const [axis, values] of Object.entries(loads[c] ?? {})) {
          const got = turned[c]?.[axis] ?? [];
          for (let b = 0; b < 3; b++) expect(plain(got.slice(b * 64, (b + 1) * 64))).toEqual(plain(values));
        }
      }
    }
    for (const row of t.answer.beats) expect(row.trueRate.yaw).toBeCloseTo((300 * Math.PI) / 180, 14);
  });

  it('mirrors the motion of the core for the mirror organ (−PΩ), so roll loads flip sign', () => {
    const m = mirroredMotion({ omega: [1, 2, 3], omegaDot: [4, 5, 6], accel: [7, 8, 9], gravity: [1, 1, 1] });
    expect(m.omega).toEqual([-1, 2, -3]);
    expect(m.omegaDot).toEqual([-4, 5, -6]);
  });
});
