/** GET /api/v1/openapi.json: the OpenAPI 3 document of every route. */
import { defineRoute } from '../route.js';
import { paramlessResponses } from '../schemas.js';

export function openApiRoute(document: () => Record<string, unknown>) {
  let text: Buffer | undefined;
  return defineRoute({
    method: 'GET',
    url: '/openapi.json',
    operationId: 'openapi',
    summary: 'This document: OpenAPI 3.0, written from the zod schemas that validate the requests',
    tags: ['service'],
    responses: { 200: { description: 'the OpenAPI document' }, ...paramlessResponses },
    handler(_request, reply) {
      text ??= Buffer.from(JSON.stringify(document()));
      reply.type('application/json; charset=utf-8').send(text);
    },
  });
}
