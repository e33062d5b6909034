/**
 * jsonBytes writes an answer member by member into one UTF-8 Buffer: its bytes must be exactly
 * those of Buffer.from(JSON.stringify(o)) (the reference is the engine's own JSON.stringify).
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { jsonBytes, memberWriter, registerFixedJson } from '../../server/format.js';
import { SENSING_WRITERS } from '../../server/routes/sensing.js';
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

const example = (name: string): Record<string, unknown> =>
  JSON.parse(readFileSync(new URL(`../../examples/${name}.json`, import.meta.url), 'utf8')) as Record<string, unknown>;

describe('compiled member writers (fast-json-stringify from the answer schemas)', () => {
  // Variants that switch on every optional part of an organ and of the pair: line tables, series,
  // a sense mode on the stalked organ, an organ without mirror, a pair that confuses two axes.
  const fly = example('fly-sensing'), mems = example('mems-sensing');
  const flyOrgan = fly.organ as Record<string, unknown>, memsOrgan = mems.organ as Record<string, unknown>;
  const variants: [string, Record<string, unknown>][] = [
    ['fly-sensing', fly],
    ['mems-sensing', mems],
    ['fly-sensing, lines and series', { ...fly, output: { series: true, lines: true } }],
    ['mems-sensing, lines and series', { ...mems, output: { series: true, lines: true } }],
    ['fly-sensing with a sense mode, lines', { ...fly, organ: { ...flyOrgan, senseMode: { frequency: '600 Hz', quality: 9, mass: '6 ug' } }, output: { series: false, lines: true } }],
    ['fly-sensing read on the normal only (roll and yaw confused), no mirror', { ...fly, organ: { ...flyOrgan, mirror: false, senseMode: { frequency: '600 Hz', quality: 9, mass: '6 ug' } }, sensor: { integration: '20 ms' } }],
    ['mems-sensing without mirror', { ...mems, organ: { ...memsOrgan, mirror: false } }],
  ];

  it.each(variants)('write the organs and the pair byte for byte as JSON.stringify: %s', (_name, doc) => {
    const r = sensing(doc);
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    const organs = SENSING_WRITERS.organs as (v: unknown) => string, pair = SENSING_WRITERS.pair as (v: unknown) => string;
    expect(organs(r.answer.organs)).toBe(JSON.stringify(r.answer.organs));
    expect(pair(r.answer.pair)).toBe(JSON.stringify(r.answer.pair));
    const o: Record<string, unknown> = { version: '0.0.0', inputHash: '0123456789abcdef', ...(r.answer as object) };
    expect(jsonBytes(o, SENSING_WRITERS).equals(Buffer.from(JSON.stringify(o)))).toBe(true);
  });

  it('the variants reach the optional parts (strain and sense-mode tables and series, confusions)', () => {
    const seen = new Set<string>();
    for (const [, doc] of variants) {
      const r = sensing(doc);
      if (!r.ok) throw new Error(JSON.stringify(r.issues));
      for (const o of r.answer.organs) {
        if (o.strain?.harmonics) seen.add('strain lines');
        if (o.strain?.series) seen.add('strain series');
        if (o.senseMode?.perUnitRate) seen.add('sense-mode lines');
        if (o.senseMode?.series) seen.add('sense-mode series');
      }
      if (r.answer.pair.confusions.length > 0) seen.add('confusions');
      if (r.answer.organs.length === 1) seen.add('single organ');
    }
    expect([...seen].sort()).toEqual(['confusions', 'sense-mode lines', 'sense-mode series', 'single organ', 'strain lines', 'strain series']);
  });

  it('fall back to JSON.stringify where the compiled writer throws (NaN) and write what JSON.stringify writes', () => {
    const write = memberWriter(z.strictObject({ a: z.number(), b: z.array(z.number()) }));
    expect(write({ a: 1.5, b: [0.1, -0] })).toBe(JSON.stringify({ a: 1.5, b: [0.1, -0] }));
    expect(write({ a: NaN, b: [Infinity] })).toBe('{"a":null,"b":[null]}');
  });
});

