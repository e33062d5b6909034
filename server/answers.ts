/**
 * The answer store: the bytes of recent 200 answers of the compute routes, keyed by the exact
 * request that produced them — the route's URL with its query string, the answer format the
 * request asked for (query or Accept header), and the request body's text byte for byte.
 *
 * Every compute route is a pure function of those three (the core does no I/O and keeps no state
 * that changes an answer), so a request that repeats one already answered gets the same bytes
 * without computing them again: a notebook re-running its cells, a page re-sending the scenario it
 * shows. The answer says which it was in the header `x-answer-cache` (`hit` or `miss`); a request
 * with `Cache-Control: no-cache` is always computed afresh (and its answer kept), one with
 * `no-store` is computed and not kept. Refusals are never kept.
 *
 * Bounded by bytes (answers, keys and a fixed overhead per entry), least recently used out first;
 * an answer larger than `maxEntryBytes` is sent and not kept. `buildApp({ answerCache: false })`
 * or BEATFORCE_ANSWER_CACHE_MB=0 turns it off.
 */
import { createHash } from 'node:crypto';
import type { FastifyReply, FastifyRequest } from 'fastify';

export interface AnswerCacheOptions {
  /** All kept answers together (bytes). */
  maxBytes: number;
  /** The largest single answer kept (bytes). */
  maxEntryBytes: number;
}

export interface KeptAnswer {
  body: Buffer | string;
  contentType: string;
  inputHash: string;
  /** Bytes charged to the store for this entry. */
  bytes: number;
}

/** Per-entry overhead charged besides the answer and key (the entry object, the map slot). */
const ENTRY_OVERHEAD = 256;

export class AnswerCache {
  private readonly entries = new Map<string, KeptAnswer>();
  private used = 0;
  hits = 0;
  misses = 0;

  constructor(readonly options: AnswerCacheOptions) {}

  get size(): number {
    return this.entries.size;
  }

  get bytes(): number {
    return this.used;
  }

  /** The kept answer for `key`, now the most recently used; undefined when none is kept. */
  get(key: string): KeptAnswer | undefined {
    const hit = this.entries.get(key);
    if (hit === undefined) {
      this.misses++;
      return undefined;
    }
    this.hits++;
    // Most recently used last: a Map iterates in insertion order.
    this.entries.delete(key);
    this.entries.set(key, hit);
    return hit;
  }

  /** Keep an answer (a copy of a Buffer's bytes); false when it is over `maxEntryBytes`. */
  set(key: string, answer: { body: Buffer | string; contentType: string; inputHash: string }): boolean {
    const length = typeof answer.body === 'string' ? Buffer.byteLength(answer.body) : answer.body.length;
    const bytes = length + key.length + ENTRY_OVERHEAD;
    if (length > this.options.maxEntryBytes || bytes > this.options.maxBytes) return false;
    const old = this.entries.get(key);
    if (old !== undefined) {
      this.entries.delete(key);
      this.used -= old.bytes;
    }
    // A copy: the answer may be a slice of a shared slab (server/format.ts) that must not be kept alive.
    const body = typeof answer.body === 'string' ? answer.body : Buffer.from(answer.body);
    this.entries.set(key, { body, contentType: answer.contentType, inputHash: answer.inputHash, bytes });
    this.used += bytes;
    for (const [k, e] of this.entries) {
      if (this.used <= this.options.maxBytes) break;
      this.entries.delete(k);
      this.used -= e.bytes;
    }
    return true;
  }

  clear(): void {
    this.entries.clear();
    this.used = 0;
  }
}

declare module 'fastify' {
  interface FastifyRequest {
    /** The JSON body's text as received (null for a request without a JSON body). */
    jsonText: string | null;
    /** Where this request's answer is to be kept (null: not kept). */
    answerKey: string | null;
  }
  interface FastifyInstance {
    /** The service's answer store, or null when it is off. */
    answerCache: AnswerCache | null;
  }
}

/** Request `Cache-Control` directives that concern the store. */
export function cacheDirectives(header: string | string[] | undefined): { fresh: boolean; keep: boolean } {
  if (header === undefined) return { fresh: false, keep: true };
  const text = (Array.isArray(header) ? header.join(',') : header).toLowerCase();
  const noStore = /(^|[\s,])no-store([\s,]|$)/.test(text);
  const noCache = /(^|[\s,])no-cache([\s,=]|$)/.test(text);
  return { fresh: noStore || noCache, keep: !noStore };
}

/*
 * V8 hashes a string's characters only up to 16,383 of them; longer strings of one length share a
 * hash, and a map of many would compare them in full on every lookup. A request longer than this
 * (a measured trace) is keyed by the SHA-256 of its text instead (ordinary keys start with the
 * format's name, never with '#').
 */
const LONGEST_PLAIN_KEY = 16_000;

/** The store's key of a request: format, URL with query string, body text. */
export function answerKey(format: string, url: string, text: string): string {
  const key = `${format} ${url}\n${text}`;
  return key.length <= LONGEST_PLAIN_KEY ? key : `#${createHash('sha256').update(key).digest('base64')}`;
}

/**
 * Before a cacheable route computes: answer from the store when it can (true), or mark the
 * request so that its answer is kept when it is sent (false: compute).
 */
export function answerFromStore(cache: AnswerCache, request: FastifyRequest, reply: FastifyReply, format: string): boolean {
  const text = request.jsonText;
  if (text === null) return false;
  const key = answerKey(format, request.url, text);
  const { fresh, keep } = cacheDirectives(request.headers['cache-control']);
  if (!fresh) {
    const hit = cache.get(key);
    if (hit !== undefined) {
      reply.header('x-input-hash', hit.inputHash).header('x-answer-cache', 'hit').type(hit.contentType).send(hit.body);
      return true;
    }
  }
  reply.header('x-answer-cache', 'miss');
  if (keep) request.answerKey = key;
  return false;
}

/** The route-level onSend hook of a cacheable route: keep a 200 answer that was marked. */
export function keepAnswer(cache: AnswerCache) {
  return (request: FastifyRequest, reply: FastifyReply, payload: unknown, done: (err: null, payload: unknown) => void): void => {
    const key = request.answerKey;
    if (key !== null && reply.statusCode === 200 && (typeof payload === 'string' || Buffer.isBuffer(payload))) {
      const contentType = reply.getHeader('content-type');
      const inputHash = reply.getHeader('x-input-hash');
      if (typeof contentType === 'string' && typeof inputHash === 'string') cache.set(key, { body: payload, contentType, inputHash });
    }
    done(null, payload);
  };
}
