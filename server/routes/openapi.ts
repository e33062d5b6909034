/** GET /api/v1/openapi.json: the OpenAPI 3 document of every route. */
import { defineRoute } from '../route.js';

export const openApiRoute = (document: () => Record<string, unknown>) =>
  defineRoute({
    method: 'GET',
    url: '/openapi.json',
    operationId: 'openapi',
    summary: 'This document: OpenAPI 3.0, written from the zod schemas that validate the requests',
    tags: ['service'],
    responses: { 200: { description: 'the OpenAPI document' } },
    handler(_request, reply) {
      reply.send(document());
    },
  });
