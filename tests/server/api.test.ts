/**
 * Every route through app.inject, whole bodies asserted, refusals included.
 */
import { createRequire } from 'node:module';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../server/app.js';
import { ForcesAnswerSchema } from '../../server/routes/forces.js';
import { ExampleListSchema } from '../../server/routes/examples.js';
import { HealthSchema } from '../../server/routes/health.js';
import { SensingAnswerSchema } from '../../server/routes/sensing.js';
import { TurnAnswerSchema } from '../../server/routes/turn.js';
import { ErrorSchema } from '../../server/schemas.js';
import { beatsCsv, forces, harmonicsCsv, sensing, seriesCsv, turn, turnSeriesCsv } from '../../src/index.js';
import { sensingCsv } from '../../src/sensing/index.js';
import { example, exampleText, expectedHash, JSON_HEADERS, PKG_VERSION, wire } from './helpers.js';

const require = createRequire(import.meta.url);
const { besselj } = require('bessel') as { besselj: (x: number, n: number) => number };

let app: FastifyInstance;
beforeAll(async () => {
  app = buildApp();
  await app.ready();
});
afterAll(async () => {
  await app.close();
});

const post = (url: string, payload: unknown, headers: Record<string, string> = {}) =>
  app.inject({ method: 'POST', url, payload: typeof payload === 'string' ? payload : JSON.stringify(payload), headers: { ...JSON_HEADERS, ...headers } });

const fly = example('fly-tilted-stroke');

describe('GET /health', () => {
  it('answers ok with the package version', async () => {
    const r = await app.inject({ method: 'GET', url: '/health' });
    expect(r.statusCode).toBe(200);
    expect(r.json()).toEqual({ status: 'ok', version: PKG_VERSION });
    expect(HealthSchema.parse(r.json())).toEqual(r.json());
    expect(r.headers['x-beatforce-version']).toBe(PKG_VERSION);
  });
});

