/** Shared helpers for the service tests. */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { connect } from 'node:net';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll } from 'vitest';
import { buildApp } from '../../server/app.js';

export const ROOT = new URL('../../', import.meta.url);

export const exampleText = (name: string): string => readFileSync(new URL(`examples/${name}.json`, ROOT), 'utf8');
export const example = (name: string): Record<string, unknown> => JSON.parse(exampleText(name)) as Record<string, unknown>;

export const PKG_VERSION = (JSON.parse(readFileSync(new URL('package.json', ROOT), 'utf8')) as { version: string }).version;

/**
 * An independent implementation of the documented hash: SHA-256 over JSON with object keys sorted
 * (JSON.stringify with a sorting replacer), first 16 hex digits.
 */
export function expectedHash(doc: unknown): string {
  const sorted = JSON.stringify(doc, (_k, v: unknown) =>
    v !== null && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))) : v,
  );
  return createHash('sha256').update(sorted).digest('hex').slice(0, 16);
}

/** JSON as it travels: what a client sees after serialisation. */
export const wire = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

export const JSON_HEADERS = { 'content-type': 'application/json' };

/**
 * The service (no page) built before the tests of the enclosing file or block and closed after
 * them; call the returned function inside a test to get it.
 */
export function useApp(): () => FastifyInstance {
  let app: FastifyInstance | undefined;
  beforeAll(async () => {
    app = buildApp({ webRoot: null });
    await app.ready();
  });
  afterAll(async () => {
    await app?.close();
  });
  return () => {
    if (!app) throw new Error('the app is built in beforeAll; use it inside a test');
    return app;
  };
}

/**
 * Send raw bytes to a server on 127.0.0.1:port and read everything it writes until it closes the
 * connection: the status, the header block and the body (for what app.inject cannot reach: the
 * HTTP parser, the socket).
 */
export function rawRequest(port: number, bytes: string): Promise<{ status: number; headers: string; body: string }> {
  return new Promise((resolve, reject) => {
    const socket = connect(port, '127.0.0.1');
    let data = '';
    socket.on('data', (d: Buffer) => (data += d.toString()));
    // A server that refuses early may reset the connection while the rest is still being written.
    socket.on('error', (e) => (data ? undefined : reject(e)));
    socket.on('close', () => {
      const [head = '', ...rest] = data.split('\r\n\r\n');
      resolve({ status: Number(/^HTTP\/1\.1 (\d{3})/.exec(head)?.[1] ?? 0), headers: head, body: rest.join('\r\n\r\n') });
    });
    socket.write(bytes);
  });
}
