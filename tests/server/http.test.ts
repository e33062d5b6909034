/**
 * What Node's HTTP parser refuses before fastify sees a request (malformed HTTP, headers over the
 * size limit) is answered in the catalogue's shape too, over a real socket.
 */
import type { AddressInfo } from 'node:net';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../server/app.js';
import { PKG_VERSION, rawRequest } from './helpers.js';

let app: FastifyInstance;
let port = 0;
beforeAll(async () => {
  app = buildApp();
  await app.listen({ host: '127.0.0.1', port: 0 });
  port = (app.server.address() as AddressInfo).port;
});
afterAll(async () => {
  await app.close();
});

const raw = (bytes: string) => rawRequest(port, bytes);

describe('refusals of the HTTP parser', () => {
  it('answers headers over the size limit with 431 in the error shape', async () => {
    const r = await raw(`GET /health HTTP/1.1\r\nHost: x\r\nX-Big: ${'a'.repeat(20_000)}\r\n\r\n`);
    expect(r.status).toBe(431);
    expect(r.headers).toMatch(/content-type: application\/json; charset=utf-8/i);
    expect(JSON.parse(r.body)).toEqual({
      error: 'headers_too_large',
      message: 'the request headers are over the size limit',
      issues: [{ path: '(headers)', message: 'are over the limit of 16384 bytes', limit: 'headerBytes' }],
      version: PKG_VERSION,
      limit: 'headerBytes',
    });
  });

  it('answers a request that is not HTTP with 400 in the error shape', async () => {
    const r = await raw('GARBAGE\r\n\r\n');
    expect(r.status).toBe(400);
    expect(JSON.parse(r.body)).toEqual({
      error: 'invalid_http',
      message: 'the request is not valid HTTP',
      issues: [{ path: '(request)', message: expect.stringMatching(/^is not valid HTTP\/1\.1 \(HPE_[A-Z_]+\)$/) as unknown as string }],
      version: PKG_VERSION,
    });
  });

  it('still answers well-formed requests on other connections', async () => {
    const r = await raw('GET /health HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n');
    expect(r.status).toBe(200);
    expect(JSON.parse(r.body)).toEqual({ status: 'ok', version: PKG_VERSION });
  });
});