describe('POST /api/v1/forces', () => {
  it('answers the library answer, stamped with version and input hash', async () => {
    const r = await post('/api/v1/forces', fly);
    expect(r.statusCode).toBe(200);
    const lib = forces(fly);
    expect(lib.ok).toBe(true);
    if (!lib.ok) return;
    const hash = expectedHash(fly);
    expect(r.json()).toEqual(wire({ ...lib.answer, version: PKG_VERSION, inputHash: hash }));
    expect(r.headers['x-input-hash']).toBe(hash);
    expect(r.headers['content-type']).toBe('application/json; charset=utf-8');
    // The documented answer schema holds the real answer (strict objects: nothing undocumented).
    expect(() => ForcesAnswerSchema.parse(r.json())).not.toThrow();
  });

  it('gives the Coriolis normal line of even order k as 4 m L k ω |Ω·t0| |J_k(Φ)| on both organs', async () => {
    // Design §4 closed form; J_k from the npm `bessel` package (A&S 9.1.42–43 Jacobi–Anger expansion).
    const body = (await post('/api/v1/forces', fly)).json() as { organs: { harmonics: { component: string; axis: string; order: number; amplitude: number }[] }[] };
    const m = 6e-9, L = 0.85e-3, w = 2 * Math.PI * 180, Phi = (85 * Math.PI) / 180;
    const nn = Math.hypot(0.906, 0.423);
    const n = [0.906 / nn, 0, 0.423 / nn];
    const a0 = [0, 1, 0];
    const t0 = [n[1]! * a0[2]! - n[2]! * a0[1]!, n[2]! * a0[0]! - n[0]! * a0[2]!, n[0]! * a0[1]! - n[1]! * a0[0]!];
    const deg = Math.PI / 180;
    const omega = [100 * deg, 0, 300 * deg];
    const wt = Math.abs(omega[0]! * t0[0]! + omega[1]! * t0[1]! + omega[2]! * t0[2]!);
    for (const organ of body.organs) {
      for (const k of [2, 4, 6]) {
        const line = organ.harmonics.find((l) => l.component === 'coriolis' && l.axis === 'normal' && l.order === k);
        const expected = 4 * m * L * k * w * wt * Math.abs(besselj(Phi, k));
        expect(Math.abs((line?.amplitude ?? 0) - expected) / expected, `k=${k}`).toBeLessThan(1e-6);
      }
    }
  });

  it('hashes the document, not its layout: same hash for reordered keys, another for another value', async () => {
    const reordered = Object.fromEntries(Object.entries(fly).reverse());
    const a = (await post('/api/v1/forces', fly)).json() as { inputHash: string };
    const b = (await app.inject({ method: 'POST', url: '/api/v1/forces', payload: JSON.stringify(reordered, null, 3), headers: JSON_HEADERS })).json() as { inputHash: string };
    const c = (await post('/api/v1/forces', { ...fly, name: 'another' })).json() as { inputHash: string };
    expect(a.inputHash).toMatch(/^[0-9a-f]{16}$/);
    expect(b.inputHash).toBe(a.inputHash);
    expect(c.inputHash).not.toBe(a.inputHash);
  });

  it('answers CSV for ?format=csv and for Accept: text/csv: the harmonic table, or the series', async () => {
    const lib = forces(fly);
    if (!lib.ok) throw new Error('example invalid');
    const byQuery = await post('/api/v1/forces?format=csv', fly);
    const byAccept = await post('/api/v1/forces', fly, { accept: 'text/csv' });
    const series = await post('/api/v1/forces?format=csv&table=series', fly);
    for (const r of [byQuery, byAccept]) {
      expect(r.statusCode).toBe(200);
      expect(r.headers['content-type']).toBe('text/csv; charset=utf-8');
      expect(r.headers['x-input-hash']).toBe(expectedHash(fly));
      expect(r.body).toBe(harmonicsCsv(lib.answer));
    }
    expect(byQuery.body.split('\r\n')[0]).toBe('side,role,component,axis,order,amplitude_N,phase_rad');
    expect(series.body).toBe(seriesCsv(lib.answer));
    expect(series.body.split('\r\n')[0]).toMatch(/^side,role,time_s,stroke_rad,primary_x_N,/);
    // JSON wins when the Accept header names it first, and ?format=json overrides text/csv.
    expect((await post('/api/v1/forces', fly, { accept: 'application/json, text/csv' })).headers['content-type']).toBe('application/json; charset=utf-8');
    expect((await post('/api/v1/forces?format=json', fly, { accept: 'text/csv' })).headers['content-type']).toBe('application/json; charset=utf-8');
  });

  it('refuses an invalid scenario with 400, naming each field, value and expectation (the CLI messages)', async () => {
    const doc = { ...fly, organ: { ...(fly.organ as object), mass: '12 mV', amplitude: '80 Hz' } };
    const r = await post('/api/v1/forces', doc);
    expect(r.statusCode).toBe(400);
    expect(r.json()).toEqual({
      error: 'invalid_scenario',
      message: 'the scenario is invalid',
      issues: [
        { path: 'organ.mass', message: "'12 mV' is not a mass; expected a mass: a number in kg or a string such as '7 ug'" },
        { path: 'organ.amplitude', message: "'80 Hz' is not an angle; expected an angle: a number in rad or a string such as '80 deg'" },
      ],
      version: PKG_VERSION,
      inputHash: expectedHash(doc),
    });
    expect(() => ErrorSchema.parse(r.json())).not.toThrow();
  });

  it('refuses work over the samples limit with 413 naming the limit', async () => {
    const doc = { ...fly, sampling: { pointsPerBeat: 8192, beats: 16, harmonics: 8 } };
    const r = await post('/api/v1/forces', doc);
    expect(r.statusCode).toBe(413);
    expect(r.json()).toEqual({
      error: 'over_limit',
      message: 'the request asks for more work than one request may',
      issues: [{ path: 'sampling.beats', message: '8192 points × 16 beats = 131072 samples is over the limit of 65536 samples per request', limit: 'samplesPerRequest' }],
      version: PKG_VERSION,
      inputHash: expectedHash(doc),
      limit: 'samplesPerRequest',
    });
  });

  it('refuses series over the service limit before any work, and answers the lines alone', async () => {
    const doc = { ...fly, sampling: { pointsPerBeat: 4096, beats: 4, harmonics: 8 } };
    const r = await post('/api/v1/forces', doc);
    expect(r.statusCode).toBe(413);
    expect(r.json()).toEqual({
      error: 'over_limit',
      message: 'the request asks for more work than one request may',
      issues: [{ path: 'sampling.beats', message: "4096 points × 4 beats = 16384 samples of series is over the service's limit of 8192 samples per organ in one answer; set output.series to false for the lines alone", limit: 'seriesSamples' }],
      version: PKG_VERSION,
      inputHash: expectedHash(doc),
      limit: 'seriesSamples',
    });
    const lines = await post('/api/v1/forces', { ...doc, output: { series: false } });
    expect(lines.statusCode).toBe(200);
    expect((lines.json() as { organs: { series?: unknown }[] }).organs.every((o) => o.series === undefined)).toBe(true);
  });

  it('refuses a body nested deeper than the limit with 413 on every route, before hashing it', async () => {
    const deep = '['.repeat(500_000) + ']'.repeat(500_000); // 1 MB, under the body limit
    for (const [url, needs] of [['/api/v1/forces', 'a scenario document needs at most 7'], ['/api/v1/sensing?format=csv', 'a scenario document needs at most 7'], ['/api/v1/turn', 'a scenario document needs at most 7'], ['/api/v1/sweep', 'a sweep request needs at most 8']] as const) {
      const r = await post(url, deep);
      expect(r.statusCode, url).toBe(413);
      expect(r.json()).toEqual({
        error: 'over_limit',
        message: 'the request asks for more work than one request may',
        issues: [{ path: '[0][0][0][0][0][0][0][0]…', message: `is at nesting level 33, over the limit of 32 levels of arrays and objects; ${needs}`, limit: 'nesting' }],
        version: PKG_VERSION,
        limit: 'nesting',
      });
    }
    const inOrgan = { ...fly, organ: { ...(fly.organ as object), note: JSON.parse('{"a":'.repeat(40) + '1' + '}'.repeat(40)) as unknown } };
    const r = await post('/api/v1/sensing', inOrgan);
    expect(r.statusCode).toBe(413);
    expect(r.json()).toMatchObject({ issues: [{ path: 'organ.note.a.a.a.a.a.a…', limit: 'nesting' }] });
    // A route that takes no body answers as before.
    expect((await post('/api/v1/examples', deep)).statusCode).toBe(405);
  });

  it('refuses a body over the size limit with 413 in the same shape', async () => {
    const big = { ...fly, description: 'x'.repeat(2 * 1024 * 1024) };
    const r = await post('/api/v1/forces', big);
    expect(r.statusCode).toBe(413);
    expect(r.json()).toEqual({
      error: 'body_too_large',
      message: 'the request body is over the size limit',
      issues: [{ path: '(body)', message: 'is over the limit of 2097152 bytes', limit: 'bodyBytes' }],
      version: PKG_VERSION,
      limit: 'bodyBytes',
    });
  });

  it('refuses malformed JSON, an empty body, a poisoned prototype and a non-JSON body', async () => {
    const invalidJson = {
      error: 'invalid_json',
      message: 'the body is not valid JSON',
      issues: [{ path: '(document)', message: 'is not valid JSON, or carries a __proto__ or constructor.prototype key; expected a JSON document' }],
      version: PKG_VERSION,
    };
    const bad = await post('/api/v1/forces', '{"organ": ');
    expect(bad.statusCode).toBe(400);
    expect(bad.json()).toEqual(invalidJson);
    const empty = await post('/api/v1/forces', '');
    expect(empty.statusCode).toBe(400);
    expect(empty.json()).toEqual({ ...invalidJson, issues: [{ path: '(document)', message: 'is empty; expected a JSON document' }] });
    const proto = await post('/api/v1/forces', '{"organ": {}, "__proto__": {"x": 1}}');
    expect(proto.statusCode).toBe(400);
    expect(proto.json()).toEqual(invalidJson);
    const text = await app.inject({ method: 'POST', url: '/api/v1/forces', payload: 'organ', headers: { 'content-type': 'text/plain' } });
    expect(text.statusCode).toBe(415);
    expect(text.json()).toEqual({
      error: 'unsupported_media_type',
      message: 'the body must be JSON (Content-Type: application/json)',
      issues: [{ path: 'header.content-type', message: '"text/plain" is not accepted; expected application/json' }],
      version: PKG_VERSION,
    });
  });

  it('refuses a document that is not an object, and a missing body', async () => {
    const arr = await post('/api/v1/forces', [1, 2]);
    expect(arr.statusCode).toBe(400);
    expect(arr.json()).toEqual({
      error: 'invalid_scenario',
      message: 'the scenario is invalid',
      issues: [{ path: '(document)', message: '[1,2] is not a scenario; expected a JSON object with at least "organ"' }],
      version: PKG_VERSION,
      inputHash: expectedHash([1, 2]),
    });
    const none = await app.inject({ method: 'POST', url: '/api/v1/forces' });
    expect(none.statusCode).toBe(400);
    expect((none.json() as { issues: unknown }).issues).toEqual([{ path: '(document)', message: 'nothing is not a scenario; expected a JSON object with at least "organ"' }]);
  });

  it('refuses documents that once made the core throw (found by the fuzz test) with 400, not 500', async () => {
    const nullOrgan = await post('/api/v1/forces', { organ: null });
    expect(nullOrgan.statusCode).toBe(400);
    expect((nullOrgan.json() as { issues: unknown }).issues).toEqual([{ path: 'organ', message: 'null is not an organ; expected an object' }]);
    const measured = example('measured-stroke') as { organ: { waveform: { samples: { angle: number[] } } } };
    measured.organ.waveform.samples.angle[0] = 1e308;
    const wild = await post('/api/v1/forces', measured);
    expect(wild.statusCode).toBe(400);
    expect((wild.json() as { issues: unknown }).issues).toEqual([{ path: 'organ.waveform', message: "the stroke's harmonics add up to 2.22e+305 rad, more than a full turn; expected a stroke within ±π (give angles as strings in degrees, or check samples.angleUnit)" }]);
  });

  it('refuses an answer that would overflow double precision with 400 naming the input, instead of answering nulls', async () => {
    const sensingDoc = example('fly-sensing') as { body: Record<string, unknown> };
    const doc = { ...sensingDoc, body: { ...sensingDoc.body, rate: { yaw: '1e200 rad/s' } } };
    const r = await post('/api/v1/sensing?format=csv', doc);
    expect(r.statusCode).toBe(400);
    expect(r.json()).toEqual({
      error: 'invalid_scenario',
      message: 'the scenario is invalid',
      issues: [{
        path: 'body.rate.yaw',
        message: "'1e200 rad/s' is the input of most extreme magnitude, and the answer overflows double precision (organs[0].axes.roll.bias.centrifugal is NaN); expected magnitudes that a rate sensor can have; next in magnitude: organ.stalk.modulus = '5 GPa', organ.stalk.mass = '1 ug'",
      }],
      version: PKG_VERSION,
      inputHash: expectedHash(doc),
    });
  });

  it('refuses an unknown format or query parameter with 400 naming the parameter', async () => {
    const r = await post('/api/v1/forces?format=xml&colour=red', fly);
    expect(r.statusCode).toBe(400);
    expect(r.json()).toEqual({
      error: 'invalid_request',
      message: 'the request is invalid',
      issues: [
        { path: 'query.format', message: "'xml' is not a format; expected json or csv" },
        { path: 'query.colour', message: 'is not a parameter of this route' },
      ],
      version: PKG_VERSION,
    });
  });
});

