/**
 * The service over real sockets on 127.0.0.1: a bounded load run (autocannon, a few seconds, every
 * route mixed) with no errors and no non-2xx answers, heap back near its baseline afterwards; raw
 * path-traversal requests (not normalised by any client) answered 404; a body over the limit 413.
 * Speed targets are checked in `npm run bench`, not here.
 */
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import autocannon from 'autocannon';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../server/app.js';
import { exampleText, PKG_VERSION, rawRequest } from './helpers.js';

setFlagsFromString('--expose-gc');
const gc = runInNewContext('gc') as () => void;

let app: FastifyInstance;
let port = 0;
beforeAll(async () => {
  app = buildApp();
  await app.listen({ host: '127.0.0.1', port: 0 });
  const a = app.server.address();
  port = typeof a === 'object' && a ? a.port : 0;
});
afterAll(async () => {
  await app.close();
});

const raw = (request: string) => rawRequest(port, request);

const heapAfterGc = (): number => {
  gc();
  gc();
  return process.memoryUsage().heapUsed;
};

describe('under load on 127.0.0.1', () => {
  it('answers a mixed load for 3 s with no errors and no failed requests, and its heap comes back', async () => {
    const json = { 'content-type': 'application/json' };
    const sweepBody = JSON.stringify({ scenario: JSON.parse(exampleText('fly-tilted-stroke')), vary: [{ field: 'body.rate.yaw', from: 0, to: 10, steps: 1000 }], outputs: [{ line: { component: 'coriolis', axis: 'normal', order: 2 } }] });
    const requests = [
      { method: 'GET' as const, path: '/health' },
      { method: 'POST' as const, path: '/api/v1/forces', headers: json, body: exampleText('mems-tuning-fork') },
      { method: 'POST' as const, path: '/api/v1/sensing', headers: json, body: exampleText('fly-sensing') },
      { method: 'POST' as const, path: '/api/v1/sweep', headers: json, body: sweepBody },
      { method: 'GET' as const, path: '/api/v1/examples' },
      { method: 'POST' as const, path: '/api/v1/forces?format=csv', headers: json, body: exampleText('fly-tilted-stroke') },
    ];
    const url = `http://127.0.0.1:${port}`;
    await autocannon({ url, connections: 4, amount: 200, requests }); // warm up
    const baseline = heapAfterGc();
    const r = await autocannon({ url, connections: 16, duration: 3, requests });
    expect(r.errors).toBe(0);
    expect(r.timeouts).toBe(0);
    expect(r.non2xx).toBe(0);
    expect(r['2xx']).toBe(r.requests.total);
    expect(r.requests.total).toBeGreaterThan(100);
    const after = heapAfterGc();
    // Back near the baseline: within 16 MB (the run itself moves hundreds of MB through the heap).
    expect(after - baseline).toBeLessThan(16 * 1024 * 1024);
    console.log(`load: ${r.requests.total} requests in 3 s (${Math.round(r.requests.average)} req/s mixed), p99 ${r.latency.p99} ms; heap ${(baseline / 2 ** 20).toFixed(1)} MB before, ${(after / 2 ** 20).toFixed(1)} MB after`);
  });

  it('answers raw path-traversal requests with 404 and never serves a file outside web/', async () => {
    const paths = ['/../package.json', '/../../etc/passwd', '/%2e%2e/package.json', '/%2e%2e%2fpackage.json', '/..%2fpackage.json', '/%2E%2E/%2E%2E/etc/passwd', '/web/../../package.json', '/..\\package.json', '/%5c..%5cpackage.json', '/.%2e/package.json', '//etc/passwd', '/%252e%252e/package.json', '/.git/HEAD', '/%00../package.json'];
    for (const p of paths) {
      const r = await raw(`GET ${p} HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\n\r\n`);
      expect(r.status, p).toBe(404);
      expect(r.body, p).not.toMatch(/"name":\s*"beatforce"|root:x:|ref: refs/);
      expect(JSON.parse(r.body), p).toMatchObject({ error: 'not_found', version: PKG_VERSION });
    }
  });

  it('answers a body over the limit with 413 in the error shape, before reading it all', async () => {
    const big = 'x'.repeat(3 * 1024 * 1024);
    const r = await raw(`POST /api/v1/forces HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: application/json\r\nContent-Length: ${big.length}\r\nConnection: close\r\n\r\n${big}`);
    expect(r.status).toBe(413);
    expect(JSON.parse(r.body)).toEqual({
      error: 'body_too_large',
      message: 'the request body is over the size limit',
      issues: [{ path: '(body)', message: 'is over the limit of 2097152 bytes', limit: 'bodyBytes' }],
      version: PKG_VERSION,
      limit: 'bodyBytes',
    });
  });
});
