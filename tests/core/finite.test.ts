/**
 * Answers hold finite numbers only: inputs so large or small that the arithmetic leaves double
 * precision (IEEE 754: the largest double is about 1.8e308) are refused with the input of most
 * extreme magnitude named, instead of an answer whose members print as null in JSON.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { extremeInputs, firstNonFinite } from '../../src/finite.js';
import { forces, sensing, turn } from '../../src/index.js';
import { sweep } from '../../src/sweep.js';

const example = (name: string) => JSON.parse(readFileSync(new URL(`../../examples/${name}.json`, import.meta.url), 'utf8')) as Record<string, Record<string, unknown>>;
const fly = example('fly-sensing');
const saccade = example('fly-saccade');

const withOrgan = (doc: Record<string, Record<string, unknown>>, organ: Record<string, unknown>) => ({ ...doc, organ: { ...doc.organ, ...organ } });
const withYaw = (doc: Record<string, Record<string, unknown>>, yaw: number) => ({ ...doc, body: { ...doc.body, rate: { yaw } } });

const overflow = (path: string, value: string, where: RegExp) => ({
  ok: false,
  issues: [{ path, message: expect.stringMatching(new RegExp(`^${value.replace('+', '\\+')} is the input of most extreme magnitude, and the answer overflows double precision \\(${where.source}\\); expected magnitudes that a rate sensor can have; next in magnitude: `)) as unknown as string }],
});

describe('firstNonFinite and extremeInputs', () => {
  it('find the first number that is not finite, in arrays, typed arrays and objects', () => {
    expect(firstNonFinite({ a: [1, 2, { b: 3 }], c: new Float64Array([0, 1]) })).toBeUndefined();
    expect(firstNonFinite({ a: [1, 2, { b: 3, d: Number.NaN }] })).toEqual({ path: 'a[2].d', value: Number.NaN });
    expect(firstNonFinite({ a: null, s: 'x', t: new Float64Array([0, -Infinity]) })).toEqual({ path: 't[1]', value: -Infinity });
    expect(firstNonFinite(Infinity)).toEqual({ path: '(answer)', value: Infinity });
  });

  it('rank the quantities of a document by the size of their decimal exponent, unit strings in SI, as the document spells them', () => {
    const doc = withOrgan(withYaw(fly, 1e200), { mass: '1e-30 kg', hinge: [0, '1e-25 m', 0] });
    expect(extremeInputs(doc, 3)).toEqual([
      { path: 'body.rate.yaw', shown: '1e+200', value: 1e200 },
      { path: 'organ.mass', shown: "'1e-30 kg'", value: 1e-30 },
      { path: 'organ.hinge[1]', shown: "'1e-25 m'", value: 1e-25 },
    ]);
    // Text (names, descriptions, choices) is not a quantity; zeros have no magnitude.
    expect(extremeInputs({ name: 'x', organ: { drive: 'rotary', mass: 0 } })).toEqual([]);
  });
});

describe('answers that would overflow double precision are refused, the cause named', () => {
  it('forces and sensing: a 1e200 rad/s turn (centrifugal load ∝ Ω² ≈ 1e400)', () => {
    expect(forces(withYaw(fly, 1e200))).toEqual(overflow('body.rate.yaw', '1e+200', /organs\[0\]\.harmonics\[\d+\]\.amplitude is NaN/));
    expect(sensing(withYaw(fly, 1e200))).toEqual(overflow('body.rate.yaw', '1e+200', /organs\[0\]\.axes\.roll\.bias\.centrifugal is NaN/));
  });

  it('sensing: a beat at 1e300 Hz, a stalk 1e300 m long from its hinge', () => {
    expect(sensing(withOrgan(fly, { frequency: 1e300 }))).toEqual(overflow('organ.frequency', '1e+300', /organs\[0\]\.axes\.roll\.bias\.misalignment is NaN/));
    expect(sensing(withOrgan(fly, { arm: 1e300 }))).toEqual(overflow('organ.arm', '1e+300', /organs\[0\]\.strain\.leverArm is Infinity/));
  });

  it('turn: a maneuver whose rates leave double precision', () => {
    const maneuver = saccade.body?.maneuver as Record<string, unknown>;
    const doc = { ...saccade, body: { ...saccade.body, maneuver: { ...maneuver, yaw: { pulse: { peak: 1e200, duration: '60 ms', start: '40 ms' } } } } };
    expect(turn(doc)).toEqual(overflow('body.maneuver.yaw.pulse.peak', '1e+200', /[\w.[\]]+ is (NaN|Infinity|-Infinity)/));
  });

  it('sweep: the grid point where a line overflows, in the scenario at that point', () => {
    const r = sweep({ scenario: fly, vary: [{ field: 'body.rate.yaw', values: [1, 1e200] }], outputs: [{ line: { component: 'centrifugal', axis: 'x', order: 0 } }] });
    expect(r).toEqual({
      ok: false,
      issues: [{ path: 'scenario.body.rate.yaw', message: expect.stringMatching(/^1e\+200 is the input of most extreme magnitude, and the answer overflows double precision \(specified\.centrifugal\.x\.0\.amplitude is (Infinity|NaN)\); .* \(at the grid point body\.rate\.yaw = 1e\+200 rad\/s\)$/) as unknown as string }],
    });
  });

  it('leaves ordinary scenarios alone: the shipped examples and a fast turn answer', () => {
    for (const name of ['fly-tilted-stroke', 'mems-tuning-fork', 'measured-stroke', 'fly-sensing', 'mems-sensing']) {
      expect(forces(example(name)).ok, name).toBe(true);
      expect(sensing(example(name)).ok, name).toBe(true);
    }
    expect(turn(saccade).ok).toBe(true);
    expect(sensing(withYaw(fly, 1e4)).ok).toBe(true); // 10,000 rad/s: far beyond any animal or gyro
  });
});
