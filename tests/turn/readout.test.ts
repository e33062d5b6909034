import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { TOTAL } from '../../src/components.js';
import { organNumbers } from '../../src/forces.js';
import { lineIndex } from '../../src/harmonics.js';
import { compile } from '../../src/model.js';
import { parseScenario } from '../../src/scenario.js';
import { analysePair, estimateRates, lineOutputs } from '../../src/sensing/index.js';
import { lagOf, trailingMean } from '../../src/turn/readout.js';
import { turn, type TurnAnswer } from '../../src/turn/turn.js';

const organ = { mass: '7 ug', arm: '0.9 mm', frequency: '200 Hz', amplitude: '80 deg', rest: [0, 1, 0], normal: [0.89, 0, 0.45] };
const sensor = { readoutNoise: '2e-10 N / Hz^0.5', integration: { beats: 10 } };

function answer(doc: unknown): TurnAnswer {
  const r = turn(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.answer;
}

const AXES = ['roll', 'pitch', 'yaw'] as const;

describe('readout helpers', () => {
  it('trailingMean(x, w) averages the last w beats, fewer at the start (hand-derived)', () => {
    const out = trailingMean(Float64Array.of(1, 2, 3, 4, 5), 3, 5, new Float64Array(5));
    expect(Array.from(out)).toEqual([1, 1.5, 2, 3, 4]);
  });

  it('lagOf(truth, est) finds a known delay of a smooth bump, to a small fraction of a beat', () => {
    const B = 200, shift = 7.3, f = 100;
    const bump = (u: number) => Math.exp(-(((u - 80) / 15) ** 2));
    const truth = Float64Array.from({ length: B }, (_, b) => bump(b));
    const est = Float64Array.from({ length: B }, (_, b) => bump(b - shift));
    expect((lagOf(truth, est, B, 10, f) as number) * f).toBeCloseTo(shift, 1);
    expect(lagOf(new Float64Array(B).fill(2), est, B, 10, f)).toBeNull();
  });
});

describe('turn(doc) read-out at a constant rate', () => {
  const doc = { organ, body: { rate: { roll: '40 deg/s', pitch: '-25 deg/s', yaw: '300 deg/s' } }, sampling: { pointsPerBeat: 128, beats: 12, harmonics: 5 }, sensor, output: { series: false } };
  const a = answer(doc);
  const p = parseScenario(doc);
  const c = p.ok ? compile(p.scenario) : undefined;
  if (!c?.ok) throw new Error('setup');

  it('gives every beat the in-phase outputs of the core\'s steady-state lines (organNumbers), channel by channel', () => {
    const tables = [false, true].map((mirror) => organNumbers(c.model, { mirror, path: 'closed-form', pointsPerBeat: 128, harmonics: 5, series: false }).table);
    const expected = a.readout.channels.map((ch) => {
      const t = tables[ch.role === 'mirror' ? 1 : 0];
      if (!t) throw new Error('table');
      const at = lineIndex(t, TOTAL, 3 + ['radial', 'tangential', 'normal'].indexOf(ch.axis), ch.order);
      return lineOutputs(t.pq[at] as number, t.pq[at + 1] as number, ch.referencePhase).inPhase;
    });
    const scale = Math.max(...expected.map(Math.abs));
    for (const row of a.beats) row.inPhase.forEach((y, i) => expect(Math.abs(y - (expected[i] as number)) / scale).toBeLessThan(1e-11));
  });

  it('estimates, beat for beat, what the pair estimator makes of the core\'s steady-state lines', () => {
    const pair = analysePair(a.readout.channels.map((ch) => ({ sensitivity: [ch.sensitivity.roll, ch.sensitivity.pitch, ch.sensitivity.yaw] as const, sigma: 1 })));
    const y = a.beats[0]?.inPhase.map((v, i) => v - (a.readout.channels[i]?.baseline ?? 0)) ?? [];
    const steady = estimateRates(pair, y);
    for (const row of a.beats) {
      AXES.forEach((axis, i) => expect(row.estimatedRate[axis]).toBeCloseTo(steady[i] as number, 9));
    }
    // and the steady estimate is the true rate up to the centrifugal load's share (small at these rates)
    AXES.forEach((axis, i) => expect(Math.abs((steady[i] as number) - (a.beats[0]?.trueRate[axis] ?? 0))).toBeLessThan(0.05 * ((300 * Math.PI) / 180)));
  });
});

describe('turn(doc) read-out over a maneuver', () => {
  it('reads a slow turn (a 4 s bell, 80× the window) back within the noise', () => {
    const a = answer({ organ, body: { maneuver: { duration: '4 s', yaw: { pulse: { peak: '100 deg/s', duration: '4 s' } }, roll: { pulse: { peak: '-60 deg/s', duration: '3 s', start: '0.5 s' } } } }, sampling: { pointsPerBeat: 32, harmonics: 4 }, sensor, output: { series: false } });
    const noise = a.readout.noise;
    if (!noise) throw new Error('no noise');
    for (const axis of AXES) {
      const sigma = noise[axis] as number;
      expect(sigma).toBeGreaterThan(0);
      const worst = Math.max(...a.beats.slice(10).map((r) => Math.abs((r.estimatedRate[axis] as number) - r.trueRate[axis])));
      expect(worst).toBeLessThan(sigma);
    }
    // the turn itself stands far out of the noise (so the check above is not empty)
    expect(Math.max(...a.beats.map((r) => r.trueRate.yaw))).toBeGreaterThan(30 * (noise.yaw as number));
  });

  it('shows a fast turn (a 60 ms saccade) late by about half the window: (w − 1)/2 beats for a trailing w-beat average', () => {
    const a = answer({ organ, body: { maneuver: { duration: '200 ms', yaw: { pulse: { peak: '1500 deg/s', duration: '60 ms', start: '40 ms' } } } }, sampling: { pointsPerBeat: 128, harmonics: 4 }, sensor, output: { series: false } });
    const w = a.readout.window.beats;
    expect(w).toBe(10);
    const lag = a.lag.yaw as number;
    expect(Math.abs(lag * 200 - (w - 1) / 2)).toBeLessThan(0.25);
    expect(Math.abs(lag - a.readout.window.time / 2)).toBeLessThan(1 / 200);
    expect(a.lag.roll).toBeNull();
    // the lagging estimate misses the peak by far more than the noise
    expect(a.error.yaw?.max ?? 0).toBeGreaterThan(100 * (a.readout.noise?.yaw ?? Infinity));
  });

  it('shortens the lag with the window: 2 beats lag half a beat', () => {
    const a = answer({ organ, body: { maneuver: { duration: '200 ms', yaw: { pulse: { peak: '1500 deg/s', duration: '60 ms', start: '40 ms' } } } }, sampling: { pointsPerBeat: 64, harmonics: 4 }, sensor: { ...sensor, integration: '10 ms' }, output: { series: false } });
    expect(a.readout.window.beats).toBe(2);
    expect(Math.abs((a.lag.yaw as number) * 200 - 0.5)).toBeLessThan(0.1);
  });
});

describe('turn(doc) read-out through a sense mode (displacement channels)', () => {
  const doc = JSON.parse(readFileSync(new URL('../../examples/mems-sensing.json', import.meta.url), 'utf8'));
  doc.sampling = { pointsPerBeat: 64, beats: 6, harmonics: 3 };
  doc.sensor = { ...doc.sensor, integration: { beats: 3 } };
  const a = answer(doc);

  it('reads each beat as the steady-state sense displacement Re(H(kω) Z e^{−iψ}) of the core\'s load line', () => {
    const p = parseScenario(doc);
    const c = p.ok ? compile(p.scenario) : undefined;
    if (!c?.ok || !p.ok) throw new Error('setup');
    const sm = p.scenario.organ.senseMode;
    if (!sm) throw new Error('no sense mode');
    expect(a.readout.channels.every((ch) => ch.quantity === 'displacement' && ch.axis === 'sense')).toBe(true);
    const tables = [false, true].map((mirror) => organNumbers(c.model, { mirror, path: 'closed-form', pointsPerBeat: 64, harmonics: 3, series: false }).table);
    a.readout.channels.forEach((ch, i) => {
      const t = tables[ch.role === 'mirror' ? 1 : 0];
      if (!t) throw new Error('table');
      const at = lineIndex(t, TOTAL, 4, ch.order);
      // H(ω) = 1 / (m (ω_s² − ω² + i ω ω_s / Q)), the damped oscillator (any mechanics textbook)
      const w = 2 * Math.PI * 15e3 * ch.order, ws = 2 * Math.PI * sm.frequency;
      const re = ws * ws - w * w, im = (w * ws) / sm.quality, den = sm.mass * (re * re + im * im);
      const hr = re / den, hi = -im / den;
      const p0 = t.pq[at] as number, q0 = t.pq[at + 1] as number; // Z = p − i q
      const xr = hr * p0 + hi * q0, xi = hi * p0 - hr * q0; // H Z
      const expected = xr * Math.cos(ch.referencePhase) + xi * Math.sin(ch.referencePhase);
      for (const row of a.beats) expect(Math.abs((row.inPhase[i] as number) - expected)).toBeLessThan(1e-9 * Math.abs(expected) + 1e-30);
    });
  });

  it('gives the steady yaw rate back and names the axes it cannot see', () => {
    for (const row of a.beats) expect(row.estimatedRate.yaw).toBeCloseTo((10 * Math.PI) / 180, 8);
    expect(a.beats[0]?.estimatedRate.roll).toBeNull();
    expect(a.readout.confusions.join(' ')).toMatch(/roll/);
    expect(a.warnings.some((w) => w.includes('quasi-steady'))).toBe(true);
  });
});
