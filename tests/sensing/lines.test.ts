import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { organNumbers, type Path } from '../../src/forces.js';
import { lineIndex } from '../../src/harmonics.js';
import { compile, type Model, type Motion } from '../../src/model.js';
import { parseScenario, type ScenarioInput } from '../../src/scenario.js';
import { axisAt, BLOCK, centrifugalForm, organLines, unitAt, type OrganLines } from '../../src/sensing/lines.js';

const K = 6;
const modelOf = (doc: ScenarioInput): Model => {
  const p = parseScenario(doc);
  if (!p.ok) throw new Error(JSON.stringify(p.issues));
  const c = compile(p.scenario);
  if (!c.ok) throw new Error(JSON.stringify(c.issues));
  return c.model;
};

/** The core's organ-frame lines of a model under a given motion: (component, axis, order) → (p, q). */
function coreLines(model: Model, motion: Motion, mirror: boolean, path: Path) {
  const t = organNumbers({ ...model, motion }, { mirror, path, pointsPerBeat: 256, harmonics: K, series: false }).table;
  return (component: number, b: number, k: number): [number, number] => {
    const at = lineIndex(t, component, 3 + b, k);
    return [t.pq[at] as number, t.pq[at + 1] as number];
  };
}

const unit = (i: number): [number, number, number] => [i === 0 ? 1 : 0, i === 1 ? 1 : 0, i === 2 ? 1 : 0];
const vec = fc.tuple(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true })).filter((v) => Math.hypot(...v) > 0.2);

const rotaryDoc = (rest: number[], other: number[], phase: number, mean: number, hinge: number[]): ScenarioInput => {
  const r = Math.hypot(rest[0] as number, rest[1] as number, rest[2] as number);
  const a = rest.map((x) => x / r);
  const d = other.reduce((s, x, i) => s + x * (a[i] as number), 0);
  const n = other.map((x, i) => x - d * (a[i] as number));
  return {
    organ: {
      mass: '5 ug', arm: '0.8 mm', frequency: '150 Hz', rest: a as [number, number, number], normal: n as [number, number, number], mean,
      waveform: { harmonics: [{ order: 1, cos: 1.2 * Math.sin(phase), sin: 1.2 * Math.cos(phase) }] },
      hinge: hinge.map((x) => x * 1e-3) as [number, number, number], stalk: { length: '0.7 mm', outerRadius: '30 um', modulus: '4 GPa', mass: '1 ug' },
    },
    body: { rate: { roll: 2, pitch: -1, yaw: 3 }, acceleration: [1, -2, 0.5], gravity: true, attitude: { roll: 0.3, pitch: -0.2 } },
    sampling: { harmonics: K },
  };
};

function expectLines(model: Model, L: { specified: OrganLines; mirror: OrganLines }, path: Path, tol: number): void {
  const zero: Motion = { omega: [0, 0, 0], omegaDot: [0, 0, 0], accel: [0, 0, 0], gravity: [0, 0, 0] };
  const scale = Math.max(...Array.from(L.specified.data, Math.abs));
  const close = (a: [number, number], p: number, q: number) => {
    expect(Math.abs(a[0] - p)).toBeLessThan(tol * scale);
    expect(Math.abs(a[1] - q)).toBeLessThan(tol * scale);
  };
  for (const [mirror, lines] of [[false, L.specified], [true, L.mirror]] as const) {
    for (let i = 0; i < 3; i++) {
      const core = coreLines(model, { ...zero, omega: unit(i), omegaDot: unit(i) }, mirror, path);
      for (let b = 0; b < 3; b++) {
        for (let k = 0; k <= K; k++) {
          const c = unitAt(lines, BLOCK.coriolis, i, b, k), a = unitAt(lines, BLOCK.angularAcceleration, i, b, k);
          close(core(3, b, k), lines.data[c] as number, lines.data[c + 1] as number);
          close(core(2, b, k), lines.data[a] as number, lines.data[a + 1] as number);
        }
      }
    }
    const core = coreLines(model, { ...model.motion, omegaDot: [0, 0, 0] }, mirror, path);
    for (const [name, comp] of [['primary', 0], ['centrifugal', 1], ['translational', 4], ['gravity', 5]] as const) {
      for (let b = 0; b < 3; b++) {
        for (let k = 0; k <= K; k++) {
          const at = axisAt(lines, BLOCK[name], b, k);
          close(core(comp, b, k), lines.data[at] as number, lines.data[at + 1] as number);
        }
      }
    }
  }
}

