import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { LIMITS } from '../../src/limits.js';
import { axisAt, rateProfile } from '../../src/turn/profiles.js';
import { beatsCsv } from '../../src/turn/tables.js';
import { turn, type TurnAnswer } from '../../src/turn/turn.js';

const organ = { mass: '7 ug', arm: '0.9 mm', frequency: '200 Hz', amplitude: '80 deg', rest: [0, 1, 0], normal: [0.89, 0, 0.45], hinge: ['0.3 mm', '0.45 mm', '-0.2 mm'] };
const saccade = { duration: '50 ms', yaw: { pulse: { peak: '1500 deg/s', duration: '30 ms', start: '10 ms' } } };

function answer(doc: unknown): TurnAnswer {
  const r = turn(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.answer;
}

function issues(doc: unknown) {
  const r = turn(doc);
  if (r.ok) throw new Error('accepted');
  return r.issues;
}

describe('turn(doc) refuses bad input clearly', () => {
  it('refuses sampled times that do not increase, naming the point', () => {
    const [i] = issues({ organ, body: { maneuver: { duration: '0.2 s', pitch: { samples: { time: [0, 0.1, 0.1, 0.2], rate: [0, 1, 2, 0] } } } } });
    expect(i?.path).toBe('body.maneuver.pitch.samples.time[2]');
    expect(i?.message).toMatch(/does not come after 0\.1; expected times strictly increasing/);
  });

  it('refuses NaN in a trace and in a quantity', () => {
    const [a] = issues({ organ, body: { maneuver: { duration: '0.2 s', roll: { samples: { time: [0, 0.1, 0.2], rate: [0, Number.NaN, 0] } } } } });
    expect(a?.path).toBe('body.maneuver.roll.samples.rate[1]');
    expect(a?.message).toMatch(/NaN is not a finite number/);
    const [b] = issues({ organ, body: { maneuver: { duration: Number.NaN, yaw: '1 rad/s' } } });
    expect(b?.path).toBe('body.maneuver.duration');
  });

  it('refuses a pulse of zero duration', () => {
    const [i] = issues({ organ, body: { maneuver: { duration: '0.2 s', yaw: { pulse: { peak: '100 deg/s', duration: '0 ms' } } } } });
    expect(i).toEqual({ path: 'body.maneuver.yaw.pulse.duration', message: "'0 ms' must be greater than zero; a pulse needs a duration such as '60 ms'" });
  });

  it('refuses trace samples closer than a nanosecond and pulses shorter than one (they would overflow: found by fuzzing)', () => {
    expect(issues({ organ, body: { maneuver: { duration: '0.2 s', yaw: { samples: { time: [0, 1e-300, 0.1], rate: [0, 1000, 0] } } } } })).toEqual([
      { path: 'body.maneuver.yaw.samples.time[1]', message: '1e-300 is only 1.00e-300 s after 0; expected samples at least 1 ns apart' },
    ]);
    expect(issues({ organ, body: { maneuver: { duration: '0.2 s', yaw: { samples: { time: [0, 0.5e-3], timeUnit: 'us', rate: [0, 1] } } } } })).toEqual([
      { path: 'body.maneuver.yaw.samples.time[1]', message: '0.0005 is only 5.00e-10 s after 0; expected samples at least 1 ns apart' },
    ]);
    expect(issues({ organ, body: { maneuver: { duration: '0.2 s', roll: { pulse: { peak: 1000, duration: 3e-323 } } } } })).toEqual([
      { path: 'body.maneuver.roll.pulse.duration', message: '3e-323 s is shorter than a nanosecond; expected a pulse of at least 1 ns' },
    ]);
    // At the floor, both are accepted and the answer is finite.
    expect(turn({ organ, body: { maneuver: { duration: '20 ms', yaw: { samples: { time: [0, 1e-9, 0.01], rate: [0, 1, 0] } } } } }).ok).toBe(true);
    expect(turn({ organ, body: { maneuver: { duration: '20 ms', yaw: { pulse: { peak: 1, duration: 1e-9, start: '5 ms' } } } } }).ok).toBe(true);
  });

  it('refuses a maneuver longer than the sample limit, with the limit named (HTTP 413, exit code 3)', () => {
    const [i] = issues({ organ, body: { maneuver: { duration: '2 s', yaw: '100 deg/s' } }, sampling: { pointsPerBeat: 256 } });
    expect(i?.path).toBe('body.maneuver.duration');
    expect(i?.limit).toBe('samplesPerRequest');
    expect(i?.message).toContain(`400 beats × 256 points = 102400 samples per organ, over the limit of ${LIMITS.samplesPerRequest}`);
  });

  it('refuses full-rate series over the output limit and says which decimation fits', () => {
    const [i] = issues({ organ, body: { maneuver: { duration: '1 s', yaw: '100 deg/s' } }, sampling: { pointsPerBeat: 256 } });
    expect(i?.limit).toBe('seriesValues');
    expect(i?.path).toBe('output.series');
    const every = Number(/"every": (\d+)/.exec(i?.message ?? '')?.[1]);
    expect(every).toBeGreaterThan(1);
    // the suggested decimation is accepted
    expect(turn({ organ, body: { maneuver: { duration: '1 s', yaw: '100 deg/s' } }, sampling: { pointsPerBeat: 256 }, output: { decimate: { every } } }).ok).toBe(true);
  });

  it('refuses a decimation step longer than the run and a decimation that is not one', () => {
    expect(issues({ organ, body: { maneuver: saccade }, sampling: { pointsPerBeat: 16, harmonics: 4 }, output: { decimate: { every: 1000 } } })[0]?.path).toBe('output.decimate.every');
    expect(issues({ organ, body: { maneuver: saccade }, output: { decimate: { every: 2.5 } } })[0]?.path).toBe('output.decimate.every');
    expect(issues({ organ, body: { maneuver: saccade }, output: { decimate: { envelope: false } } })[0]?.path).toBe('output.decimate.envelope');
  });
});

describe('turn(doc) series', () => {
  const doc = { organ, body: { maneuver: saccade }, sampling: { pointsPerBeat: 64, harmonics: 4 } };
  const full = answer(doc).series;
  if (!full) throw new Error('no series');

  it('keeps every sample by default: the body rate series is the profile at the sample times', () => {
    expect(full.decimate).toEqual({ every: 1 });
    expect(full.time).toHaveLength(10 * 64);
    const yaw = rateProfile({ yaw: [{ kind: 'pulse', peak: (1500 * Math.PI) / 180, duration: 0.03, start: 0.01 }] }).axes[2];
    full.time.forEach((t, j) => {
      expect(t).toBeCloseTo(j / (64 * 200), 15);
      expect((full.rate.yaw as number[])[j]).toBeCloseTo(axisAt(yaw, t).rate, 12);
      expect((full.angularAcceleration.yaw as number[])[j]).toBeCloseTo(axisAt(yaw, t).acceleration, 8);
    });
  });

  it('decimates { every: k } to samples 0, k, 2k, … of the full series, never dropping the tail', () => {
    const k = 7;
    const s = answer({ ...doc, output: { decimate: { every: k } } }).series;
    expect(s?.time).toHaveLength(Math.ceil(640 / k));
    const got = s?.organs[1]?.loads.coriolis.normal as number[];
    const all = full.organs[1]?.loads.coriolis.normal as number[];
    got.forEach((v, i) => expect(v).toBe(all[i * k]));
    expect(s?.time.at(-1)).toBeCloseTo((Math.floor(639 / k) * k) / (64 * 200), 15);
  });

  it('gives { envelope: true } the min and max of every series over every beat, at beat centres', () => {
    const s = answer({ ...doc, output: { decimate: { envelope: true } } }).series;
    expect(s?.decimate).toEqual({ envelope: true });
    expect(s?.time).toEqual(Array.from({ length: 10 }, (_, b) => (b + 0.5) / 200));
    const env = s?.organs[0]?.loads.angularAcceleration.z as { min: number[]; max: number[] };
    const all = full.organs[0]?.loads.angularAcceleration.z as number[];
    for (let b = 0; b < 10; b++) {
      const beat = all.slice(b * 64, (b + 1) * 64);
      expect(env.min[b]).toBe(Math.min(...beat));
      expect(env.max[b]).toBe(Math.max(...beat));
    }
  });

  it('carries a live angular-acceleration load −Ω̇ × (M h + μ e_r) during the pulse (hand-derived)', () => {
    // e_r = cos φ a0 + sin φ t0, φ = Φ sin ωt; a0 = (0, 1, 0), n = normalised (0.89, 0, 0.45), t0 = n × a0
    const nn = Math.hypot(0.89, 0.45), n = [0.89 / nn, 0, 0.45 / nn];
    const t0 = [-(n[2] as number), 0, n[0] as number];
    const m = 7e-9, L = 0.9e-3, h = [0.3e-3, 0.45e-3, -0.2e-3], Phi = (80 * Math.PI) / 180, w = 2 * Math.PI * 200;
    const series = full.organs[0]?.loads.angularAcceleration;
    let checked = 0;
    full.time.forEach((t, j) => {
      const dw = (full.angularAcceleration.yaw as number[])[j] as number;
      if (Math.abs(dw) < 100) return;
      const phi = Phi * Math.sin(w * t);
      const r = [0, 1, 2].map((c) => m * (h[c] as number) + m * L * (Math.cos(phi) * (c === 1 ? 1 : 0) + Math.sin(phi) * (t0[c] as number)));
      // −Ω̇ × R with Ω̇ = (0, 0, dw): (dw R_y, −dw R_x, 0)
      expect((series?.x as number[])[j]).toBeCloseTo(dw * (r[1] as number), 16);
      expect((series?.y as number[])[j]).toBeCloseTo(-dw * (r[0] as number), 16);
      expect(((series?.z as number[])[j] as number) + 0).toBe(0);
      checked++;
    });
    expect(checked).toBeGreaterThan(100);
  });

  it('ends the pure yaw saccade turned by the bell\'s area P·D/2 (hand-derived), level', () => {
    const a = answer({ ...doc, output: { series: false } });
    expect(a.attitude.final.yaw).toBeCloseTo(((1500 * Math.PI) / 180) * 0.015, 12);
    expect(a.attitude.final.roll).toBe(0);
    expect(a.attitude.final.pitch).toBe(0);
  });

  it('mirrors the loads: a yaw turn gives the mirror organ the opposite Coriolis normal load', () => {
    const a = full.organs[0]?.loads.coriolis.normal as number[];
    const b = full.organs[1]?.loads.coriolis.normal as number[];
    a.forEach((v, j) => expect(b[j]).toBeCloseTo(-v, 18));
    expect(Math.max(...a.map(Math.abs))).toBeGreaterThan(1e-9);
  });
});

describe('turn(doc) warnings', () => {
  it('says when the duration is not a whole number of beats and when a trace does not cover the run', () => {
    const a = answer({ organ, body: { maneuver: { duration: '52 ms', roll: { samples: { time: [0.01, 0.03, 0.05], rate: [0, 1, 0] } } } }, sampling: { pointsPerBeat: 32, harmonics: 3 }, output: { series: false } });
    expect(a.run.beats).toBe(11);
    expect(a.warnings.some((w) => w.includes('not a whole number of beats'))).toBe(true);
    expect(a.warnings.some((w) => w.includes('roll samples cover 0.01 s to 0.05 s'))).toBe(true);
  });
});

describe('turn(examples/fly-saccade.json)', () => {
  it('answers the shipped saccade: 40 beats, both organs, a decimated series and a read-out of both axes', () => {
    const doc = JSON.parse(readFileSync(new URL('../../examples/fly-saccade.json', import.meta.url), 'utf8'));
    const a = answer(doc);
    expect(a.run).toMatchObject({ beats: 40, pointsPerBeat: 256, samples: 10240 });
    expect(a.series?.decimate).toEqual({ every: 16 });
    expect(a.series?.organs.map((o) => o.side)).toEqual(['right', 'left']);
    expect(a.readout.window.beats).toBe(4);
    expect(a.readout.noise?.yaw).toBeGreaterThan(0);
    const peak = Math.max(...a.beats.map((b) => b.trueRate.yaw));
    expect(peak).toBeGreaterThan(0.95 * ((1500 * Math.PI) / 180));
    expect(a.lag.yaw).toBeGreaterThan(0);
  });
});

describe('beatsCsv(answer)', () => {
  it('names each channel in the unit of what it reads: a load in N, the stalk strain, a sense-mode displacement in m', () => {
    const stalk = { length: '0.8 mm', outerRadius: '40 um', innerRadius: '30 um', modulus: '5 GPa', mass: '1 ug' };
    const mems = { drive: 'linear', mass: '4 ug', frequency: '15 kHz', amplitude: '4 um', driveAxis: [0, 1, 0], senseAxis: [1, 0, 0], hinge: [0, '0.5 mm', 0], senseMode: { frequency: '15.3 kHz', quality: 800, mass: '4 ug' } };
    const cases: [string, Record<string, unknown>, 'N' | 'strain' | 'm'][] = [
      ['load', { organ }, 'N'],
      ['strain', { organ: { ...organ, stalk } }, 'strain'],
      ['displacement', { organ: mems, sensor: { readoutNoise: '1e-14 m / Hz^0.5' } }, 'm'],
    ];
    for (const [quantity, doc, unit] of cases) {
      const maneuver = quantity === 'displacement' ? { duration: '2 ms', yaw: { pulse: { peak: '100 deg/s', duration: '1 ms', start: '0.5 ms' } } } : saccade;
      const a = answer({ ...doc, body: { maneuver }, output: { series: false } });
      const channels = a.readout.channels;
      expect(channels.length).toBeGreaterThan(0);
      expect(channels.every((c) => c.quantity === quantity), quantity).toBe(true);
      const header = beatsCsv(a).split('\r\n')[0]?.split(',') ?? [];
      expect(header.slice(8)).toEqual(channels.map((c) => `inphase_${c.side}_${c.axis}_k${c.order}_${unit}`));
    }
  });
});
