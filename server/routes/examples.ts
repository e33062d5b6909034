/** GET /api/v1/examples and /api/v1/examples/:name: the shipped scenarios. */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import { VERSION } from '../../src/version.js';
import { sendError } from '../errors.js';
import { inputHash } from '../hash.js';
import { defineRoute, type AnyRoute } from '../route.js';
import { paramlessResponses } from '../schemas.js';

export interface Example {
  name: string;
  description: string;
  doc: unknown;
  /** The document as served (compact JSON, key order kept). */
  text: Buffer;
  hash: string;
}

/** Every scenario document in `dir` (a JSON object with an `organ`), by file name, sorted. */
export function loadExamples(dir: string): Example[] {
  let files: string[];
  try {
    files = readdirSync(dir).filter((f) => f.endsWith('.json')).sort();
  } catch {
    return [];
  }
  const out: Example[] = [];
  for (const f of files) {
    let doc: unknown;
    try {
      doc = JSON.parse(readFileSync(join(dir, f), 'utf8'));
    } catch {
      continue;
    }
    if (doc === null || typeof doc !== 'object' || !('organ' in doc)) continue;
    const d = (doc as { description?: unknown }).description;
    out.push({ name: f.slice(0, -5), description: typeof d === 'string' ? d : '', doc, text: Buffer.from(`${JSON.stringify(doc)}\n`), hash: inputHash(doc) });
  }
  return out;
}

export const ExampleListSchema = z.strictObject({
  version: z.string(),
  examples: z.array(z.strictObject({ name: z.string(), description: z.string(), url: z.string().meta({ description: 'where to fetch the document' }) })),
});

const NAME = /^[A-Za-z0-9][A-Za-z0-9_-]{0,63}$/;

export function exampleRoutes(examples: readonly Example[]): AnyRoute[] {
  const byName = new Map(examples.map((e) => [e.name, e]));
  const list = { version: VERSION, examples: examples.map((e) => ({ name: e.name, description: e.description, url: `/api/v1/examples/${e.name}` })) };
  const names = examples.map((e) => e.name).join(', ');
  return [
    defineRoute({
      method: 'GET',
      url: '/examples',
      operationId: 'listExamples',
      summary: 'The shipped example scenarios: name and description',
      tags: ['examples'],
      responses: { 200: { description: 'the list', schema: ExampleListSchema }, ...paramlessResponses },
      handler(_request, reply) {
        reply.send(list);
      },
    }),
    defineRoute({
      method: 'GET',
      url: '/examples/:name',
      operationId: 'getExample',
      summary: 'One example scenario document, ready to POST to a compute route',
      description: 'The body is the scenario document itself; the version and the document hash travel in the X-Beatforce-Version and X-Input-Hash headers.',
      tags: ['examples'],
      params: z.strictObject({ name: z.string().regex(NAME, { error: 'is not an example name; expected letters, digits, - and _' }).meta({ description: 'the example name, e.g. fly-tilted-stroke' }) }),
      responses: {
        200: { description: 'the scenario document', ref: 'Scenario' },
        ...paramlessResponses,
        400: { description: 'a malformed example name, or a query parameter (this route takes none but format=json)', ref: 'Error' },
        404: { description: 'no example by that name', ref: 'Error' },
      },
      handler(_request, reply, { params }) {
        const e = byName.get(params.name);
        if (!e) {
          sendError(reply, 'unknown_example', [{ path: 'params.name', message: `'${params.name}' is not a shipped example; expected one of ${names}` }]);
          return;
        }
        reply.header('x-input-hash', e.hash).type('application/json; charset=utf-8').send(e.text);
      },
    }),
  ];
}
