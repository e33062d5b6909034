/**
 * The service for the browser tests: the real app (server/app.ts `buildApp`) listening on a free
 * loopback port, with the page built first.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { FastifyInstance } from 'fastify';

const root = join(import.meta.dirname, '..', '..');

export interface Running {
  url: string;
  close: () => Promise<void>;
}

export async function buildPage(): Promise<Record<string, number>> {
  const mod = (await import(join(root, 'scripts', 'build-web.mjs'))) as { buildWeb: (o: { quiet: boolean }) => Promise<Record<string, number>> };
  return mod.buildWeb({ quiet: true });
}

export async function startService(): Promise<Running> {
  const appPath = join(root, 'server', 'app.ts');
  let app: FastifyInstance;
  if (existsSync(appPath)) {
    const mod = (await import(appPath)) as { buildApp: (o?: Record<string, unknown>) => FastifyInstance | Promise<FastifyInstance> };
    app = await mod.buildApp({ logger: false });
  } else {
    app = await standIn();
  }
  const address = await app.listen({ host: '127.0.0.1', port: 0 });
  return { url: address, close: () => app.close() };
}

/** Until the service exists: the forces and examples routes over the core, the page statically. */
async function standIn(): Promise<FastifyInstance> {
  const { default: Fastify } = await import('fastify');
  const { default: fastifyStatic } = await import('@fastify/static');
  const { forces } = await import('../../src/forces.js');
  const { readdirSync, readFileSync } = await import('node:fs');
  const app = Fastify();
  await app.register(fastifyStatic, { root: join(root, 'web') });
  const dir = join(root, 'examples');
  const names = readdirSync(dir).filter((f) => f.endsWith('.json')).map((f) => f.slice(0, -5));
  app.get('/api/v1/examples', async () => ({ examples: names.map((n) => ({ name: n, description: '' })) }));
  app.get('/api/v1/examples/:name', async (req) => JSON.parse(readFileSync(join(dir, `${(req.params as { name: string }).name}.json`), 'utf8')));
  app.post('/api/v1/forces', async (req, reply) => {
    const r = forces(req.body);
    if (!r.ok) return reply.code(400).send({ error: 'invalid_scenario', issues: r.issues });
    return r.answer;
  });
  return app;
}
