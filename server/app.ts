/**
 * `buildApp(options)`: the HTTP service (design §9) as a fastify instance, without `listen`.
 * Routes are plugins under /api/v1 (and /health); the page is served from web/.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import fastifyStatic from '@fastify/static';
import Fastify, { type FastifyError, type FastifyInstance, type FastifyServerOptions } from 'fastify';
import { VERSION } from '../src/version.js';
import { nestingIssues } from '../src/scenario.js';
import { AnswerCache, type AnswerCacheOptions } from './answers.js';
import { registerCors } from './cors.js';
import { SERVICE_LIMITS } from './limits.js';
import { answerClientError, frameworkError, sendError } from './errors.js';
import { openApiDocument, type RouteGroup } from './openapi.js';
import { routesPlugin, type AnyRoute } from './route.js';
import { exampleRoutes, loadExamples } from './routes/examples.js';
import { forcesRoute } from './routes/forces.js';
import { healthRoute } from './routes/health.js';
import { openApiRoute } from './routes/openapi.js';
import { sensingRoute } from './routes/sensing.js';
import { sweepRoute } from './routes/sweep.js';
import { turnRoute } from './routes/turn.js';
import { sensing } from '../src/sensing/index.js';
import { ScenarioDocumentSchema } from '../src/sweep.js';

export const API_PREFIX = '/api/v1';
export { SERVICE_LIMITS };

export interface AppOptions {
  /** fastify's logger (off by default). */
  logger?: FastifyServerOptions['logger'];
  /** Origins allowed to call the API from a browser (CORS); empty or absent: CORS off. */
  corsOrigins?: readonly string[];
  bodyLimit?: number;
  sweepTimeMs?: number;
  /** The static page's folder (default: web/ of the package); null serves no page. */
  webRoot?: string | null;
  /** The shipped scenarios (default: examples/ of the package). */
  examplesDir?: string;
  /**
   * The answer store of the compute routes (server/answers.ts): its sizes (defaults in
   * SERVICE_LIMITS), or false for none.
   */
  answerCache?: Partial<AnswerCacheOptions> | false;
}

/** The package root: the nearest folder above this module with beatforce's package.json. */
export function packageRoot(from = dirname(fileURLToPath(import.meta.url))): string {
  let dir = from;
  for (;;) {
    const pkg = join(dir, 'package.json');
    if (existsSync(pkg)) {
      try {
        if ((JSON.parse(readFileSync(pkg, 'utf8')) as { name?: string }).name === 'beatforce') return dir;
      } catch {
        // not ours; keep looking
      }
    }
    const up = dirname(dir);
    if (up === dir) return resolve(from, '..');
    dir = up;
  }
}

/** The API's route groups (also the source of the OpenAPI document). */
export function apiRoutes(options: AppOptions = {}): RouteGroup[] {
  const root = packageRoot();
  const examples = loadExamples(options.examplesDir ?? join(root, 'examples'));
  const api: AnyRoute[] = [forcesRoute, sensingRoute, turnRoute, sweepRoute({ sensing, budgetMs: options.sweepTimeMs ?? SERVICE_LIMITS.sweepTimeMs }), ...exampleRoutes(examples)];
  const groups: RouteGroup[] = [
    { prefix: '', routes: [healthRoute] },
    { prefix: API_PREFIX, routes: api },
  ];
  let doc: Record<string, unknown> | undefined;
  api.push(openApiRoute(() => (doc ??= openApiDocument(groups, { refs: new Map([[ScenarioDocumentSchema, 'Scenario']]) }))));
  return groups;
}

const patternOf = (url: string): RegExp => new RegExp(`^${url.replace(/[.*+?^${}()|[\]\\]/g, '\\$&').replace(/:[A-Za-z_]\w*/g, '[^/]+')}$`);

