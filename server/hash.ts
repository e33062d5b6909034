/**
 * `inputHash`: the first 16 hex digits of SHA-256 over the request document in canonical JSON
 * (object keys sorted, no whitespace, numbers in JavaScript's shortest round-trip form). The same
 * document in any key order or layout has the same hash, so a result kept in a notebook can be
 * traced to its request.
 */
import { createHash } from 'node:crypto';

/** Canonical JSON of a parsed JSON value (what JSON.parse returns; nothing else occurs). */
export function canonicalJson(v: unknown): string {
  if (v === null || typeof v !== 'object') return JSON.stringify(v) ?? 'null';
  if (Array.isArray(v)) {
    let s = '[';
    for (let i = 0; i < v.length; i++) s += (i > 0 ? ',' : '') + canonicalJson(v[i]);
    return `${s}]`;
  }
  const o = v as Record<string, unknown>;
  const keys = Object.keys(o).sort();
  let s = '{';
  let first = true;
  for (const k of keys) {
    if (o[k] === undefined) continue;
    s += `${first ? '' : ','}${JSON.stringify(k)}:${canonicalJson(o[k])}`;
    first = false;
  }
  return `${s}}`;
}

export const HASH_LENGTH = 16;

export function inputHash(doc: unknown): string {
  return createHash('sha256').update(canonicalJson(doc)).digest('hex').slice(0, HASH_LENGTH);
}