describe('POST /api/v1/sensing', () => {
  it('answers the library answer stamped with version and hash, in the documented shape; CSV table', async () => {
    for (const name of ['fly-sensing', 'mems-sensing']) {
      const doc = example(name);
      const r = await post('/api/v1/sensing', doc);
      expect(r.statusCode).toBe(200);
      const lib = sensing(doc);
      if (!lib.ok) throw new Error(`${name} invalid`);
      expect(r.json()).toEqual(wire({ ...lib.answer, version: PKG_VERSION, inputHash: expectedHash(doc) }));
      expect(() => SensingAnswerSchema.parse(r.json())).not.toThrow();
      const csv = await post('/api/v1/sensing', doc, { accept: 'text/csv' });
      expect(csv.headers['content-type']).toBe('text/csv; charset=utf-8');
      expect(csv.body).toBe(sensingCsv(lib.answer));
      expect(csv.body.split('\r\n')[0]).toMatch(/^side,role,axis,channel_axis,order,frequency_Hz,/);
    }
  });

  it('documents every member of an answer: the strict answer schema accepts answers with line tables, series, a sense mode on a stalk, a single organ and a confused pair', () => {
    const fly = example('fly-sensing'), mems = example('mems-sensing');
    const flyOrgan = fly.organ as Record<string, unknown>;
    const tuned = { ...flyOrgan, senseMode: { frequency: '600 Hz', quality: 9, mass: '6 ug' } };
    const seen = new Set<string>();
    for (const doc of [
      { ...fly, output: { series: true, lines: true } },
      { ...mems, output: { series: true, lines: true } },
      { ...fly, organ: tuned, output: { series: false, lines: true } },
      { ...fly, organ: { ...tuned, mirror: false }, sensor: { integration: '20 ms' } },
    ]) {
      const r = sensing(doc);
      if (!r.ok) throw new Error(JSON.stringify(r.issues));
      const parsed = SensingAnswerSchema.safeParse(JSON.parse(JSON.stringify({ ...r.answer, inputHash: '0123456789abcdef' })));
      expect(parsed.error?.issues ?? []).toEqual([]);
      for (const o of r.answer.organs) {
        if (o.strain?.harmonics && o.strain.series) seen.add('strain lines and series');
        if (o.senseMode?.perUnitRate && o.senseMode.series) seen.add('sense-mode lines and series');
      }
      if (r.answer.pair.confusions.length > 0) seen.add('confusions');
      if (r.answer.organs.length === 1) seen.add('single organ');
    }
    expect([...seen].sort()).toEqual(['confusions', 'sense-mode lines and series', 'single organ', 'strain lines and series']);
  });

  it('reports the smallest detectable rate as threshold · σ / |K| (design §6) for each organ and axis', async () => {
    const body = (await post('/api/v1/sensing', example('fly-sensing'))).json() as { organs: { axes: Record<string, { scaleFactor: number; noise: { sigma: number } | null; minimumRate: number | null }> }[] };
    let checked = 0;
    for (const o of body.organs) {
      for (const a of Object.values(o.axes)) {
        if (!a.noise || a.minimumRate === null) continue;
        // fly-sensing sets sensor.threshold to 1.
        expect(a.minimumRate).toBeCloseTo(a.noise.sigma / Math.abs(a.scaleFactor), 12);
        checked++;
      }
    }
    expect(checked).toBeGreaterThanOrEqual(4);
  });

  it('refuses an invalid scenario with 400 naming the field', async () => {
    const doc = { ...example('fly-sensing'), sensor: { readoutNoise: '2e-9 m' } };
    const r = await post('/api/v1/sensing', doc);
    expect(r.statusCode).toBe(400);
    expect(r.json()).toEqual({
      error: 'invalid_scenario',
      message: 'the scenario is invalid',
      issues: [{ path: 'sensor.readoutNoise', message: "'2e-9 m' is not a force noise density or a strain noise density or a displacement noise density; expected a force noise density or a strain noise density or a displacement noise density: a number in N/Hz^0.5 or a string such as '2e-10 N / Hz^0.5'" }],
      version: PKG_VERSION,
      inputHash: expectedHash(doc),
    });
  });
});

