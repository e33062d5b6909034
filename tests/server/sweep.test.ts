/**
 * The sweep engine (src/sweep.ts) and POST /api/v1/sweep: every grid point against a direct
 * `forces` computation, the rate-induced line against the closed form of design §4 with Bessel
 * values from the npm `bessel` package, grids, limits and refusals.
 */
import fc from 'fast-check';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { SweepAnswerSchema } from '../../server/routes/sweep.js';
import { forces, sensing, type Line } from '../../src/index.js';
import { sweep, SWEEP_LIMITS, type SweepAnswer } from '../../src/sweep.js';
import { example, expectedHash, JSON_HEADERS, PKG_VERSION, useApp } from './helpers.js';

const require = createRequire(import.meta.url);
const { besselj } = require('bessel') as { besselj: (x: number, n: number) => number };

const fly = example('fly-tilted-stroke');
const fork = example('mems-tuning-fork');

const ok = (r: ReturnType<typeof sweep>): SweepAnswer => {
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.answer;
};

/** A line straight from `forces` for a document. */
function direct(doc: Record<string, unknown>, organ: 0 | 1, component: string, axis: string, order: number): Line {
  const r = forces({ ...doc, output: { series: false } });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  const line = r.answer.organs[organ]?.harmonics.find((l) => l.component === component && l.axis === axis && l.order === order);
  if (!line) throw new Error('no such line');
  return line;
}

const withRates = (doc: Record<string, unknown>, rates: Record<string, number>) => ({ ...doc, body: { ...(doc.body as object), rate: { ...((doc.body as { rate: object }).rate), ...rates } } });

const OUTPUTS = [
  { component: 'coriolis', axis: 'normal', order: 2, organ: 'specified' },
  { component: 'coriolis', axis: 'radial', order: 1, organ: 'mirror' },
  { component: 'centrifugal', axis: 'radial', order: 0, organ: 'specified' },
  { component: 'centrifugal', axis: 'x', order: 2, organ: 'mirror' },
  { component: 'total', axis: 'z', order: 1, organ: 'specified' },
  { component: 'total', axis: 'normal', order: 3, organ: 'mirror' },
] as const;

