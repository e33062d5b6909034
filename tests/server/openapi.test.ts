/**
 * GET /api/v1/openapi.json: a valid OpenAPI 3.0 document (checked against the OpenAPI
 * Specification 3.0.3: document, operation, parameter and schema objects; every $ref resolves),
 * listing every route the app serves with its request schema, which is the schema that validates.
 */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { buildApp } from '../../server/app.js';
import { ScenarioSchema } from '../../src/scenario.js';
import { SweepRequestSchema } from '../../src/sweep.js';
import { PKG_VERSION } from './helpers.js';

type Json = Record<string, unknown>;

let app: FastifyInstance;
let doc: Json;
const served: { method: string; url: string }[] = [];

beforeAll(async () => {
  app = buildApp();
  app.addHook('onRoute', (r) => {
    for (const m of [r.method].flat()) served.push({ method: m, url: r.url });
  });
  await app.ready();
  const r = await app.inject({ method: 'GET', url: '/api/v1/openapi.json' });
  expect(r.statusCode).toBe(200);
  doc = r.json() as Json;
});
afterAll(async () => {
  await app.close();
});

// OpenAPI Specification 3.0.3, §4.7.24 Schema Object: the JSON Schema subset it allows.
const SCHEMA_KEYS = new Set([
  'title', 'multipleOf', 'maximum', 'exclusiveMaximum', 'minimum', 'exclusiveMinimum', 'maxLength', 'minLength', 'pattern',
  'maxItems', 'minItems', 'uniqueItems', 'maxProperties', 'minProperties', 'required', 'enum', 'type', 'allOf', 'oneOf',
  'anyOf', 'not', 'items', 'properties', 'additionalProperties', 'description', 'format', 'default', 'nullable',
  'discriminator', 'readOnly', 'writeOnly', 'xml', 'externalDocs', 'example', 'deprecated', '$ref',
]);
const TYPES = new Set(['string', 'number', 'integer', 'boolean', 'array', 'object']);

/** Problems with a Schema Object under OAS 3.0.3 (an empty list when it is valid). */
function schemaProblems(s: unknown, at: string, out: string[]): void {
  if (s === null || typeof s !== 'object' || Array.isArray(s)) {
    out.push(`${at}: not a schema object`);
    return;
  }
  const o = s as Json;
  for (const k of Object.keys(o)) if (!SCHEMA_KEYS.has(k) && !k.startsWith('x-')) out.push(`${at}: keyword '${k}' is not allowed in OpenAPI 3.0`);
  if ('type' in o && !(typeof o.type === 'string' && TYPES.has(o.type))) out.push(`${at}: type ${JSON.stringify(o.type)} is not one OpenAPI 3.0 type`);
  for (const k of ['exclusiveMinimum', 'exclusiveMaximum', 'nullable', 'uniqueItems']) if (k in o && typeof o[k] !== 'boolean') out.push(`${at}: ${k} must be a boolean`);
  if ('required' in o && !(Array.isArray(o.required) && o.required.every((x) => typeof x === 'string'))) out.push(`${at}: required must be a list of names`);
  if ('enum' in o && !Array.isArray(o.enum)) out.push(`${at}: enum must be a list`);
  if (o.type === 'array' && !('items' in o)) out.push(`${at}: an array schema needs items`);
  if ('items' in o) schemaProblems(o.items, `${at}.items`, out);
  if ('not' in o) schemaProblems(o.not, `${at}.not`, out);
  for (const k of ['allOf', 'oneOf', 'anyOf']) if (k in o) (Array.isArray(o[k]) ? (o[k] as unknown[]) : [null]).forEach((x, i) => schemaProblems(x, `${at}.${k}[${i}]`, out));
  if ('properties' in o) for (const [k, v] of Object.entries(o.properties as Json)) schemaProblems(v, `${at}.properties.${k}`, out);
  if ('additionalProperties' in o && typeof o.additionalProperties !== 'boolean') schemaProblems(o.additionalProperties, `${at}.additionalProperties`, out);
}

function refs(x: unknown, out: string[] = []): string[] {
  if (Array.isArray(x)) x.forEach((y) => refs(y, out));
  else if (x !== null && typeof x === 'object') {
    for (const [k, v] of Object.entries(x)) {
      if (k === '$ref' && typeof v === 'string') out.push(v);
      else refs(v, out);
    }
  }
  return out;
}