describe('POST /api/v1/turn', () => {
  it('answers the library answer stamped with version and hash, in the documented shape; CSV beats and series', async () => {
    const doc = example('fly-saccade');
    const r = await post('/api/v1/turn', doc);
    expect(r.statusCode).toBe(200);
    const lib = turn(doc);
    if (!lib.ok) throw new Error('fly-saccade invalid');
    expect(r.json()).toEqual(wire({ ...lib.answer, version: PKG_VERSION, inputHash: expectedHash(doc) }));
    expect(() => TurnAnswerSchema.parse(r.json())).not.toThrow();
    const beats = await post('/api/v1/turn?format=csv', doc);
    expect(beats.body).toBe(beatsCsv(lib.answer));
    expect(beats.body.split('\r\n')[0]).toMatch(/^beat,time_s,true_roll_rad_s,/);
    expect(beats.body.split('\r\n').length - 2).toBe(lib.answer.beats.length);
    const series = await post('/api/v1/turn?format=csv&table=series', doc);
    expect(series.body).toBe(turnSeriesCsv(lib.answer));
  });

  it('refuses a maneuver over the samples limit with 413 naming the limit', async () => {
    const doc = { ...example('fly-saccade'), sampling: { pointsPerBeat: 8192, beats: 1, harmonics: 8 } };
    const r = await post('/api/v1/turn', doc);
    expect(r.statusCode).toBe(413);
    const body = r.json() as { error: string; limit: string; issues: { path: string; limit?: string }[] };
    expect(body.error).toBe('over_limit');
    expect(body.limit).toBe('samplesPerRequest');
    expect(body.issues.every((i) => i.path.length > 0)).toBe(true);
    expect(() => ErrorSchema.parse(body)).not.toThrow();
  });
});

