/**
 * The answer store (server/answers.ts): a repeated request gets the very bytes a computation gives
 * (checked against a service without a store), keyed by route, query, format and body text;
 * refusals are not kept; Cache-Control no-cache / no-store are honoured; the store is bounded.
 */
import type { FastifyInstance, LightMyRequestResponse } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AnswerCache, answerKey, cacheDirectives } from '../../server/answers.js';
import { buildApp } from '../../server/app.js';
import { example, exampleText, expectedHash, JSON_HEADERS } from './helpers.js';

const post = (app: FastifyInstance, url: string, payload: string, headers: Record<string, string> = {}): Promise<LightMyRequestResponse> =>
  app.inject({ method: 'POST', url, payload, headers: { ...JSON_HEADERS, ...headers } });

describe('AnswerCache', () => {
  const answer = (n: number, fill = 'x') => ({ body: fill.repeat(n), contentType: 'text/csv', inputHash: '0123456789abcdef' });

  it('keeps answers up to its byte bound, least recently used out first', () => {
    // Each entry: answer bytes + key length + 256.
    const cache = new AnswerCache({ maxBytes: 3 * (1000 + 1 + 256), maxEntryBytes: 10_000 });
    expect(cache.set('a', answer(1000))).toBe(true);
    expect(cache.set('b', answer(1000))).toBe(true);
    expect(cache.set('c', answer(1000))).toBe(true);
    expect(cache.bytes).toBe(3 * 1257);
    expect(cache.get('a')?.body).toBe('x'.repeat(1000)); // a is now the most recent
    expect(cache.set('d', answer(1000))).toBe(true); // evicts b, the least recently used
    expect(cache.get('b')).toBeUndefined();
    expect(cache.get('c')).toBeDefined();
    expect(cache.get('a')).toBeDefined();
    expect(cache.get('d')).toBeDefined();
    expect(cache.size).toBe(3);
    expect(cache.bytes).toBe(3 * 1257);
    expect(cache.hits).toBe(4);
    expect(cache.misses).toBe(1);
  });

  it('counts a replaced entry once, refuses an answer over maxEntryBytes, and keeps a copy of a Buffer', () => {
    const cache = new AnswerCache({ maxBytes: 100_000, maxEntryBytes: 2_000 });
    cache.set('k', answer(1500));
    cache.set('k', answer(500, 'y'));
    expect(cache.size).toBe(1);
    expect(cache.bytes).toBe(500 + 1 + 256);
    expect(cache.set('big', answer(2001))).toBe(false);
    expect(cache.get('big')).toBeUndefined();
    // Multi-byte text is charged by its UTF-8 length.
    cache.clear();
    cache.set('u', answer(100, '√'));
    expect(cache.bytes).toBe(300 + 1 + 256);

    const bytes = Buffer.from('{"a":1}');
    cache.set('buf', { body: bytes, contentType: 'application/json', inputHash: 'h' });
    bytes[5] = 0x32; // the sender's buffer is reused after the answer went out
    expect(String(cache.get('buf')?.body)).toBe('{"a":1}');
  });

  it('reads no-cache and no-store among other Cache-Control directives, in any case', () => {
    expect(cacheDirectives(undefined)).toEqual({ fresh: false, keep: true });
    expect(cacheDirectives('max-age=0')).toEqual({ fresh: false, keep: true });
    expect(cacheDirectives('no-cache')).toEqual({ fresh: true, keep: true });
    expect(cacheDirectives('max-age=0, No-Cache')).toEqual({ fresh: true, keep: true });
    expect(cacheDirectives('NO-STORE')).toEqual({ fresh: true, keep: false });
    expect(cacheDirectives(['private', 'no-store'])).toEqual({ fresh: true, keep: false });
    expect(cacheDirectives('no-cache-please')).toEqual({ fresh: false, keep: true });
    expect(cacheDirectives('x-no-store')).toEqual({ fresh: false, keep: true });
  });
});

