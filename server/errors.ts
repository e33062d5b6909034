/**
 * The one catalogue of error answers. Every refusal the service gives has this shape:
 *   { error: CODE, message, issues: [{ path, message[, limit] }], version[, inputHash][, limit] }
 * with the status fixed by the code. Nothing else (no stack, no framework wording) leaves the server.
 */
import { maxHeaderSize, STATUS_CODES } from 'node:http';
import type { Socket } from 'node:net';
import type { FastifyError, FastifyReply, FastifyRequest } from 'fastify';
import { VERSION } from '../src/version.js';

export const ERRORS = {
  invalid_scenario: { status: 400, message: 'the scenario is invalid' },
  invalid_request: { status: 400, message: 'the request is invalid' },
  invalid_json: { status: 400, message: 'the body is not valid JSON' },
  invalid_http: { status: 400, message: 'the request is not valid HTTP' },
  not_found: { status: 404, message: 'nothing here' },
  unknown_example: { status: 404, message: 'no example by that name' },
  method_not_allowed: { status: 405, message: 'the method is not allowed on this route' },
  not_acceptable: { status: 406, message: 'the answer is not available in the format asked for' },
  over_limit: { status: 413, message: 'the request asks for more work than one request may' },
  body_too_large: { status: 413, message: 'the request body is over the size limit' },
  request_timeout: { status: 408, message: 'the request did not arrive in time' },
  unsupported_media_type: { status: 415, message: 'the body must be JSON (Content-Type: application/json)' },
  headers_too_large: { status: 431, message: 'the request headers are over the size limit' },
  cors_forbidden: { status: 403, message: 'the origin is not on the allow-list' },
  internal: { status: 500, message: 'internal error; the answer could not be computed' },
} as const;

export type ErrorCode = keyof typeof ERRORS;

/** An issue as the service reports it: the core's issues, and limits of the service's own. */
export interface ServiceIssue {
  path: string;
  message: string;
  limit?: string;
}

export interface ErrorBody {
  error: ErrorCode;
  message: string;
  issues: ServiceIssue[];
  version: string;
  inputHash?: string;
  /** The limit that was exceeded (413, and 431 / 408 for the HTTP parser's limits). */
  limit?: string;
}

export function errorBody(code: ErrorCode, issues: ServiceIssue[], inputHash?: string): ErrorBody {
  const limit = issues.find((i) => i.limit)?.limit;
  return {
    error: code,
    message: ERRORS[code].message,
    issues,
    version: VERSION,
    ...(inputHash === undefined ? {} : { inputHash }),
    ...(limit === undefined ? {} : { limit }),
  };
}

/** Send a catalogue error (always JSON, whatever format the request asked for). */
export function sendError(reply: FastifyReply, code: ErrorCode, issues: ServiceIssue[], inputHash?: string): FastifyReply {
  if (inputHash !== undefined) reply.header('x-input-hash', inputHash);
  return reply.code(ERRORS[code].status).type('application/json; charset=utf-8').send(errorBody(code, issues, inputHash));
}

/** Issues from the core: any limit issue makes the whole answer a 413 (as the CLI's exit code 3). */
export function sendIssues(reply: FastifyReply, issues: ServiceIssue[], inputHash: string, invalid: ErrorCode = 'invalid_scenario'): FastifyReply {
  return sendError(reply, issues.some((i) => i.limit) ? 'over_limit' : invalid, issues, inputHash);
}

/** The JSON parser refuses __proto__ and constructor.prototype keys (prototype poisoning) too. */
const INVALID_JSON = 'is not valid JSON, or carries a __proto__ or constructor.prototype key; expected a JSON document';

export const BODY_LIMIT_NAME = 'bodyBytes';

/** Map errors that fastify and its plugins raise onto the catalogue; anything else is a 500. */
export function frameworkError(error: FastifyError, request: FastifyRequest, bodyLimit: number): { code: ErrorCode; issues: ServiceIssue[] } {
  switch (error.code) {
    case 'FST_ERR_CTP_BODY_TOO_LARGE':
      return { code: 'body_too_large', issues: [{ path: '(body)', message: `is over the limit of ${bodyLimit} bytes`, limit: BODY_LIMIT_NAME }] };
    case 'FST_ERR_CTP_INVALID_JSON_BODY':
    case 'FST_ERR_CTP_EMPTY_JSON_BODY':
      return { code: 'invalid_json', issues: [{ path: '(document)', message: error.code === 'FST_ERR_CTP_EMPTY_JSON_BODY' ? 'is empty; expected a JSON document' : INVALID_JSON }] };
    case 'FST_ERR_CTP_INVALID_MEDIA_TYPE':
      return { code: 'unsupported_media_type', issues: [{ path: 'header.content-type', message: `${JSON.stringify(request.headers['content-type'] ?? '')} is not accepted; expected application/json` }] };
    case 'FST_ERR_CTP_INVALID_CONTENT_LENGTH':
      return { code: 'invalid_request', issues: [{ path: 'header.content-length', message: 'does not match the body; expected the length of the body in bytes' }] };
    default:
      break;
  }
  if (error instanceof SyntaxError || error.statusCode === 400) {
    // secure-json-parse refuses __proto__ and constructor.prototype keys with a SyntaxError.
    return { code: 'invalid_json', issues: [{ path: '(document)', message: INVALID_JSON }] };
  }
  if (error.statusCode === 403 || error.statusCode === 404) {
    // The static file server refuses paths that leave web/ (403): to the client it is not there.
    return { code: 'not_found', issues: [{ path: 'url', message: `${JSON.stringify(request.url.slice(0, 200))} is not here` }] };
  }
  return { code: 'internal', issues: [{ path: '(server)', message: 'could not compute the answer' }] };
}

/**
 * Errors that Node's HTTP parser raises before fastify sees a request (malformed HTTP, headers over
 * the size limit, a request that does not arrive within the timeout), answered in the catalogue's
 * shape on the raw socket, which is then closed. A reset connection gets nothing.
 */
export function answerClientError(err: NodeJS.ErrnoException, socket: Socket, requestTimeoutMs: number): void {
  if (err.code === 'ECONNRESET' || socket.destroyed) return;
  const [code, issue]: [ErrorCode, ServiceIssue] =
    err.code === 'HPE_HEADER_OVERFLOW'
      ? ['headers_too_large', { path: '(headers)', message: `are over the limit of ${maxHeaderSize} bytes`, limit: 'headerBytes' }]
      : err.code === 'ERR_HTTP_REQUEST_TIMEOUT'
        ? ['request_timeout', { path: '(request)', message: `did not arrive within ${requestTimeoutMs / 1000} s`, limit: 'requestTimeout' }]
        : ['invalid_http', { path: '(request)', message: `is not valid HTTP/1.1 (${err.code ?? 'parse error'})` }];
  const status = ERRORS[code].status;
  const body = JSON.stringify(errorBody(code, [issue]));
  if (socket.writable) {
    socket.write(`HTTP/1.1 ${status} ${STATUS_CODES[status] ?? ''}\r\nContent-Type: application/json; charset=utf-8\r\nContent-Length: ${Buffer.byteLength(body)}\r\nConnection: close\r\n\r\n${body}`);
  }
  socket.destroy();
}