describe('404 and 405', () => {
  it('answers an unknown route with 404 in the error shape', async () => {
    for (const [method, url] of [['GET', '/api/v1/nothing'], ['POST', '/api/v2/forces'], ['DELETE', '/anything']] as const) {
      const r = await app.inject({ method, url });
      expect(r.statusCode, url).toBe(404);
      expect(r.json()).toEqual({
        error: 'not_found',
        message: 'nothing here',
        issues: [{ path: 'url', message: `${JSON.stringify(url)} is not here; the API is under /api/v1/ (see /api/v1/openapi.json)` }],
        version: PKG_VERSION,
      });
    }
  });

  it('answers a known route with the wrong method with 405 and an Allow header', async () => {
    const r = await app.inject({ method: 'GET', url: '/api/v1/forces' });
    expect(r.statusCode).toBe(405);
    expect(r.headers.allow).toBe('POST');
    expect(r.json()).toEqual({
      error: 'method_not_allowed',
      message: 'the method is not allowed on this route',
      issues: [{ path: 'method', message: 'GET is not allowed on /api/v1/forces; expected POST' }],
      version: PKG_VERSION,
    });
    const d = await app.inject({ method: 'DELETE', url: '/api/v1/examples/fly-tilted-stroke' });
    expect(d.statusCode).toBe(405);
    expect(d.headers.allow).toBe('GET, HEAD');
    expect(d.json()).toEqual({
      error: 'method_not_allowed',
      message: 'the method is not allowed on this route',
      issues: [{ path: 'method', message: 'DELETE is not allowed on /api/v1/examples/fly-tilted-stroke; expected GET' }],
      version: PKG_VERSION,
    });
  });
});