describe('sweep(request): rate-polynomial method', () => {
  it('equals forces() at every grid point for random rates, both organs, several components (closed-form and sampled paths)', () => {
    const tri = { ...fly, organ: { ...(fly.organ as object), waveform: { triangle: { rounding: 0.4 } } } };
    fc.assert(
      fc.property(
        fc.constantFrom(fly, tri),
        fc.constantFrom('body.rate.roll', 'body.rate.pitch', 'body.rate.yaw'),
        fc.array(fc.double({ min: -40, max: 40, noNaN: true }), { minLength: 1, maxLength: 4 }),
        fc.constantFrom('amplitude', 'phase', 'cos', 'sin'),
        (doc, field, values, value) => {
          const a = ok(sweep({ scenario: doc, vary: [{ field, values }], outputs: OUTPUTS.map((line) => ({ line, value })) }));
          expect(a.method).toBe('rate-polynomial');
          expect(a.path).toBe(doc === fly ? 'closed-form' : 'sampled');
          values.forEach((v, i) => {
            const rate = field.split('.')[2] as string;
            OUTPUTS.forEach((o, j) => {
              const line = direct(withRates(doc, { [rate]: v }), o.organ === 'specified' ? 0 : 1, o.component, o.axis, o.order);
              const p = line.amplitude * Math.cos(line.phase), q = -line.amplitude * Math.sin(line.phase);
              const want = value === 'amplitude' ? line.amplitude : value === 'phase' ? line.phase : value === 'cos' ? p : q;
              const got = a.rows[i]?.[1 + j] as number;
              // Phase is ill-defined where the amplitude vanishes; compare it only on clear lines.
              if (value === 'phase') {
                if (line.amplitude > 1e-6 * Math.max(1e-12, Math.abs(direct(doc, 0, 'total', 'z', 1).amplitude))) {
                  const d = Math.abs(Math.atan2(Math.sin(got - want), Math.cos(got - want)));
                  expect(d, `${o.component}.${o.axis}.${o.order} phase at ${v}`).toBeLessThan(1e-6);
                }
              } else {
                expect(Math.abs(got - want), `${o.component}.${o.axis}.${o.order} ${value} at ${v}`).toBeLessThanOrEqual(1e-9 * Math.max(Math.abs(want), line.amplitude) + 1e-22);
              }
            });
          });
        },
      ),
      { numRuns: 25 },
    );
  });

  it('gives the even-order Coriolis normal line 4 m L k ω |Ω·t0| |J_k(Φ)|, linear in the yaw rate (design §4)', () => {
    const a = ok(sweep({ scenario: fly, vary: [{ field: 'body.rate.yaw', from: '-2000 deg/s', to: '2000 deg/s', steps: 101 }], outputs: [2, 4].map((order) => ({ line: { component: 'coriolis', axis: 'normal', order } })) }));
    const m = 6e-9, L = 0.85e-3, w = 2 * Math.PI * 180, Phi = (85 * Math.PI) / 180;
    const nn = Math.hypot(0.906, 0.423);
    // t0 = n × a0 with a0 = [0, 1, 0]: [−n_z, 0, n_x].
    const t0 = [-0.423 / nn, 0, 0.906 / nn];
    const roll = (100 * Math.PI) / 180;
    for (const row of a.rows) {
      const yaw = row[0] as number;
      const wt = Math.abs(roll * (t0[0] as number) + yaw * (t0[2] as number));
      [2, 4].forEach((k, j) => {
        const want = 4 * m * L * k * w * wt * Math.abs(besselj(Phi, k));
        expect(Math.abs((row[1 + j] as number) - want)).toBeLessThanOrEqual(1e-6 * want + 1e-20);
      });
    }
    expect(a.rows[0]?.[0]).toBeCloseTo((-2000 * Math.PI) / 180, 12);
    expect(a.rows[100]?.[0]).toBeCloseTo((2000 * Math.PI) / 180, 12);
  });

  it('spans the product of two rate axes, first axis outer, for a linear organ', () => {
    const a = ok(sweep({ scenario: fork, vary: [{ field: 'body.rate.roll', values: [0, 1] }, { field: 'body.rate.yaw', values: ['10 deg/s', '20 deg/s', '30 deg/s'] }], outputs: [{ line: { component: 'coriolis', axis: 'sense', order: 1 } }, { line: { component: 'total', axis: 'drive', order: 2, organ: 'mirror' }, name: 'driveTwice' }] }));
    expect(a.points).toBe(6);
    expect(a.columns).toEqual([
      { name: 'body.rate.roll', unit: 'rad/s', kind: 'field' },
      { name: 'body.rate.yaw', unit: 'rad/s', kind: 'field' },
      { name: 'specified.coriolis.sense.1.amplitude', unit: 'N', kind: 'line' },
      { name: 'driveTwice', unit: 'N', kind: 'line' },
    ]);
    const deg = Math.PI / 180;
    expect(a.rows.map((r) => [r[0], r[1]])).toEqual([[0, 10 * deg], [0, 20 * deg], [0, 30 * deg], [1, 10 * deg], [1, 20 * deg], [1, 30 * deg]].map(([x, y]) => [x, Number((y as number).toPrecision(15))]));
    for (const r of a.rows) {
      const doc = withRates(fork, { roll: r[0] as number, yaw: r[1] as number });
      expect(r[2]).toBeCloseTo(direct(doc, 0, 'coriolis', 'sense', 1).amplitude, 20);
      expect(Math.abs((r[3] as number) - direct(doc, 1, 'total', 'drive', 2).amplitude)).toBeLessThan(1e-12 * direct(doc, 1, 'total', 'drive', 2).amplitude + 1e-24);
    }
  });

  it('answers a 10,000-point rate sweep (the limit) and refuses one point more with 413 naming the limit', () => {
    const outputs = [{ line: { component: 'coriolis', axis: 'normal', order: 2 } }];
    const a = ok(sweep({ scenario: fly, vary: [{ field: 'body.rate.yaw', from: 0, to: 10, steps: SWEEP_LIMITS.sweepPoints }], outputs }));
    expect(a.rows.length).toBe(10_000);
    const r = sweep({ scenario: fly, vary: [{ field: 'body.rate.yaw', from: 0, to: 10, steps: 100 }, { field: 'body.rate.roll', from: 0, to: 1, steps: 101 }], outputs });
    expect(r).toEqual({ ok: false, issues: [{ path: 'vary', message: '100 × 101 = 10100 grid points is over the limit of 10000 for a rate sweep', limit: 'sweepPoints' }] });
  });
});