export function buildApp(options: AppOptions = {}): FastifyInstance {
  const bodyLimit = options.bodyLimit ?? SERVICE_LIMITS.bodyBytes;
  const app = Fastify({
    logger: options.logger ?? false,
    bodyLimit,
    requestTimeout: SERVICE_LIMITS.requestTimeoutMs,
    return503OnClosing: true,
    forceCloseConnections: 'idle',
    routerOptions: { maxParamLength: 200 },
    clientErrorHandler: (err, socket) => answerClientError(err, socket, SERVICE_LIMITS.requestTimeoutMs),
  });

  // JSON only: a text/plain body is what a cross-origin page may send without a CORS preflight.
  app.removeContentTypeParser('text/plain');
  // fastify's own JSON parser (prototype poisoning refused), with the body's text kept beside the
  // parsed document: the answer store is keyed by it.
  const parseJson = app.getDefaultJsonParser('error', 'error');
  app.removeContentTypeParser('application/json');
  app.decorateRequest('jsonText', null);
  app.decorateRequest('answerKey', null);
  app.addContentTypeParser('application/json', { parseAs: 'string' }, (request, text, done) => {
    request.jsonText = text as string;
    parseJson(request, text as string, done);
  });
  const cache =
    options.answerCache === false
      ? undefined
      : new AnswerCache({ maxBytes: options.answerCache?.maxBytes ?? SERVICE_LIMITS.answerCacheBytes, maxEntryBytes: options.answerCache?.maxEntryBytes ?? SERVICE_LIMITS.answerCacheEntryBytes });
  app.decorate('answerCache', cache ?? null);

  app.addHook('onRequest', (_request, reply, done) => {
    reply.header('x-beatforce-version', VERSION).header('x-content-type-options', 'nosniff');
    done();
  });
  registerCors(app, options.corsOrigins ?? []);

  // Before a route walks a body (the input hash, the parsers), a document nested deeper than
  // LIMITS.nesting is refused in the core's own words, so that no body can exhaust the stack.
  const sweepUrl = `${API_PREFIX}/sweep`;
  app.addHook('preHandler', (request, reply, done) => {
    const body = request.body;
    if (!request.is404 && body !== null && typeof body === 'object') {
      const issues = nestingIssues(body, request.url.startsWith(sweepUrl) ? 'sweep' : 'scenario');
      if (issues.length > 0) {
        sendError(reply, 'over_limit', issues);
        return;
      }
    }
    done();
  });

  app.setErrorHandler((error, request, reply) => {
    const { code, issues } = frameworkError(error as FastifyError, request, bodyLimit);
    if (code === 'internal') request.log.error({ err: error }, 'internal error');
    sendError(reply, code, issues);
  });

  const groups = apiRoutes(options);
  const known = groups.flatMap((g) => g.routes.map((r) => ({ method: r.method, pattern: patternOf(`${g.prefix}${r.url}`) })));
  app.setNotFoundHandler((request, reply) => {
    const path = request.url.split('?')[0] ?? '';
    const allow = known.filter((k) => k.pattern.test(path)).map((k) => k.method);
    if (allow.length > 0) {
      reply.header('allow', [...new Set([...allow, ...(allow.includes('GET') ? ['HEAD'] : [])])].join(', '));
      sendError(reply, 'method_not_allowed', [{ path: 'method', message: `${request.method} is not allowed on ${path}; expected ${allow.join(' or ')}` }]);
      return;
    }
    sendError(reply, 'not_found', [{ path: 'url', message: `${JSON.stringify(path.slice(0, 200))} is not here; the API is under ${API_PREFIX}/ (see ${API_PREFIX}/openapi.json)` }]);
  });

  for (const g of groups) app.register(routesPlugin(g.routes, cache), { prefix: g.prefix });

  const webRoot = options.webRoot === undefined ? join(packageRoot(), 'web') : options.webRoot;
  if (webRoot !== null && existsSync(webRoot)) {
    app.register(fastifyStatic, {
      root: resolve(webRoot),
      prefix: '/',
      index: ['index.html'],
      dotfiles: 'ignore',
      // Belt and braces: the file server already refuses to leave its root.
      allowedPath: (pathname) => !pathname.split(/[\\/]/).includes('..') && !pathname.includes('\0'),
      setHeaders: (res) => res.header('x-content-type-options', 'nosniff'),
    });
  }
  return app;
}