describe('GET /api/v1/examples', () => {
  it('lists every shipped scenario with name, description and URL', async () => {
    const r = await app.inject({ method: 'GET', url: '/api/v1/examples' });
    expect(r.statusCode).toBe(200);
    const body = r.json() as { version: string; examples: { name: string; description: string; url: string }[] };
    expect(ExampleListSchema.parse(body)).toEqual(body);
    expect(body.version).toBe(PKG_VERSION);
    const names = body.examples.map((e) => e.name);
    for (const n of ['fly-tilted-stroke', 'measured-stroke', 'mems-tuning-fork']) expect(names).toContain(n);
    expect(body.examples.find((e) => e.name === 'fly-tilted-stroke')).toEqual({ name: 'fly-tilted-stroke', description: fly.description, url: '/api/v1/examples/fly-tilted-stroke' });
    expect([...names].sort()).toEqual(names);
  });

  it('serves each example document as it is in examples/, ready to post back', async () => {
    const list = (await app.inject({ method: 'GET', url: '/api/v1/examples' })).json() as { examples: { name: string; url: string }[] };
    for (const e of list.examples) {
      const r = await app.inject({ method: 'GET', url: e.url });
      expect(r.statusCode).toBe(200);
      expect(r.json()).toEqual(JSON.parse(exampleText(e.name)));
      expect(r.headers['x-input-hash']).toBe(expectedHash(r.json()));
    }
  });

  it('answers an unknown or malformed example name with 404/400 naming the parameter', async () => {
    const r = await app.inject({ method: 'GET', url: '/api/v1/examples/no-such-thing' });
    expect(r.statusCode).toBe(404);
    const body = r.json() as { issues: { path: string; message: string }[] };
    expect(body).toEqual({
      error: 'unknown_example',
      message: 'no example by that name',
      issues: [{ path: 'params.name', message: expect.stringMatching(/^'no-such-thing' is not a shipped example; expected one of .*fly-tilted-stroke/) }],
      version: PKG_VERSION,
    });
    const bad = await app.inject({ method: 'GET', url: '/api/v1/examples/%2e%2e%2fpackage' });
    expect(bad.statusCode).toBe(400);
    expect(bad.json()).toEqual({
      error: 'invalid_request',
      message: 'the request is invalid',
      issues: [{ path: 'params.name', message: "'../package' is not an example name; expected letters, digits, - and _" }],
      version: PKG_VERSION,
    });
  });

  it('refuses query parameters on routes that take none, as the others do; another format than JSON there is 406 (docs/service.md, Formats)', async () => {
    for (const url of ['/api/v1/examples?format=csv', '/api/v1/examples/fly-sensing?format=csv', '/api/v1/openapi.json?format=csv', '/health?format=csv']) {
      const r = await app.inject({ method: 'GET', url });
      expect(r.statusCode, url).toBe(406);
      expect(r.json()).toEqual({
        error: 'not_acceptable',
        message: 'the answer is not available in the format asked for',
        issues: [{ path: 'query.format', message: "'csv' is not available here; this route answers JSON only" }],
        version: PKG_VERSION,
      });
    }
    expect((await app.inject({ method: 'GET', url: '/api/v1/examples?format=json' })).statusCode).toBe(200);
    const typo = await app.inject({ method: 'GET', url: '/api/v1/examples?name=fly-sensing&x=1&format=csv' });
    expect(typo.statusCode).toBe(400);
    expect(typo.json()).toMatchObject({ error: 'invalid_request', issues: [{ path: 'query.name', message: 'is not a parameter of this route' }, { path: 'query.x', message: 'is not a parameter of this route' }, { path: 'query.format', message: "'csv' is not available here; this route answers JSON only" }] });
  });
});

