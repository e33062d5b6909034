/** GET /health: the service is up; its version. */
import { z } from 'zod';
import { VERSION } from '../../src/version.js';
import { defineRoute } from '../route.js';
import { paramlessResponses } from '../schemas.js';

export const HealthSchema = z.strictObject({ status: z.literal('ok'), version: z.string() });

export const healthRoute = defineRoute({
  method: 'GET',
  url: '/health',
  operationId: 'health',
  summary: 'The service is up',
  tags: ['service'],
  responses: { 200: { description: 'up', schema: HealthSchema }, ...paramlessResponses },
  handler(_request, reply) {
    reply.send({ status: 'ok', version: VERSION });
  },
});
