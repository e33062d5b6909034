/** Schemas shared by several routes: the error answer, the stamp every answer carries. */
import { z } from 'zod';
import { ERRORS } from './errors.js';

export const IssueSchema = z
  .strictObject({
    path: z.string().meta({ description: 'the field, e.g. "organ.mass", "query.format", "(document)" for the whole body' }),
    message: z.string().meta({ description: 'what is wrong: the value and what was expected' }),
    limit: z.string().optional().meta({ description: 'set when the issue is a limit on work per request (HTTP 413): its name' }),
  })
  .meta({ description: 'one problem with the request' });

export const ErrorSchema = z
  .strictObject({
    error: z.enum(Object.keys(ERRORS) as [keyof typeof ERRORS, ...(keyof typeof ERRORS)[]]).meta({ description: 'the error code from the catalogue' }),
    message: z.string(),
    issues: z.array(IssueSchema),
    version: z.string(),
    inputHash: z.string().optional().meta({ description: 'hash of the request document, when there was one' }),
    limit: z.string().optional().meta({ description: 'the limit that was exceeded (413)' }),
  })
  .meta({ description: 'Every refusal: 400, 404, 405, 406, 413, 415 (and 500, which should not happen).' });

/** Fields every JSON answer of a computation starts with. */
export const stamp = {
  version: z.string().meta({ description: 'the project version' }),
  inputHash: z.string().meta({ description: 'first 16 hex digits of SHA-256 over the request document in canonical JSON (keys sorted); also in the X-Input-Hash header' }),
};

/** The refusals of a route that takes no query parameters (route.ts). */
export const paramlessResponses = {
  400: { description: 'a query parameter: this route takes none but format=json', ref: 'Error' },
  406: { description: 'format other than json: this route answers JSON only', ref: 'Error' },
} as const;

export const errorResponses = {
  400: { description: 'invalid request: issues name each field, its value and what was expected', ref: 'Error' },
  413: { description: 'over a limit on work per request (the limit is named) or over the body size limit', ref: 'Error' },
  415: { description: 'the body is not JSON', ref: 'Error' },
} as const;

export const Vec3Schema = z.tuple([z.number(), z.number(), z.number()]);