describe('static page', () => {
  it('serves web/index.html at /', async () => {
    const r = await app.inject({ method: 'GET', url: '/' });
    expect(r.statusCode).toBe(200);
    expect(r.headers['content-type']).toBe('text/html; charset=utf-8');
    expect(r.body).toMatch(/<html/i);
  });

  it('answers path traversal attempts with 404', async () => {
    const attempts = ['/../package.json', '/%2e%2e/package.json', '/%2E%2E%2Fpackage.json', '/..%2fpackage.json', '/%2e%2e%2f%2e%2e%2fetc%2fpasswd', '/web/../package.json', '/....//package.json', '/%252e%252e/package.json', '/..\\package.json', '/.git/config', '/%00/package.json'];
    for (const url of attempts) {
      const r = await app.inject({ method: 'GET', url });
      expect(r.statusCode, url).toBe(404);
      expect((r.json() as { error: string }).error, url).toBe('not_found');
      expect(r.body, url).not.toMatch(/"name":\s*"beatforce"|root:/);
    }
  });
});

describe('CORS', () => {
  it('is off by default: no allow-origin header', async () => {
    const r = await app.inject({ method: 'GET', url: '/health', headers: { origin: 'http://127.0.0.1:8888' } });
    expect(r.headers['access-control-allow-origin']).toBeUndefined();
  });

  it('answers origins on the allow-list, preflight included, and refuses others', async () => {
    const c = buildApp({ corsOrigins: ['http://127.0.0.1:8888'], webRoot: null });
    try {
      const ok = await c.inject({ method: 'GET', url: '/health', headers: { origin: 'http://127.0.0.1:8888' } });
      expect(ok.headers['access-control-allow-origin']).toBe('http://127.0.0.1:8888');
      expect(ok.headers.vary).toBe('Origin');
      const other = await c.inject({ method: 'GET', url: '/health', headers: { origin: 'http://evil.example' } });
      expect(other.headers['access-control-allow-origin']).toBeUndefined();
      const pre = await c.inject({ method: 'OPTIONS', url: '/api/v1/forces', headers: { origin: 'http://127.0.0.1:8888', 'access-control-request-method': 'POST' } });
      expect(pre.statusCode).toBe(204);
      expect(pre.headers['access-control-allow-methods']).toBe('GET, POST, OPTIONS');
      expect(pre.headers['access-control-allow-headers']).toBe('content-type, accept, cache-control');
      const denied = await c.inject({ method: 'OPTIONS', url: '/api/v1/forces', headers: { origin: 'http://evil.example', 'access-control-request-method': 'POST' } });
      expect(denied.statusCode).toBe(403);
      expect(denied.json()).toEqual({
        error: 'cors_forbidden',
        message: 'the origin is not on the allow-list',
        issues: [{ path: 'header.origin', message: '"http://evil.example" is not on the allow-list' }],
        version: PKG_VERSION,
      });
    } finally {
      await c.close();
    }
  });

  it('refuses an allow-list entry that is not an origin', () => {
    expect(() => buildApp({ corsOrigins: ['127.0.0.1:8888'] })).toThrow(/is not an origin/);
  });
});