describe('sweep(request): per-point method', () => {
  it('equals forces() at every point when the stroke amplitude varies (log spacing, ends exact)', () => {
    const a = ok(sweep({ scenario: fly, vary: [{ field: 'organ.amplitude', from: '10 deg', to: '90 deg', steps: 7, spacing: 'log' }], outputs: [{ line: { component: 'coriolis', axis: 'normal', order: 2 } }, { line: { component: 'primary', axis: 'tangential', order: 1 }, value: 'phase' }] }));
    expect(a.method).toBe('per-point');
    expect(a.path).toBe('closed-form');
    const xs = a.rows.map((r) => r[0] as number);
    expect(xs[0]).toBe(Number(((10 * Math.PI) / 180).toPrecision(15)));
    expect(xs[6]).toBe(Number(((90 * Math.PI) / 180).toPrecision(15)));
    for (let i = 1; i < 7; i++) expect((xs[i] as number) / (xs[i - 1] as number)).toBeCloseTo(9 ** (1 / 6), 12);
    a.rows.forEach((r) => {
      const doc = { ...fly, organ: { ...(fly.organ as object), amplitude: r[0] } };
      // The sweep carries the Bessel series only to the orders asked for: equal to ~1 ulp.
      const c = direct(doc, 0, 'coriolis', 'normal', 2).amplitude;
      expect(Math.abs((r[1] as number) - c)).toBeLessThanOrEqual(1e-13 * c);
      expect(r[2]).toBeCloseTo(direct(doc, 0, 'primary', 'tangential', 1).phase, 13);
    });
  });

  it('names the grid point and the scenario field when a point is invalid', () => {
    const r = sweep({ scenario: fly, vary: [{ field: 'organ.mass', values: ['6 ug', 0] }], outputs: [{ line: { component: 'total', axis: 'x', order: 1 } }] });
    expect(r).toEqual({ ok: false, issues: [{ path: 'scenario.organ.mass', message: '0 must be greater than zero (at the grid point organ.mass = 0 kg)' }] });
  });

  it('stops with a sweepTime issue when the time budget runs out', () => {
    // The clock reads 1000 at the start and advances 1000 ms per reading (one reading per 16 points).
    let t = 0;
    const r = sweep({ scenario: fly, vary: [{ field: 'organ.arm', from: '0.5 mm', to: '1 mm', steps: 100 }], outputs: [{ line: { component: 'total', axis: 'x', order: 1 } }] }, { now: () => (t += 1000), budgetMs: 5000 });
    expect(r).toEqual({ ok: false, issues: [{ path: 'vary', message: 'the sweep ran over its time budget of 5000 ms after 95 of 100 grid points; ask for fewer points or a cheaper scenario (fewer points per beat, a sine stroke for the closed form)', limit: 'sweepTime' }] });
  });

  it('refuses more than 1,000 recomputed points, naming the limit', () => {
    const r = sweep({ scenario: fly, vary: [{ field: 'organ.frequency', from: 100, to: 200, steps: 1001 }], outputs: [{ line: { component: 'total', axis: 'x', order: 1 } }] });
    expect(r).toEqual({ ok: false, issues: [{ path: 'vary', message: '1001 grid points is over the limit of 1000 for a sweep computed point by point (fields other than body rates, or sensing figures)', limit: 'sweepPointsRecomputed' }] });
  });
});

