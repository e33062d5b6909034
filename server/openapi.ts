/**
 * The OpenAPI 3.0 document, written from the route specs and their zod schemas (request side for
 * bodies, query strings and parameters; answer side for responses), so that the schema that
 * validates a request is the schema that documents it.
 */
import { z } from 'zod';
import { VERSION } from '../src/version.js';
import type { AnyRoute } from './route.js';
import { ErrorSchema } from './schemas.js';

export interface RouteGroup {
  prefix: string;
  routes: readonly AnyRoute[];
}

type Json = Record<string, unknown>;

export interface OpenApiOptions {
  /** zod schemas that stand for a component (e.g. the scenario inside a sweep request). */
  refs?: ReadonlyMap<z.ZodType, string>;
}

const toSchema = (schema: z.ZodType, io: 'input' | 'output', refs: ReadonlyMap<z.ZodType, string>): Json =>
  z.toJSONSchema(schema, {
    target: 'openapi-3.0',
    io,
    unrepresentable: 'any',
    override: (ctx) => {
      // A required field of a referenced schema (`.nonoptional()`, for its own refusal) is the reference too.
      const own = ctx.zodSchema as unknown as z.ZodType;
      const target = own instanceof z.ZodNonOptional ? (own.unwrap() as z.ZodType) : own;
      const ref = refs.get(target);
      if (ref === undefined) return;
      const js = ctx.jsonSchema as Json;
      for (const k of Object.keys(js)) delete js[k];
      if (target.description !== undefined) js.description = target.description;
      js.$ref = `#/components/schemas/${ref}`;
    },
  }) as Json;

const openApiPath = (url: string): string => url.replace(/:([A-Za-z_]\w*)/g, '{$1}');

function parameters(where: 'query' | 'path', schema: z.ZodType | undefined, refs: ReadonlyMap<z.ZodType, string>): Json[] {
  if (!schema) return [];
  const shape = (schema as unknown as { shape?: Record<string, z.ZodType> }).shape;
  if (!shape) return [];
  return Object.entries(shape).map(([name, field]) => {
    const js = toSchema(field, 'input', refs);
    const { description, ...rest } = js;
    return { name, in: where, required: where === 'path' || !field.safeParse(undefined).success, ...(description ? { description } : {}), schema: rest };
  });
}

const refTo = (name: string): Json => ({ $ref: `#/components/schemas/${name}` });

/** The request header and answer headers of a route whose answers are kept (server/answers.ts). */
const CACHE_CONTROL: Json = {
  name: 'Cache-Control',
  in: 'header',
  required: false,
  description: 'no-cache: compute the answer afresh even if the same request was answered before (and keep it); no-store: compute it and do not keep it',
  schema: { type: 'string' },
};
const KEPT_ANSWER_HEADERS: Json = {
  'x-answer-cache': { description: 'hit: the bytes of an earlier answer to the very same request (URL, format, body text); miss: computed for this request', schema: { type: 'string', enum: ['hit', 'miss'] } },
  'x-input-hash': { description: 'the inputHash of the answer (also in a JSON body)', schema: { type: 'string' } },
};

/** The whole document. */
export function openApiDocument(groups: readonly RouteGroup[], opts: OpenApiOptions = {}): Json {
  const refs = opts.refs ?? new Map();
  const components: Record<string, Json> = { Error: toSchema(ErrorSchema, 'output', refs) };
  const paths: Record<string, Record<string, Json>> = {};
  const tags = new Set<string>();
  for (const { prefix, routes } of groups) {
    for (const r of routes) {
      const url = openApiPath(`${prefix}${r.url}`);
      if (r.body && components[r.body.ref] === undefined) components[r.body.ref] = toSchema(r.body.schema, 'input', refs);
      const responses: Record<string, Json> = {};
      for (const [status, spec] of Object.entries(r.responses)) {
        const content: Json = {};
        if (spec.ref) content['application/json'] = { schema: refTo(spec.ref) };
        else if (spec.schema) content['application/json'] = { schema: toSchema(spec.schema, 'output', refs) };
        if (spec.csv) content['text/csv'] = { schema: { type: 'string', description: 'a CSV table (RFC 4180) whose header row names units' } };
        responses[status] = { description: spec.description, ...(r.keepsAnswers && status === '200' ? { headers: KEPT_ANSWER_HEADERS } : {}), ...(Object.keys(content).length > 0 ? { content } : {}) };
      }
      for (const t of r.tags ?? []) tags.add(t);
      const params = [...parameters('path', r.params, refs), ...parameters('query', r.query, refs), ...(r.keepsAnswers ? [CACHE_CONTROL] : [])];
      paths[url] ??= {};
      (paths[url] as Record<string, Json>)[r.method.toLowerCase()] = {
        operationId: r.operationId,
        summary: r.summary,
        ...(r.description ? { description: r.description } : {}),
        ...(r.tags ? { tags: r.tags } : {}),
        ...(params.length > 0 ? { parameters: params } : {}),
        ...(r.body ? { requestBody: { required: true, description: r.body.description, content: { 'application/json': { schema: refTo(r.body.ref) } } } } : {}),
        responses,
      };
    }
  }
  return {
    openapi: '3.0.3',
    info: {
      title: 'beatforce',
      version: VERSION,
      description:
        'Inertial loads on an oscillating mass carried by a turning body (haltere-like organs and vibratory rate gyros). Quantities are SI numbers or strings with units. Every answer carries `version` and `inputHash`; refusals share the `Error` shape. A compute route answers a request it has answered before (same URL, format and body text) with the same bytes from its answer store, marked `x-answer-cache: hit`; `Cache-Control: no-cache` computes afresh. Numbers support research and design; they do not certify a navigation or safety sensor.',
      license: { name: 'MIT' },
    },
    servers: [{ url: '/' }],
    tags: [...tags].map((name) => ({ name })),
    paths,
    components: { schemas: components },
  };
}