describe('the service with its answer store', () => {
  let app: FastifyInstance;
  let plain: FastifyInstance;
  beforeAll(async () => {
    app = buildApp({ webRoot: null });
    plain = buildApp({ webRoot: null, answerCache: false });
    await Promise.all([app.ready(), plain.ready()]);
  });
  afterAll(async () => {
    await Promise.all([app.close(), plain.close()]);
  });

  const sweepText = JSON.stringify({
    scenario: example('fly-tilted-stroke'),
    vary: [{ field: 'body.rate.yaw', from: '-200 deg/s', to: '200 deg/s', steps: 41 }],
    outputs: [{ line: { component: 'coriolis', axis: 'normal', order: 2 } }],
  });
  const cases: [string, string, string][] = [
    ['/api/v1/sensing', exampleText('fly-sensing'), 'application/json; charset=utf-8'],
    ['/api/v1/sensing?format=csv', exampleText('mems-sensing'), 'text/csv; charset=utf-8'],
    ['/api/v1/forces', exampleText('fly-tilted-stroke'), 'application/json; charset=utf-8'],
    ['/api/v1/forces?format=csv&table=series', exampleText('mems-tuning-fork'), 'text/csv; charset=utf-8'],
    ['/api/v1/turn', exampleText('fly-saccade'), 'application/json; charset=utf-8'],
    ['/api/v1/sweep?format=csv', sweepText, 'text/csv; charset=utf-8'],
  ];

  it.each(cases)('POST %s a second time: the same bytes and headers as computed, marked hit', async (url, text, type) => {
    const computed = await post(plain, url, text);
    expect(computed.statusCode).toBe(200);
    expect(computed.headers['x-answer-cache']).toBeUndefined();
    const first = await post(app, url, text, { 'cache-control': 'no-cache' });
    const second = await post(app, url, text);
    expect(first.headers['x-answer-cache']).toBe('miss');
    expect(second.headers['x-answer-cache']).toBe('hit');
    for (const r of [first, second]) {
      expect(r.statusCode).toBe(200);
      expect(r.headers['content-type']).toBe(type);
      expect(r.headers['x-input-hash']).toBe(expectedHash(JSON.parse(text)));
      expect(r.headers['x-beatforce-version']).toBe(computed.headers['x-beatforce-version']);
      expect(r.rawPayload.equals(computed.rawPayload)).toBe(true);
    }
  });

  it('keys by format: the JSON and the CSV of one document are kept apart', async () => {
    const text = exampleText('mems-sensing');
    const json = await post(app, '/api/v1/sensing', text, { 'cache-control': 'no-cache' });
    const csv = await post(app, '/api/v1/sensing', text, { accept: 'text/csv' });
    const csvAgain = await post(app, '/api/v1/sensing', text, { accept: 'text/csv' });
    const jsonAgain = await post(app, '/api/v1/sensing', text, { accept: 'application/json' });
    expect(csv.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(csvAgain.headers['x-answer-cache']).toBe('hit');
    expect(csvAgain.body).toBe(csv.body);
    expect(csv.body).toBe((await post(plain, '/api/v1/sensing?format=csv', text)).body);
    expect(jsonAgain.headers['x-answer-cache']).toBe('hit');
    expect(jsonAgain.headers['content-type']).toBe('application/json; charset=utf-8');
    expect(jsonAgain.body).toBe(json.body);
  });

  it('keys by the body text: the same document laid out differently is computed again, to the same answer and hash', async () => {
    const doc = example('fly-tilted-stroke');
    const a = await post(app, '/api/v1/forces', JSON.stringify(doc), { 'cache-control': 'no-cache' });
    const b = await post(app, '/api/v1/forces', JSON.stringify(doc, null, 2));
    expect(b.headers['x-answer-cache']).toBe('miss');
    expect(b.headers['x-input-hash']).toBe(a.headers['x-input-hash']);
    expect(b.body).toBe(a.body);
  });

  it('answers Cache-Control: no-store afresh and does not keep it', async () => {
    const doc = { ...example('fly-sensing'), name: 'kept nowhere' };
    const text = JSON.stringify(doc);
    const a = await post(app, '/api/v1/sensing', text, { 'cache-control': 'no-store' });
    const b = await post(app, '/api/v1/sensing', text);
    const c = await post(app, '/api/v1/sensing', text);
    expect([a.headers['x-answer-cache'], b.headers['x-answer-cache'], c.headers['x-answer-cache']]).toEqual(['miss', 'miss', 'hit']);
    expect(c.body).toBe(a.body);
  });

  it('never keeps a refusal', async () => {
    const bad = JSON.stringify({ ...example('fly-sensing'), organ: { mass: 'heavy' } });
    for (let i = 0; i < 2; i++) {
      const r = await post(app, '/api/v1/sensing', bad);
      expect(r.statusCode).toBe(400);
      expect(r.headers['x-answer-cache']).toBe('miss');
      expect((r.json() as { error: string }).error).toBe('invalid_scenario');
    }
  });

  it('still refuses a body that would poison a prototype, and still answers an empty body with 400', async () => {
    const poisoned = await post(app, '/api/v1/sensing', '{"__proto__": {"organ": 1}}');
    expect(poisoned.statusCode).toBe(400);
    expect((poisoned.json() as { error: string }).error).toBe('invalid_json');
    const empty = await post(app, '/api/v1/sensing', '');
    expect(empty.statusCode).toBe(400);
    expect((empty.json() as { error: string }).error).toBe('invalid_json');
  });

  it('keys a long request by a digest of its text: equal lengths that differ only past 16,000 characters are told apart', async () => {
    // A measured trace after 17,000 spaces (JSON allows them), twice, differing in the last digit
    // of the description only (same length).
    const doc = example('measured-stroke');
    const long = (tag: string) => ' '.repeat(17_000) + JSON.stringify({ ...doc, description: `${String(doc.description)} ${tag}` });
    const a = long('1'), b = long('2');
    expect(a.length).toBeGreaterThan(16_000);
    expect(b.length).toBe(a.length);
    expect(answerKey('json', '/api/v1/forces', a)).toMatch(/^#[A-Za-z0-9+/]{43}=$/);
    expect(answerKey('json', '/api/v1/forces', a)).not.toBe(answerKey('json', '/api/v1/forces', b));
    expect(answerKey('csv', '/api/v1/forces', a)).not.toBe(answerKey('json', '/api/v1/forces', a));
    expect(answerKey('json', '/api/v1/forces', '{}')).toBe('json /api/v1/forces\n{}');
    const ra = await post(app, '/api/v1/forces', a);
    const rb = await post(app, '/api/v1/forces', b);
    const ra2 = await post(app, '/api/v1/forces', a);
    expect([ra, rb, ra2].map((r) => r.statusCode)).toEqual([200, 200, 200]);
    expect([ra.headers['x-answer-cache'], rb.headers['x-answer-cache'], ra2.headers['x-answer-cache']]).toEqual(['miss', 'miss', 'hit']);
    expect(ra2.body).toBe(ra.body);
    expect(ra2.headers['x-input-hash']).toBe(expectedHash(JSON.parse(a)));
    expect(rb.headers['x-input-hash']).toBe(expectedHash(JSON.parse(b)));
    expect(rb.headers['x-input-hash']).not.toBe(ra.headers['x-input-hash']);
  });

  it('marks only the compute routes', async () => {
    const health = await app.inject({ method: 'GET', url: '/health' });
    const ex = await app.inject({ method: 'GET', url: '/api/v1/examples/fly-sensing' });
    expect(health.statusCode).toBe(200);
    expect(ex.statusCode).toBe(200);
    expect(health.headers['x-answer-cache']).toBeUndefined();
    expect(ex.headers['x-answer-cache']).toBeUndefined();
  });
});

describe('a small answer store', () => {
  it('keeps no answer over its entry bound and drops the oldest when full', async () => {
    const text = (rate: number) => JSON.stringify({ ...example('fly-sensing'), body: { rate: { yaw: `${rate} deg/s` } } });
    const plain = buildApp({ webRoot: null, answerCache: false });
    const probes = await Promise.all([1, 2, 3, 5].map((rate) => post(plain, '/api/v1/sensing', text(rate))));
    await plain.close();
    expect(probes.map((p) => p.statusCode)).toEqual([200, 200, 200, 200]);
    const size = Math.max(...probes.map((p) => p.rawPayload.length));
    const least = Math.min(...probes.map((p) => p.rawPayload.length));

    // Room for two answers of this size (and their keys), not three.
    const app = buildApp({ webRoot: null, answerCache: { maxBytes: 2 * (size + text(1).length + 300) + 100, maxEntryBytes: size + 10 } });
    try {
      const marks: string[] = [];
      for (const rate of [1, 2, 1, 3, 2, 1]) marks.push(String((await post(app, '/api/v1/sensing', text(rate))).headers['x-answer-cache']));
      // 1 miss, 2 miss, 1 hit, 3 miss (drops 2), 2 miss (drops 1), 1 miss.
      expect(marks).toEqual(['miss', 'miss', 'hit', 'miss', 'miss', 'miss']);
      expect(app.answerCache?.size).toBe(2);

      const tiny = buildApp({ webRoot: null, answerCache: { maxEntryBytes: least - 1 } });
      const again = [await post(tiny, '/api/v1/sensing', text(5)), await post(tiny, '/api/v1/sensing', text(5))];
      expect(again.map((r) => r.headers['x-answer-cache'])).toEqual(['miss', 'miss']);
      expect(tiny.answerCache?.size).toBe(0);
      await tiny.close();
    } finally {
      await app.close();
    }
  });
});