describe('sweep(request): sensing figures', () => {
  it('equals sensing() at every grid point, with units from the figure and the channel', () => {
    const doc = example('fly-sensing');
    const a = ok(sweep({ scenario: doc, vary: [{ field: 'sensor.integration', values: ['10 ms', '100 ms', '1 s'] }], outputs: [{ sensing: 'organs[0].axes.yaw.minimumRate' }, { line: { component: 'coriolis', axis: 'normal', order: 2 } }, { sensing: 'pair.yaw.minimumRate', name: 'pairYaw' }, { sensing: 'organs[1].axes.yaw.scaleFactor' }, { sensing: 'organs[0].axes.yaw.bias.quadrature' }] }));
    expect(a.method).toBe('per-point');
    expect(a.columns).toEqual([
      { name: 'sensor.integration', unit: 's', kind: 'field' },
      { name: 'organs[0].axes.yaw.minimumRate', unit: 'rad/s', kind: 'sensing' },
      { name: 'specified.coriolis.normal.2.amplitude', unit: 'N', kind: 'line' },
      { name: 'pairYaw', unit: 'rad/s', kind: 'sensing' },
      { name: 'organs[1].axes.yaw.scaleFactor', unit: '1/(rad/s)', kind: 'sensing' },
      { name: 'organs[0].axes.yaw.bias.quadrature', unit: 'rad/s', kind: 'sensing' },
    ]);
    a.rows.forEach((row, i) => {
      const r = sensing({ ...doc, sensor: { ...(doc.sensor as object), integration: ['10 ms', '100 ms', '1 s'][i] } });
      if (!r.ok) throw new Error('invalid');
      expect(row.slice(1)).toEqual([r.answer.organs[0]?.axes.yaw.minimumRate, expect.any(Number), r.answer.pair.yaw.minimumRate, r.answer.organs[1]?.axes.yaw.scaleFactor, r.answer.organs[0]?.axes.yaw.bias?.quadrature]);
    });
    // White noise averaged over T: the minimum rate falls as 1/√T (design §6, σ = √(S/T)).
    expect((a.rows[0]?.[1] as number) / (a.rows[2]?.[1] as number)).toBeCloseTo(10, 9);
  });
});

describe('sweep(request): the unit of every sensing figure', () => {
  /** Every numeric leaf of a sensing answer (first element of each list), outside the echoed scenario. */
  function leaves(x: unknown, p: string, out: string[]): string[] {
    if (Array.isArray(x)) {
      if (x.length > 0) leaves(x[0], `${p}[0]`, out);
    } else if (x !== null && typeof x === 'object') {
      for (const [k, v] of Object.entries(x)) if (!(p === '' && (k === 'scenario' || k === 'version'))) leaves(v, p ? `${p}.${k}` : k, out);
    } else if (typeof x === 'number') out.push(p);
    return out;
  }

  it.each(['fly-sensing', 'mems-sensing'])('names an SI unit for every number of the %s answer, the stalk and sense-mode tables included', (name) => {
    const scenario = { ...example(name), output: { series: false, lines: true } };
    const r = sensing(scenario);
    if (!r.ok) throw new Error('invalid');
    const paths = leaves(r.answer, '', []);
    expect(paths.length).toBeGreaterThan(40);
    const units = [];
    for (let i = 0; i < paths.length; i += SWEEP_LIMITS.sweepOutputs) {
      const outputs = paths.slice(i, i + SWEEP_LIMITS.sweepOutputs).map((sensing) => ({ sensing }));
      units.push(...ok(sweep({ scenario, vary: [{ field: 'sensor.threshold', values: [1] }], outputs })).columns.slice(1));
    }
    expect(units).toHaveLength(paths.length);
    expect(units.filter((c) => c.unit === '').map((c) => c.name)).toEqual([]);
  });

  it('gives the channel-dependent figures the unit of what the channel reads (the answer\'s units map, in SI)', () => {
    const unitOf = (name: string, paths: string[]) => {
      const scenario = { ...example(name), output: { series: false, lines: true } };
      return ok(sweep({ scenario, vary: [{ field: 'sensor.threshold', values: [1] }], outputs: paths.map((sensing) => ({ sensing })) })).columns.slice(1).map((c) => c.unit);
    };
    expect(unitOf('mems-sensing', ['organs[0].senseMode.thermalForceDensity', 'organs[0].senseMode.stiffness', 'organs[0].senseMode.damping', 'organs[0].senseMode.transfer[0].magnitude', 'organs[0].senseMode.perUnitRate.yaw[0].amplitude', 'pair.matrix[0].yaw', 'pair.matrix[0].noise', 'pair.covariance[2][2]', 'pair.singularValues[0]', 'organs[0].axes.yaw.noise.density']))
      .toEqual(['N/Hz^0.5', 'N/m', 'N s/m', 'm/N', 'm/(rad/s)', 'm/(rad/s)', 'm', '(rad/s)^2', '1/(rad/s)', 'm/Hz^0.5']);
    expect(unitOf('fly-sensing', ['organs[0].strain.perLoad.inPlane', 'organs[0].strain.section.secondMomentNormal', 'organs[0].strain.leverArm', 'organs[0].strain.harmonics[0].amplitude', 'pair.matrix[0].roll', 'organs[0].axes.yaw.crossAxis.roll', 'integration.beats']))
      .toEqual(['1/N', 'm^4', 'm', '1', '1/(rad/s)', '1', '1']);
  });
});

