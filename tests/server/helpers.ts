/** Shared helpers for the service tests. */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
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
