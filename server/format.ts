/**
 * Answer formats: JSON by default; CSV for answers that are tables, chosen by `?format=csv` or by
 * an Accept header that names text/csv before application/json.
 */
import type { FastifyReply } from 'fastify';
import { z } from 'zod';
import { VERSION } from '../src/version.js';

export type Format = 'json' | 'csv';

export const FormatSchema = z.enum(['json', 'csv'], { error: 'is not a format; expected json or csv' }).meta({ description: 'json (default) or csv; overrides the Accept header' });

/** The format an Accept header asks for: whichever of text/csv and application/json comes first. */
export function acceptFormat(accept: string | undefined): Format {
  if (accept === undefined) return 'json';
  const csv = accept.indexOf('text/csv');
  if (csv < 0) return 'json';
  const json = accept.indexOf('application/json');
  return json >= 0 && json < csv ? 'json' : 'csv';
}

export function chooseFormat(query: { format?: Format }, accept: string | undefined): Format {
  return query.format ?? acceptFormat(accept);
}

/*
 * Large CSV bodies go out as Buffers, small ones as strings: measured with autocannon on loopback
 * (server CPU per request), a string was cheaper up to ~50 kB and several times dearer from
 * ~100 kB up. (JSON answers always go out as one Buffer, written by jsonBytes below.)
 */
const BUFFER_FROM = 64 * 1024;
const body = (text: string): string | Buffer => (text.length < BUFFER_FROM ? text : Buffer.from(text));

/**
 * Objects whose JSON never changes (frozen module constants such as the sensing conventions):
 * their UTF-8 JSON is written once, when registered, and copied into each answer. This is not a
 * cache of answers: nothing here depends on a request.
 */
const fixedJson = new WeakMap<object, Buffer>();

const deepFreeze = (o: object): void => {
  Object.freeze(o);
  for (const v of Object.values(o)) if (v !== null && typeof v === 'object' && !Object.isFrozen(v)) deepFreeze(v as object);
};

/** Register constants that appear verbatim in answers; they are frozen so their JSON cannot go stale. */
export function registerFixedJson(...objects: object[]): void {
  for (const o of objects) {
    deepFreeze(o);
    fixedJson.set(o, Buffer.from(JSON.stringify(o)));
  }
}

/*
 * Answer bytes are carved from 1 MB slabs, as Node's Buffer pool does with 8 kB ones: an answer of
 * a few kilobytes up otherwise costs an ArrayBuffer of its own (about 6–9 µs with the collector's
 * share, against under 1 µs from a slab). A slice is written once, handed to the socket and never
 * touched again; a slab is freed when its last answer has been sent. Answers over 128 kB get their
 * own buffer.
 */
const SLAB = 1 << 20;
let slab = Buffer.allocUnsafeSlow(0);
let slabAt = 0;
function answerBuffer(bytes: number): Buffer {
  if (bytes > SLAB >> 3) return Buffer.allocUnsafe(bytes);
  if (slabAt + bytes > slab.length) {
    slab = Buffer.allocUnsafeSlow(SLAB);
    slabAt = 0;
  }
  const out = slab.subarray(slabAt, slabAt + bytes);
  slabAt += (bytes + 7) & ~7;
  return out;
}

/**
 * The bytes of `JSON.stringify(o)` for a plain object, written member by member into one UTF-8
 * Buffer. Same bytes as JSON.stringify (members in Object.keys order, members whose value
 * stringifies to nothing left out), cheaper on the wire: one string with a single character above
 * U+00FF (a √ in a description or in the conventions) makes JSON.stringify write the whole answer
 * as UTF-16 and the socket transcode it all; member by member, only that member is.
 */
export function jsonBytes(o: Record<string, unknown>): Buffer {
  const parts: (string | Buffer)[] = [];
  let bytes = 1;
  let sep = '{';
  for (const k of Object.keys(o)) {
    const v = o[k];
    const fixed = v !== null && typeof v === 'object' ? fixedJson.get(v) : undefined;
    const text = fixed ?? JSON.stringify(v) as string | undefined;
    if (text === undefined) continue;
    const head = `${sep}${JSON.stringify(k)}:`;
    sep = ',';
    parts.push(head, text);
    bytes += Buffer.byteLength(head) + (typeof text === 'string' ? Buffer.byteLength(text) : text.length);
  }
  if (parts.length === 0) return Buffer.from('{}');
  const out = answerBuffer(bytes);
  let at = 0;
  for (const p of parts) at += typeof p === 'string' ? out.write(p, at) : p.copy(out, at);
  out[at] = 0x7d; // }
  return out;
}

/** Send a JSON answer with the version and input hash in the body (first) and as headers. */
export function sendJson(reply: FastifyReply, hash: string, answer: object): FastifyReply {
  reply.header('x-input-hash', hash);
  return reply.type('application/json; charset=utf-8').send(jsonBytes({ version: VERSION, inputHash: hash, ...answer }));
}

/** Send a CSV table; the version and input hash travel as headers (the table stays plain CSV). */
export function sendCsv(reply: FastifyReply, hash: string, csv: string): FastifyReply {
  reply.header('x-input-hash', hash);
  return reply.type('text/csv; charset=utf-8').send(body(csv));
}