describe('sweep(request): refusals name the field', () => {
  const line = { line: { component: 'total', axis: 'x', order: 1 } };
  const cases: [string, unknown, { path: string; message: string; limit?: string }[]][] = [
    ['an unknown field', { scenario: fly, vary: [{ field: 'organ.colour', values: [1] }], outputs: [line] }, [{ path: 'vary[0].field', message: expect.stringMatching(/^'organ.colour' is not a field that can vary; expected one of organ.mass, organ.arm, /) as unknown as string }]],
    ['values and a range together', { scenario: fly, vary: [{ field: 'organ.mass', values: [1], from: 1 }], outputs: [line] }, [{ path: 'vary[0]', message: 'gives both values and from/to/steps; expected one of them' }]],
    ['a range without steps', { scenario: fly, vary: [{ field: 'organ.mass', from: 1, to: 2 }], outputs: [line] }, [{ path: 'vary[0].steps', message: 'is required; expected "values": [...] or "from", "to" and "steps"' }]],
    ['log spacing through zero', { scenario: fly, vary: [{ field: 'body.rate.yaw', from: -1, to: 1, steps: 3, spacing: 'log' }], outputs: [line] }, [{ path: 'vary[0].spacing', message: '"log" needs from and to greater than zero; from is -1, to is 1 rad/s' }]],
    ['a value of the wrong dimension', { scenario: fly, vary: [{ field: 'body.rate.yaw', values: ['3 m/s'] }], outputs: [line] }, [{ path: 'vary[0].values[0]', message: "'3 m/s' is not an angular rate; expected an angular rate: a number in rad/s or a string such as '200 deg/s'" }]],
    ['an axis of the other drive', { scenario: fly, vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [{ line: { component: 'total', axis: 'sense', order: 1 } }] }, [{ path: 'outputs[0].line.axis', message: "'sense' is not an axis of a rotary organ; expected one of x, y, z, radial, tangential, normal" }]],
    ['an unknown component', { scenario: fly, vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [{ line: { component: 'magnetic', axis: 'x', order: 1 } }] }, [{ path: 'outputs[0].line.component', message: "'magnetic' is not a load component; expected one of primary, centrifugal, angularAcceleration, coriolis, translational, gravity, total" }]],
    ['the mirror of an organ without one', { scenario: { ...fly, organ: { ...(fly.organ as object), mirror: false } }, vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [{ line: { component: 'total', axis: 'x', order: 1, organ: 'mirror' } }] }, [{ path: 'outputs[0].line.organ', message: "'mirror' asks for the mirror organ, but the scenario sets organ.mirror to false" }]],
    ['an order above Nyquist on the sampled path', { scenario: { ...fly, organ: { ...(fly.organ as object), waveform: 'triangle' }, sampling: { pointsPerBeat: 16, harmonics: 4 } }, vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [{ line: { component: 'total', axis: 'x', order: 9 } }] }, [{ path: 'outputs[0].line.order', message: '9 is above the 7 orders that 16 points per beat resolve; raise sampling.pointsPerBeat' }]],
    ['three grid axes', { scenario: fly, vary: [1, 2, 3].map(() => ({ field: 'organ.mass', values: [1] })), outputs: [line] }, [{ path: 'vary', message: 'has more than two grid axes; expected one or two' }]],
    ['no outputs', { scenario: fly, vary: [{ field: 'organ.mass', values: [1] }], outputs: [] }, [{ path: 'outputs', message: 'is empty; expected at least one output' }]],
    ['a sensing path that is not a number', { scenario: fly, vary: [{ field: 'organ.mass', values: ['6 ug'] }], outputs: [{ sensing: 'organs[0].axes.yaw' }] }, [{ path: 'outputs[0].sensing', message: '\'organs[0].axes.yaw\' is not a number in the sensing answer; expected a path such as "organs[0].axes.yaw.minimumRate"' }]],
    ['a sensing path that is not a path', { scenario: fly, vary: [{ field: 'organ.mass', values: ['6 ug'] }], outputs: [{ sensing: 'organs..yaw' }] }, [{ path: 'outputs[0].sensing', message: '\'organs..yaw\' is not a path; expected e.g. "organs[0].axes.yaw.minimumRate"' }]],
    ['an invalid scenario', { scenario: { organ: { mass: '1 kg' } }, vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [line] }, [
      { path: 'scenario.organ.frequency', message: "is required; expected a frequency: a number in Hz or a string such as '170 Hz'" },
      { path: 'scenario.organ.arm', message: "is required; expected a length: a number in m or a string such as '0.9 mm'" },
      { path: 'scenario.organ.rest', message: 'nothing is not a direction; expected three numbers [x, y, z] in body axes' },
      { path: 'scenario.organ.normal', message: 'nothing is not a direction; expected three numbers [x, y, z] in body axes' },
    ]],
    ['a request without a scenario', { vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [line] }, [{ path: 'scenario', message: 'is required; expected a scenario document, as for POST /api/v1/forces' }]],
    ['an output line that is not an object', { scenario: fly, vary: [{ field: 'organ.mass', values: [1] }], outputs: [{ line: 7 }, { sensing: 5 }] }, [{ path: 'outputs[0].line', message: '7 is not an object' }, { path: 'outputs[1].sensing', message: '5 is not a string' }]],
    ['a scenario that is not an object', { scenario: 7, vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [line] }, [{ path: 'scenario', message: '7 is not a scenario; expected a JSON object with at least "organ"' }]],
    ['a request without vary and outputs', { scenario: fly }, [
      { path: 'vary', message: 'is required; expected a list of one or two grid axes' },
      { path: 'outputs', message: 'is required; expected a list of outputs (harmonic lines or sensing figures)' },
    ]],
    ['an unknown member of the request', { scenario: fly, vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [line], output: 'csv' }, [{ path: 'output', message: 'is not a field here; a sweep request has scenario, vary, outputs, and optionally name and description (docs/service.md, Sweeps)' }]],
    ['not an object', 'sweep', [{ path: '(document)', message: "'sweep' is not a sweep request; expected { \"scenario\", \"vary\", \"outputs\" }" }]],
  ];
  for (const [what, request, issues] of cases) {
    it(`refuses ${what}`, () => {
      expect(sweep(request)).toEqual({ ok: false, issues });
    });
  }

  it('accepts a name and a description, which leave the answer as it was', () => {
    const request = { scenario: fly, vary: [{ field: 'body.rate.yaw', values: [0, 1] }], outputs: [line] };
    expect(sweep({ ...request, name: 'yaw check', description: 'a note for the author' })).toEqual(sweep(request));
  });
});

