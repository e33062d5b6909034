/**
 * A route as data: its method, URL, zod schemas (query, params, body, answers) and handler. The
 * same spec registers the route and writes its part of the OpenAPI document, so the schema that
 * validates is the schema that is documented.
 *
 * Request bodies are validated by the core (`parseScenario` and its kin, on the very zod schemas
 * named in `body`), once per request, so that the service reports the same issues as the command
 * line. Query strings and path parameters are validated here, on `query` and `params`.
 */
import type { FastifyInstance, FastifyPluginAsync, FastifyReply, FastifyRequest } from 'fastify';
import { z } from 'zod';
import { answerFromStore, keepAnswer, type AnswerCache } from './answers.js';
import { sendError, type ErrorCode, type ServiceIssue } from './errors.js';
import { chooseFormat, type Format } from './format.js';

export interface ResponseSpec {
  description: string;
  /** JSON answer schema (zod, output side), or a component name defined in the OpenAPI document. */
  schema?: z.ZodType;
  ref?: string;
  /** The answer is also available as text/csv. */
  csv?: boolean;
}

export interface RouteContext<Q, P> {
  query: Q;
  params: P;
}

export interface RouteSpec<Q = Record<string, never>, P = Record<string, never>> {
  method: 'GET' | 'POST';
  /** URL under the plugin's prefix, with `:name` parameters. */
  url: string;
  operationId: string;
  summary: string;
  description?: string;
  tags?: string[];
  /** The request body's schema; `bodyRef` names it as an OpenAPI component. */
  body?: { schema: z.ZodType; ref: string; description: string };
  query?: z.ZodType<Q>;
  params?: z.ZodType<P>;
  responses: Record<number, ResponseSpec>;
  /**
   * The answer is a pure function of the URL, the format asked for and the body (the compute
   * routes): repeated requests are answered from the answer store (server/answers.ts).
   */
  keepsAnswers?: boolean;
  handler: (request: FastifyRequest, reply: FastifyReply, ctx: RouteContext<Q, P>) => void;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type AnyRoute = RouteSpec<any, any>;

export const defineRoute = <Q = Record<string, never>, P = Record<string, never>>(spec: RouteSpec<Q, P>): RouteSpec<Q, P> => spec;

const show = (v: unknown): string => (typeof v === 'string' ? `'${v.slice(0, 60)}'` : String(v));

/** Issues for a query string or path parameters, named `query.x` / `params.x`. */
export function inputIssues(where: 'query' | 'params', error: z.ZodError, input: unknown): ServiceIssue[] {
  const out: ServiceIssue[] = [];
  for (const iss of error.issues) {
    if (iss.code === 'unrecognized_keys') {
      for (const k of iss.keys) out.push({ path: `${where}.${k}`, message: `is not a parameter of this route` });
      continue;
    }
    const key = iss.path.map(String).join('.');
    const value = (input as Record<string, unknown> | undefined)?.[key];
    out.push({ path: `${where}.${key}`, message: `${show(value)} ${iss.message}` });
  }
  return out;
}

const EMPTY = Object.freeze({});

function parseOr<T>(schema: z.ZodType<T> | undefined, where: 'query' | 'params', input: unknown): { ok: true; value: T } | { ok: false; code?: ErrorCode; issues: ServiceIssue[] } {
  if (!schema) {
    // A route without parameters refuses any, as the others refuse unknown ones; `format` is known
    // everywhere, and a JSON-only answer asked for in another format is 406 rather than ignored.
    const q = (input !== null && typeof input === 'object' ? input : {}) as Record<string, unknown>;
    const keys = Object.keys(q).filter((k) => !(k === 'format' && q[k] === 'json'));
    if (keys.length === 0) return { ok: true, value: EMPTY as T };
    const issues = keys.map((k) => ({ path: `${where}.${k}`, message: k === 'format' ? `${show(String(q.format))} is not available here; this route answers JSON only` : 'is not a parameter of this route' }));
    return { ok: false, ...(keys.length === 1 && keys[0] === 'format' ? { code: 'not_acceptable' as const } : {}), issues };
  }
  const r = schema.safeParse(input ?? {});
  return r.success ? { ok: true, value: r.data } : { ok: false, issues: inputIssues(where, r.error, input) };
}

/** Register routes as a fastify plugin; `cache`, when given, keeps the answers of routes that allow it. */
export function routesPlugin(routes: readonly AnyRoute[], cache?: AnswerCache): FastifyPluginAsync {
  return async (app: FastifyInstance) => {
    for (const spec of routes) {
      const store = spec.keepsAnswers === true ? cache : undefined;
      app.route({
        method: spec.method,
        url: spec.url,
        ...(store ? { onSend: keepAnswer(store) } : {}),
        handler(request, reply) {
          const q = parseOr(spec.query, 'query', request.query);
          if (!q.ok) {
            sendError(reply, q.code ?? 'invalid_request', q.issues);
            return;
          }
          const p = parseOr(spec.params, 'params', request.params);
          if (!p.ok) {
            sendError(reply, 'invalid_request', p.issues);
            return;
          }
          if (store && answerFromStore(store, request, reply, chooseFormat(q.value as { format?: Format }, request.headers.accept))) return;
          spec.handler(request, reply, { query: q.value, params: p.value });
        },
      });
    }
  };
}
