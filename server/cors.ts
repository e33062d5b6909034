/**
 * CORS for browser notebooks on another origin: off unless an allow-list is configured
 * (`corsOrigins` option or BEATFORCE_CORS_ORIGINS, comma-separated exact origins such as
 * `http://127.0.0.1:8888`; `*` allows every origin and is meant for trusted networks only).
 * A dozen lines do what is needed (simple requests and preflight), so no package is added.
 */
import type { FastifyInstance } from 'fastify';
import { sendError } from './errors.js';

const ORIGIN = /^https?:\/\/[A-Za-z0-9.-]+(:\d{1,5})?$|^https?:\/\/\[[0-9A-Fa-f:.]+\](:\d{1,5})?$/;

/** Parse a comma-separated allow-list; throws on an entry that is not an origin. */
export function parseOrigins(text: string | undefined): string[] {
  if (!text || text.trim() === '') return [];
  const list = text.split(',').map((s) => s.trim()).filter((s) => s !== '');
  for (const o of list) if (o !== '*' && !ORIGIN.test(o)) throw new Error(`CORS origin '${o}' is not an origin; expected scheme://host[:port], e.g. http://127.0.0.1:8888, or *`);
  return list;
}

export function registerCors(app: FastifyInstance, origins: readonly string[]): void {
  if (origins.length === 0) return;
  parseOrigins(origins.join(','));
  const any = origins.includes('*');
  const allowed = new Set(origins);
  const ok = (origin: string | undefined): origin is string => origin !== undefined && (any || allowed.has(origin));
  app.addHook('onRequest', (request, reply, done) => {
    const origin = request.headers.origin;
    if (ok(origin)) {
      reply.header('access-control-allow-origin', any ? '*' : origin);
      if (!any) reply.header('vary', 'Origin');
      reply.header('access-control-expose-headers', 'x-input-hash, x-beatforce-version, x-answer-cache');
    }
    done();
  });
  app.options('/*', (request, reply) => {
    const origin = request.headers.origin;
    if (!ok(origin)) {
      sendError(reply, 'cors_forbidden', [{ path: 'header.origin', message: `${JSON.stringify(origin ?? '')} is not on the allow-list` }]);
      return;
    }
    reply
      .code(204)
      .header('access-control-allow-methods', 'GET, POST, OPTIONS')
      .header('access-control-allow-headers', 'content-type, accept, cache-control')
      .header('access-control-max-age', '600')
      .send();
  });
}
