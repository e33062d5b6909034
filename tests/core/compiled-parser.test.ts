/**
 * parseScenario switches to zod's compiled parser (z.compile) after a process's first few parses.
 * Whatever it is given, the compiled parser must answer exactly as the runtime parser of the same
 * schema: the same SI scenario for a valid document, the same issues for an invalid one. Checked on
 * every shipped example and on documents that change one field of an example to a value of another
 * kind (fast-check), which reach the refinements, transforms, unions and strict objects.
 */
import { readdirSync, readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseScenario, ScenarioSchema, scenarioParser, toIssues } from '../../src/scenario.js';

const dir = new URL('../../examples/', import.meta.url);
const examples = readdirSync(dir).filter((f) => f.endsWith('.json')).map((f) => JSON.parse(readFileSync(new URL(f, dir), 'utf8')) as Record<string, unknown>);

const outcome = (schema: typeof ScenarioSchema, doc: unknown) => {
  const r = schema.safeParse(doc);
  return r.success ? { ok: true, value: r.data } : { ok: false, issues: toIssues(r.error) };
};

const same = (doc: unknown): void => expect(outcome(scenarioParser(), doc)).toEqual(outcome(ScenarioSchema, doc));

/** Every path to a leaf (or an array) of a document, as keys. */
function paths(v: unknown, at: string[] = []): string[][] {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) return [at];
  return Object.entries(v as Record<string, unknown>).flatMap(([k, x]) => [at.concat(k), ...(x !== null && typeof x === 'object' && !Array.isArray(x) ? paths(x, at.concat(k)) : [])]);
}

function withValue(doc: Record<string, unknown>, path: string[], value: unknown): Record<string, unknown> {
  const copy = structuredClone(doc);
  let o = copy;
  for (const k of path.slice(0, -1)) o = o[k] as Record<string, unknown>;
  o[path[path.length - 1] as string] = value;
  return copy;
}

const oddValue = fc.oneof(
  fc.constantFrom(null, true, 0, -1, 1e300, '', '12 mV', '80 deg', '3 mm', '170 Hz', '200 deg/s', 'x', [], [0, 1], [0, 0, 0], {}, { beats: 0 }, { beats: 3 }),
  fc.double(),
  fc.string({ maxLength: 12 }),
);

describe('the compiled scenario parser answers as the runtime parser', () => {
  it('on every shipped example', () => {
    expect(examples.length).toBeGreaterThanOrEqual(6);
    for (const doc of examples) {
      const r = outcome(scenarioParser(), doc);
      expect(r.ok).toBe(true);
      same(doc);
    }
  });

  it('on examples with one field changed to a value of another kind (1,500 documents)', () => {
    const cases = examples.flatMap((doc) => paths(doc).filter((p) => p.length > 0).map((p) => [doc, p] as const));
    const seen = { accepted: 0, refused: 0 };
    fc.assert(
      fc.property(fc.integer({ min: 0, max: cases.length - 1 }), oddValue, (i, value) => {
        const [doc, path] = cases[i] as (typeof cases)[number];
        const changed = withValue(doc, path, value);
        same(changed);
        seen[outcome(ScenarioSchema, changed).ok ? 'accepted' : 'refused']++;
      }),
      { numRuns: 1500, seed: 20261201 },
    );
    // Both kinds of answer were compared, not only refusals.
    expect(seen.accepted).toBeGreaterThan(100);
    expect(seen.refused).toBeGreaterThan(500);
  });

  it('on documents that are not scenarios at all', () => {
    for (const doc of [undefined, null, 'organ', 42, [], {}, { organ: null }, { organ: [] }, { organ: {} }, { organ: { drive: 'linear' } }]) same(doc);
  });

  it('parseScenario itself goes over to the compiled parser and keeps answering the same', () => {
    const doc = examples[0] as Record<string, unknown>;
    const first = parseScenario(doc);
    for (let i = 0; i < 20; i++) expect(parseScenario(doc)).toEqual(first);
    const bad = withValue(doc, ['organ', 'mass'], '12 mV');
    const refused = outcome(ScenarioSchema, bad);
    for (let i = 0; i < 3; i++) expect(parseScenario(bad)).toEqual(refused);
  });
});