const METHODS = ['get', 'put', 'post', 'delete', 'options', 'head', 'patch', 'trace'];

describe('GET /api/v1/openapi.json', () => {
  it('is an OpenAPI 3.0 document: version field, info, paths, components', () => {
    expect(doc.openapi).toMatch(/^3\.0\.\d+$/);
    expect(doc.info).toMatchObject({ title: 'beatforce', version: PKG_VERSION });
    expect(Object.keys(doc).sort()).toEqual(['components', 'info', 'openapi', 'paths', 'servers', 'tags']);
    for (const p of Object.keys(doc.paths as Json)) expect(p).toMatch(/^\//);
  });

  it('has valid operation, parameter, request-body and response objects, with unique operationIds', () => {
    const ids = new Set<string>();
    for (const [path, item] of Object.entries(doc.paths as Record<string, Json>)) {
      const templated = [...path.matchAll(/\{(\w+)\}/g)].map((m) => m[1]);
      for (const [method, op] of Object.entries(item) as [string, Json][]) {
        expect(METHODS, `${path} ${method}`).toContain(method);
        expect(typeof op.operationId).toBe('string');
        expect(ids.has(op.operationId as string), `operationId ${String(op.operationId)} repeats`).toBe(false);
        ids.add(op.operationId as string);
        const responses = op.responses as Record<string, Json>;
        expect(Object.keys(responses).length).toBeGreaterThan(0);
        for (const [status, resp] of Object.entries(responses)) {
          expect(status).toMatch(/^([1-5]\d\d|default)$/);
          expect(typeof resp.description, `${path} ${method} ${status}`).toBe('string');
          for (const media of Object.values((resp.content ?? {}) as Record<string, Json>)) {
            const problems: string[] = [];
            schemaProblems(media.schema, `${path} ${method} ${status}`, problems);
            expect(problems).toEqual([]);
          }
        }
        const params = (op.parameters ?? []) as Json[];
        for (const p of params) {
          expect(['query', 'path', 'header', 'cookie']).toContain(p.in);
          expect(typeof p.name).toBe('string');
          if (p.in === 'path') expect(p.required).toBe(true);
          const problems: string[] = [];
          schemaProblems(p.schema, `${path} ${method} parameter ${String(p.name)}`, problems);
          expect(problems).toEqual([]);
        }
        expect(params.filter((p) => p.in === 'path').map((p) => p.name).sort()).toEqual([...templated].sort());
        if (method === 'post') {
          const body = op.requestBody as Json;
          expect(body.required).toBe(true);
          expect(Object.keys(body.content as Json)).toEqual(['application/json']);
        }
      }
    }
  });

  it('has a checker that can fail: JSON Schema 2020-12 output (prefixItems, numeric exclusiveMinimum) is refused', () => {
    const problems: string[] = [];
    schemaProblems(z.toJSONSchema(ScenarioSchema, { io: 'input', unrepresentable: 'any' }), 'draft-2020-12', problems);
    expect(problems.some((p) => p.includes("'prefixItems'"))).toBe(true);
    expect(problems.some((p) => p.includes("'$schema'"))).toBe(true);
    expect(problems.some((p) => p.includes('exclusiveMinimum must be a boolean'))).toBe(true);
  });

  it('has component schemas valid under OpenAPI 3.0, and every $ref resolves', () => {
    const schemas = (doc.components as { schemas: Json }).schemas;
    for (const [name, s] of Object.entries(schemas)) {
      const problems: string[] = [];
      schemaProblems(s, `components.schemas.${name}`, problems);
      expect(problems).toEqual([]);
    }
    const all = refs(doc);
    expect(all.length).toBeGreaterThan(0);
    for (const r of all) {
      expect(r).toMatch(/^#\/components\/schemas\//);
      expect(schemas[r.slice('#/components/schemas/'.length)], r).toBeDefined();
    }
  });

  it('lists every route the app serves (but the static page) with its method', () => {
    const paths = doc.paths as Record<string, Json>;
    const api = served.filter((r) => r.method !== 'HEAD' && r.method !== 'OPTIONS' && !r.url.includes('*') && r.url !== '/');
    expect(api.length).toBeGreaterThanOrEqual(6);
    for (const r of api) {
      const p = r.url.replace(/:(\w+)/g, '{$1}');
      expect(paths[p]?.[r.method.toLowerCase()], `${r.method} ${r.url}`).toBeDefined();
    }
    const documented = Object.entries(paths).flatMap(([p, item]) => Object.keys(item).map((m) => `${m.toUpperCase()} ${p}`));
    expect(documented.sort()).toEqual(api.map((r) => `${r.method} ${r.url.replace(/:(\w+)/g, '{$1}')}`).sort());
    for (const required of ['POST /api/v1/forces', 'POST /api/v1/sensing', 'POST /api/v1/turn', 'POST /api/v1/sweep', 'GET /api/v1/examples', 'GET /api/v1/examples/{name}', 'GET /api/v1/openapi.json', 'GET /health']) expect(documented).toContain(required);
  });

  it('documents the refusals of the routes without query parameters: 400 for any but format=json, 406 for another format', () => {
    const paths = doc.paths as Record<string, Record<string, { responses: Record<string, unknown> }>>;
    for (const p of ['/health', '/api/v1/examples', '/api/v1/examples/{name}', '/api/v1/openapi.json']) {
      expect(Object.keys(paths[p]?.get?.responses ?? {}).sort(), p).toEqual(expect.arrayContaining(['200', '400', '406']));
    }
  });

  it('documents each request body with the very zod schema that validates it (request side)', () => {
    const schemas = (doc.components as { schemas: Json }).schemas;
    const opts = { target: 'openapi-3.0', io: 'input', unrepresentable: 'any' } as const;
    expect(schemas.Scenario).toEqual(z.toJSONSchema(ScenarioSchema, opts));
    const sweep = schemas.SweepRequest as { properties: Json };
    expect(sweep.properties.scenario).toEqual({ description: 'a scenario document, as for POST /api/v1/forces', $ref: '#/components/schemas/Scenario' });
    const own = z.toJSONSchema(SweepRequestSchema, opts) as { properties: Json };
    expect({ ...sweep.properties, scenario: undefined }).toEqual({ ...own.properties, scenario: undefined });
    const forces = (doc.paths as Record<string, Record<string, Json>>)['/api/v1/forces']?.post;
    for (const route of ['forces', 'sensing', 'turn']) {
      const op = (doc.paths as Record<string, Record<string, Json>>)[`/api/v1/${route}`]?.post;
      expect((op?.requestBody as Json).content).toEqual({ 'application/json': { schema: { $ref: '#/components/schemas/Scenario' } } });
    }
    expect((forces?.parameters as Json[]).filter((p) => p.in === 'query')).toEqual([
      { name: 'format', in: 'query', required: false, description: 'json (default) or csv; overrides the Accept header', schema: { type: 'string', enum: ['json', 'csv'] } },
      { name: 'table', in: 'query', required: false, description: 'with CSV: the harmonic lines (default) or the load series', schema: { type: 'string', enum: ['harmonics', 'series'] } },
    ]);
  });

  it('documents the answer store on the compute routes and only there: Cache-Control in, x-answer-cache out', () => {
    const paths = doc.paths as Record<string, Record<string, Json>>;
    const marked: string[] = [];
    for (const [url, ops] of Object.entries(paths)) {
      for (const [method, op] of Object.entries(ops)) {
        const header = ((op.parameters as Json[] | undefined) ?? []).find((p) => p.in === 'header');
        const answerHeaders = (op.responses as Record<string, Json>)['200']?.headers as Record<string, Json> | undefined;
        expect(header === undefined, `${method} ${url}`).toBe(answerHeaders === undefined);
        if (header === undefined) continue;
        marked.push(`${method} ${url}`);
        expect(header.name).toBe('Cache-Control');
        expect(answerHeaders?.['x-answer-cache']?.schema).toEqual({ type: 'string', enum: ['hit', 'miss'] });
      }
    }
    expect(marked.sort()).toEqual(['post /api/v1/forces', 'post /api/v1/sensing', 'post /api/v1/sweep', 'post /api/v1/turn']);
  });
});