describe('organLines(model) against the core loads', () => {
  it('closed form (rotary sine, any geometry, stroke phase and mean) equals the core sampled lines for both organs', () => {
    fc.assert(
      fc.property(vec, vec, fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: -0.5, max: 0.5, noNaN: true }), vec, (rest, other, phase, mean, hinge) => {
        const c = Math.abs(rest.reduce((s, x, i) => s + x * (other[i] as number), 0)) / (Math.hypot(...rest) * Math.hypot(...other));
        fc.pre(c < 0.95);
        const model = modelOf(rotaryDoc(rest, other, phase, mean, hinge));
        expectLines(model, organLines(model, 'closed-form', 256, K), 'sampled', 1e-9);
      }),
      { numRuns: 25 },
    );
  });

  it('closed form (linear, several stroke harmonics) equals the core sampled lines for both organs', () => {
    const model = modelOf({
      organ: { drive: 'linear', mass: '2 ug', frequency: '12 kHz', driveAxis: [0, 1, 0.2], senseAxis: [1, 0, 0], hinge: ['0.1 mm', '0.5 mm', '-0.2 mm'], waveform: { harmonics: [{ order: 1, sin: '5 um' }, { order: 3, cos: '0.4 um', sin: '-0.2 um' }] } },
      body: { rate: { roll: 20, pitch: -10, yaw: 30 }, acceleration: [3, 1, -2], gravity: true },
      sampling: { harmonics: K },
    });
    expectLines(model, organLines(model, 'closed-form', 256, K), 'sampled', 1e-9);
  });

  it('sampled path (triangle stroke) equals the core lines for both organs', () => {
    const doc = rotaryDoc([0, 1, 0], [1, 0, 0.5], 0, 0.1, [0.2, 0.3, 0]);
    const organ = { ...(doc.organ as object), waveform: { triangle: { rounding: 0.4 } }, amplitude: '70 deg' };
    delete (organ as Record<string, unknown>).mean;
    const model = modelOf({ ...doc, organ } as ScenarioInput);
    expectLines(model, organLines(model, 'sampled', 256, K), 'sampled', 1e-12);
  });

  it('centrifugalForm(model) reproduces the centrifugal lines at an arbitrary rate (quadratic in Ω)', () => {
    const model = modelOf(rotaryDoc([0, 1, 0.2], [1, 0, 0.5], 0.4, 0.1, [0.2, 0.3, -0.1]));
    const Q = centrifugalForm(model, 'closed-form', 256, K);
    const span = 3 * 2 * (K + 1);
    const w: [number, number, number] = [1.7, -2.2, 0.9];
    const coef = [w[0] ** 2, w[1] ** 2, w[2] ** 2, 2 * w[0] * w[1], 2 * w[0] * w[2], 2 * w[1] * w[2]];
    const L = organLines({ ...model, motion: { ...model.motion, omega: w } }, 'closed-form', 256, K).specified;
    const c0 = axisAt(L, BLOCK.centrifugal, 0, 0);
    for (let x = 0; x < span; x++) {
      const v = coef.reduce((s, c, m) => s + c * (Q[m * span + x] as number), 0);
      expect(v).toBeCloseTo(L.data[c0 + x] as number, 12);
    }
    const Qs = centrifugalForm(model, 'sampled', 256, K);
    for (let x = 0; x < Q.length; x++) expect(Math.abs((Qs[x] as number) - (Q[x] as number))).toBeLessThan(1e-9 * Math.max(...Array.from(Q, Math.abs)));
  });
});
