/**
 * jsonBytes writes an answer member by member into one UTF-8 Buffer: its bytes must be exactly
 * those of Buffer.from(JSON.stringify(o)) (the reference is the engine's own JSON.stringify).
 */
import { describe, expect, it } from 'vitest';
import { jsonBytes, registerFixedJson } from '../../server/format.js';
import { CONVENTIONS, SENSING_UNITS, sensing } from '../../src/sensing/index.js';
import { readFileSync } from 'node:fs';

const same = (o: Record<string, unknown>) => expect(jsonBytes(o).equals(Buffer.from(JSON.stringify(o)))).toBe(true);

describe('jsonBytes', () => {
  it('gives the bytes of JSON.stringify for awkward members', () => {
    same({});
    same({ a: undefined, b: () => 1 });
    same({ a: 1, b: undefined, c: 'x' });
    same({ 'k"ey\n': 1, '√': '√Hz ±80° \u{1F600} \u2028', n: [NaN, Infinity, -0, 1e-7, 1e21, 0.1 + 0.2, null], o: { d: new Date(0) } });
    same({ '2': 'integer keys first', a: 1, '1': 0 });
    same({ lone: '\ud800 surrogate', ctrl: '\u0000\u001f' });
  });

  it('gives the bytes of JSON.stringify for a sensing answer with registered constants', () => {
    registerFixedJson(CONVENTIONS, SENSING_UNITS);
    const doc = JSON.parse(readFileSync(new URL('../../examples/fly-sensing.json', import.meta.url), 'utf8')) as unknown;
    const r = sensing(doc);
    if (!r.ok) throw new Error('fly-sensing is invalid');
    const o: Record<string, unknown> = { version: '0.0.0', inputHash: '0123456789abcdef', ...(r.answer as object) };
    same(o);
    // the constants are frozen: the JSON written once cannot go stale
    expect(Object.isFrozen(CONVENTIONS)).toBe(true);
    expect(() => {
      (SENSING_UNITS as Record<string, string>).rate = 'deg/s';
    }).toThrow();
  });
});
