/**
 * Quantities and bad input (issue 2): every dimension the scenario uses converts to SI; wrong units,
 * NaN, infinities, non-positive sizes, bad axes, unknown fields and work over the limits are refused
 * with issues that name the field, the value and what was expected.
 */
import { describe, expect, it } from 'vitest';
import { compile, forces, LIMITS, parseScenario, type Issue } from '../../src/index.js';

const DEG = Math.PI / 180;
const organ = { mass: 6e-9, arm: 8.5e-4, frequency: 180, amplitude: 1, rest: [0, 1, 0], normal: [1, 0, 0] };

const issuesOf = (doc: unknown): Issue[] => {
  const r = forces(doc);
  if (r.ok) throw new Error('expected the document to be refused');
  return r.issues;
};

const scenarioOf = (doc: unknown) => {
  const r = parseScenario(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.scenario;
};

describe('parseScenario(doc): quantities in every dimension convert to SI', () => {
  const s = scenarioOf({
    organ: {
      mass: '7 ug', arm: '0.9 mm', frequency: '14 kHz', amplitude: '80 deg', rest: [0, 1, 0], normal: [1, 0, 0], hinge: ['0.3 mm', '-450 um', 0],
      stalk: { length: '0.8 mm', outerRadius: '40 um', innerRadius: '30 um', modulus: '5 GPa', mass: '1 ug' },
    },
    body: { rate: { roll: '500 deg/s', pitch: '2 rad/s', yaw: '0.5 deg/ms' }, acceleration: ['9.81 m/s^2', '-2 m/s^2', 0], gravity: '1.62 m/s^2', attitude: { pitch: '10 deg' } },
    sensor: { temperature: '27 degC', readoutNoise: '2e-10 N/sqrt(Hz)', integration: '20 ms', misalignment: '0.5 deg' },
  });
  const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

  it('mass, length, frequency, angle', () => {
    expect(s.organ.mass).toBe(7e-9); // 1 ug = 1e-9 kg
    expect(s.organ.drive === 'rotary' && s.organ.arm).toBe(9e-4);
    expect(s.organ.hinge).toEqual([3e-4, -4.5e-4, 0]);
    expect(s.organ.frequency).toBe(14000);
    expect(rel(s.organ.amplitude as number, 80 * DEG)).toBeLessThan(1e-14);
  });

  it('angular rate (deg/s, rad/s, deg/ms), acceleration, attitude angle', () => {
    expect(rel(s.body.rate.roll, 500 * DEG)).toBeLessThan(1e-14);
    expect(s.body.rate.pitch).toBe(2);
    expect(rel(s.body.rate.yaw, 500 * DEG)).toBeLessThan(1e-14);
    expect(s.body.acceleration).toEqual([9.81, -2, 0]);
    expect(s.body.gravity).toBe(1.62);
    expect(rel(s.body.attitude.pitch, 10 * DEG)).toBeLessThan(1e-14);
  });

  it('temperature (27 degC = 300.15 K), elastic modulus, time, force noise density', () => {
    expect(s.sensor?.temperature).toBeCloseTo(300.15, 10);
    expect(s.organ.drive === 'rotary' && s.organ.stalk?.modulus).toBe(5e9);
    expect(s.sensor?.integration).toBe(0.02);
    expect(s.sensor?.readoutNoise).toEqual({ value: 2e-10, dimension: 'forceDensity' });
  });

  it('noise densities in strain and displacement units keep their dimension', () => {
    const at = (readoutNoise: string) => scenarioOf({ organ, sensor: { readoutNoise } }).sensor?.readoutNoise;
    expect(at('1e-7 / Hz^0.5')).toEqual({ value: 1e-7, dimension: 'strainDensity' });
    expect(at('1e-12 m / Hz^0.5')).toEqual({ value: 1e-12, dimension: 'displacementDensity' });
    expect(at('3 pN/Hz^0.5')).toEqual({ value: 3e-12, dimension: 'forceDensity' });
  });

  it('peakToPeak is the whole stroke: 160 deg peak to peak is an 80 deg half stroke', () => {
    const c = compile(scenarioOf({ organ: { ...organ, amplitude: undefined, peakToPeak: '160 deg' } }));
    if (!c.ok) throw new Error(JSON.stringify(c.issues));
    const w = c.model.geometry.stroke;
    expect(w.kind === 'series' && rel(w.sin[0] as number, 80 * DEG)).toBeLessThan(1e-14);
  });

  it('plain numbers are SI', () => {
    expect(scenarioOf({ organ }).organ.mass).toBe(6e-9);
  });
});

describe('forces(doc) refuses bad input, naming the field, the value and what was expected', () => {
  it('wrong units for each dimension', () => {
    expect(issuesOf({ organ: { ...organ, mass: '12 mV' } })).toEqual([
      { path: 'organ.mass', message: "'12 mV' is not a mass; expected a mass: a number in kg or a string such as '7 ug'" },
    ]);
    expect(issuesOf({ organ: { ...organ, arm: '3 s', frequency: '170 m' } })).toEqual([
      { path: 'organ.frequency', message: "'170 m' is not a frequency; expected a frequency: a number in Hz or a string such as '170 Hz'" },
      { path: 'organ.arm', message: "'3 s' is not a length; expected a length: a number in m or a string such as '0.9 mm'" },
    ]);
    expect(issuesOf({ organ: { ...organ, amplitude: '80 mm' }, body: { rate: { yaw: '200 deg' }, acceleration: ['1 m/s', 0, 0] } })).toEqual([
      { path: 'organ.amplitude', message: "'80 mm' is not an angle; expected an angle: a number in rad or a string such as '80 deg'" },
      { path: 'body.rate.yaw', message: "'200 deg' is not an angular rate; expected an angular rate: a number in rad/s or a string such as '200 deg/s'" },
      { path: 'body.acceleration[0]', message: "'1 m/s' is not an acceleration; expected an acceleration: a number in m/s^2 or a string such as '9.81 m/s^2'" },
    ]);
    expect(issuesOf({ organ, sensor: { temperature: '300 kg' } })).toEqual([
      { path: 'sensor.temperature', message: "'300 kg' is not a temperature; expected a temperature: a number in K or a string such as '300 K'" },
    ]);
    expect(issuesOf({ organ: { ...organ, stalk: { length: 8e-4, outerRadius: 4e-5, modulus: '5 GN' } } })).toEqual([
      { path: 'organ.stalk.modulus', message: "'5 GN' is not a pressure (elastic modulus); expected a pressure (elastic modulus): a number in Pa or a string such as '5 GPa'" },
    ]);
    const noise = issuesOf({ organ, sensor: { readoutNoise: '2e-10 N' } });
    expect(noise.map((i) => i.path)).toEqual(['sensor.readoutNoise']);
    expect(noise[0]?.message).toMatch(/^'2e-10 N' is not a force noise density or a strain noise density or a displacement noise density; expected .* such as '2e-10 N \/ Hz\^0\.5'$/);
    expect(issuesOf({ organ: { ...organ, mass: '7 furlongs' } })[0]).toEqual({ path: 'organ.mass', message: "'7 furlongs' is not a quantity with known units; expected a mass: a number in kg or a string such as '7 ug'" });
  });

  it('NaN and ±Infinity through the library API', () => {
    expect(issuesOf({ organ: { ...organ, mass: Number.NaN, amplitude: Number.POSITIVE_INFINITY }, body: { rate: { yaw: Number.NEGATIVE_INFINITY } } })).toEqual([
      { path: 'organ.mass', message: "NaN is not a quantity; expected a mass: a number in kg or a string such as '7 ug'" },
      { path: 'organ.amplitude', message: "Infinity is not a quantity; expected an angle: a number in rad or a string such as '80 deg'" },
      { path: 'body.rate.yaw', message: "-Infinity is not a quantity; expected an angular rate: a number in rad/s or a string such as '200 deg/s'" },
    ]);
    expect(issuesOf({ organ: { ...organ, hinge: [0, Number.NaN, 0] } })).toEqual([
      { path: 'organ.hinge[1]', message: "NaN is not a quantity; expected a length: a number in m or a string such as '0.9 mm'" },
    ]);
    expect(issuesOf({ organ: { ...organ, rest: [0, Number.POSITIVE_INFINITY, 0] } })).toEqual([{ path: 'organ.rest[1]', message: 'Infinity is not a finite number' }]);
    expect(issuesOf({ organ: { ...organ, mass: '1e400 kg' } })[0]?.path).toBe('organ.mass');
  });

  it('zero or negative mass, arm and frequency', () => {
    expect(issuesOf({ organ: { ...organ, mass: 0, arm: -1e-3, frequency: '0 Hz' } })).toEqual([
      { path: 'organ.mass', message: '0 must be greater than zero' },
      { path: 'organ.frequency', message: "'0 Hz' must be greater than zero" },
      { path: 'organ.arm', message: '-0.001 must be greater than zero' },
    ]);
    expect(issuesOf({ organ: { ...organ, mass: '-2 ug' } })).toEqual([{ path: 'organ.mass', message: "'-2 ug' must be greater than zero" }]);
    expect(issuesOf({ organ: { drive: 'linear', mass: 1e-9, frequency: -5, amplitude: 0, driveAxis: [0, 1, 0], senseAxis: [1, 0, 0] } })).toEqual([
      { path: 'organ.frequency', message: '-5 must be greater than zero' },
      { path: 'organ.amplitude', message: '0 must be greater than zero' },
    ]);
  });

  it('zero-length and non-perpendicular axis vectors', () => {
    expect(issuesOf({ organ: { ...organ, rest: [0, 0, 0] } })).toEqual([
      { path: 'organ.rest', message: '[0,0,0] has zero length; expected a direction [x, y, z] in body axes' },
    ]);
    expect(issuesOf({ organ: { ...organ, rest: [1, 1, 0], normal: [1, 0, 0] } })).toEqual([
      { path: 'organ.normal', message: 'is not perpendicular to organ.rest (cosine 0.707 after normalising); expected |rest·normal| ≤ 1e-6' },
    ]);
    expect(issuesOf({ organ: { drive: 'linear', mass: 1e-9, frequency: 1e4, amplitude: 1e-6, driveAxis: [0, 1, 0], senseAxis: [0, 1, 1e-3] } })).toEqual([
      { path: 'organ.senseAxis', message: 'is not perpendicular to organ.driveAxis (cosine 1.00 after normalising); expected |driveAxis·senseAxis| ≤ 1e-6' },
    ]);
    // Within 1e-6 after normalising is accepted (and made exactly perpendicular in the model).
    expect(forces({ organ: { ...organ, rest: [0, 1, 5e-7], normal: [1, 0, 0] } }).ok).toBe(true);
    expect(issuesOf({ organ: { ...organ, normal: [1, 2] } })).toEqual([
      { path: 'organ.normal', message: '[1,2] is not a direction; expected three numbers [x, y, z] in body axes' },
    ]);
  });

  it('unknown fields, at any depth', () => {
    expect(issuesOf({ organ: { ...organ, colour: 'red' }, body: { rates: {} }, extra: 1 })).toEqual([
      { path: 'organ.colour', message: 'is not a field here; check the spelling against the scenario reference' },
      { path: 'body.rates', message: 'is not a field here; check the spelling against the scenario reference' },
      { path: 'extra', message: 'is not a field here; check the spelling against the scenario reference' },
    ]);
  });

  it('a half stroke of π or more in plain numbers (degrees mistaken for radians)', () => {
    expect(issuesOf({ organ: { ...organ, amplitude: 80 } })).toEqual([
      { path: 'organ.amplitude', message: "80 rad is a half stroke of π or more; give degrees as a string, e.g. '80 deg'" },
    ]);
  });

  it('amplitude and peakToPeak together, or neither', () => {
    expect(issuesOf({ organ: { ...organ, peakToPeak: 2 } })).toEqual([
      { path: 'organ.peakToPeak', message: 'given together with amplitude; give one of them: amplitude is the half stroke, peakToPeak the whole' },
    ]);
    expect(issuesOf({ organ: { ...organ, amplitude: undefined } })).toEqual([
      { path: 'organ.amplitude', message: 'is required for a sine stroke; give amplitude (half stroke) or peakToPeak' },
    ]);
  });

  it('work over the limits carries the limit\'s name', () => {
    expect(LIMITS.samplesPerRequest).toBe(65_536);
    expect(issuesOf({ organ, sampling: { pointsPerBeat: 8192, beats: 16 } })).toEqual([
      { path: 'sampling.beats', message: '8192 points × 16 beats = 131072 samples is over the limit of 65536 samples per request', limit: 'samplesPerRequest' },
    ]);
    expect(issuesOf({ organ, sampling: { pointsPerBeat: 9000 } })).toEqual([
      { path: 'sampling.pointsPerBeat', message: '9000 is over the limit of 8192 points per beat', limit: 'pointsPerBeat' },
    ]);
    expect(issuesOf({ organ, sampling: { harmonics: 65 } })).toEqual([{ path: 'sampling.harmonics', message: '65 is over the limit of 64 harmonics', limit: 'harmonics' }]);
    const long = Array.from({ length: LIMITS.tracePoints + 1 }, (_, i) => i * 1e-5);
    expect(issuesOf({ organ: { ...organ, amplitude: undefined, waveform: { samples: { time: long, angle: long.map(() => 0) }, harmonics: 3 } } })).toEqual([
      { path: 'organ.waveform.samples.time', message: '100001 points is over the limit of 100000', limit: 'tracePoints' },
      { path: 'organ.waveform.samples.angle', message: '100001 points is over the limit of 100000', limit: 'tracePoints' },
    ]);
    // The fit's work, points × (2K+1)²: 6,000 points allow all 64 harmonics (6000·129² < 1e8), 7,000 do not.
    const trace = (n: number) => Array.from({ length: n }, (_, i) => i * 1e-5);
    const fit = (n: number, K: number) => ({ organ: { ...organ, amplitude: undefined, waveform: { samples: { time: trace(n), angle: trace(n).map((t) => Math.sin(1131 * t)) }, harmonics: K } }, output: { series: false } });
    expect(LIMITS.fitWork).toBe(1e8);
    expect(forces(fit(6000, 64)).ok).toBe(true);
    expect(issuesOf(fit(7000, 64))).toEqual([
      { path: 'organ.waveform.harmonics', message: '64 harmonics over 7000 points is over the limit of 1e8 for points × (2K+1)², the work of the fit; expected at most 59 harmonics for this trace, or fewer points', limit: 'fitWork' },
    ]);
  });

  it('plain fields of the wrong type name the value and the type expected, in the same words everywhere', () => {
    expect(issuesOf({ organ, sampling: 42, name: null, description: {}, sensor: 'x', output: { series: 'yes' } })).toEqual([
      { path: 'sensor', message: "'x' is not an object" },
      { path: 'sampling', message: '42 is not an object' },
      { path: 'output.series', message: "'yes' is not true or false" },
      { path: 'name', message: 'null is not a string' },
      { path: 'description', message: '{} is not a string' },
    ]);
    expect(issuesOf({ organ: { ...organ, drive: 'rotory' } })).toEqual([{ path: 'organ.drive', message: '\'rotory\' is not a drive; expected "rotary" or "linear"' }]);
  });

  it('harmonics beyond Nyquist and wrong types', () => {
    expect(issuesOf({ organ, sampling: { pointsPerBeat: 16, harmonics: 8 } })).toEqual([
      { path: 'sampling.harmonics', message: '8 harmonics need at least 18 points per beat (Nyquist); pointsPerBeat is 16' },
    ]);
    expect(issuesOf({ organ, sampling: { pointsPerBeat: 64.5 } })).toEqual([
      { path: 'sampling.pointsPerBeat', message: '64.5 is not a whole number; expected points per beat from 8 to 8192' },
    ]);
    expect(issuesOf('a string')).toEqual([{ path: '(document)', message: "'a string' is not a scenario; expected a JSON object with at least \"organ\"" }]);
    expect(issuesOf({ organ: { ...organ, mirror: 'yes' } })).toEqual([{ path: 'organ.mirror', message: "'yes' is not true or false" }]);
  });
});