describe('POST /api/v1/sweep', () => {
  const app = useApp();
  const request = { scenario: fly, vary: [{ field: 'body.rate.yaw', values: ['0 deg/s', '500 deg/s'] }], outputs: [{ line: { component: 'coriolis', axis: 'normal', order: 2 } }] };

  it('answers the table stamped with version and hash; JSON and CSV', async () => {
    const r = await app().inject({ method: 'POST', url: '/api/v1/sweep', payload: request, headers: JSON_HEADERS });
    expect(r.statusCode).toBe(200);
    const lib = ok(sweep(request));
    const yaw = direct(withRates(fly, { yaw: (500 * Math.PI) / 180 }), 0, 'coriolis', 'normal', 2).amplitude;
    const zero = direct(withRates(fly, { yaw: 0 }), 0, 'coriolis', 'normal', 2).amplitude;
    expect(r.json()).toEqual({
      version: PKG_VERSION,
      inputHash: expectedHash(request),
      method: 'rate-polynomial',
      path: 'closed-form',
      points: 2,
      columns: [
        { name: 'body.rate.yaw', unit: 'rad/s', kind: 'field' },
        { name: 'specified.coriolis.normal.2.amplitude', unit: 'N', kind: 'line' },
      ],
      rows: lib.rows,
      warnings: [],
    });
    expect(lib.rows[0]?.[0]).toBe(0);
    expect(lib.rows[1]?.[0]).toBe(Number(((500 * Math.PI) / 180).toPrecision(15)));
    expect(Math.abs((lib.rows[0]?.[1] as number) - zero)).toBeLessThan(1e-9 * zero);
    expect(Math.abs((lib.rows[1]?.[1] as number) - yaw)).toBeLessThan(1e-9 * yaw);
    expect(() => SweepAnswerSchema.parse(r.json())).not.toThrow();
    const csv = await app().inject({ method: 'POST', url: '/api/v1/sweep?format=csv', payload: request, headers: JSON_HEADERS });
    expect(csv.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(csv.body).toBe(`body.rate.yaw_rad/s,specified.coriolis.normal.2.amplitude_N\r\n${lib.rows.map((row) => row.join(',')).join('\r\n')}\r\n`);
  });

  it('refuses an invalid request with 400 and a grid over the limit with 413', async () => {
    const bad = await app().inject({ method: 'POST', url: '/api/v1/sweep', payload: { ...request, vary: [{ field: 'body.rate.yaw', values: ['fast'] }] }, headers: JSON_HEADERS });
    expect(bad.statusCode).toBe(400);
    expect(bad.json()).toEqual({
      error: 'invalid_request',
      message: 'the request is invalid',
      issues: [{ path: 'vary[0].values[0]', message: "'fast' is not a quantity with known units; expected an angular rate: a number in rad/s or a string such as '200 deg/s'" }],
      version: PKG_VERSION,
      inputHash: expectedHash({ ...request, vary: [{ field: 'body.rate.yaw', values: ['fast'] }] }),
    });
    const badScenario = { ...request, scenario: { ...fly, organ: { ...(fly.organ as object), arm: '-1 mm' } } };
    const s = await app().inject({ method: 'POST', url: '/api/v1/sweep', payload: badScenario, headers: JSON_HEADERS });
    expect(s.statusCode).toBe(400);
    expect(s.json()).toEqual({
      error: 'invalid_scenario',
      message: 'the scenario is invalid',
      issues: [{ path: 'scenario.organ.arm', message: "'-1 mm' must be greater than zero" }],
      version: PKG_VERSION,
      inputHash: expectedHash(badScenario),
    });
    const big = { ...request, vary: [{ field: 'body.rate.yaw', from: 0, to: 1, steps: 20_000 }] };
    const l = await app().inject({ method: 'POST', url: '/api/v1/sweep', payload: big, headers: JSON_HEADERS });
    expect(l.statusCode).toBe(413);
    expect(l.json()).toEqual({
      error: 'over_limit',
      message: 'the request asks for more work than one request may',
      issues: [{ path: 'vary[0].steps', message: '20000 is over the limit of 10000 grid points', limit: 'sweepPoints' }],
      version: PKG_VERSION,
      inputHash: expectedHash(big),
      limit: 'sweepPoints',
    });
  });
});
