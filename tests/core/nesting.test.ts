/**
 * Documents nested deeper than LIMITS.nesting are refused before anything walks them, through every
 * entry point of the library (and so of the command line and the service), however deep they go:
 * no document can exhaust the call stack. The walk itself is checked against an independent
 * recursive depth on random JSON (fast-check).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { forces, LIMITS, parseScenario, sensing, turn } from '../../src/index.js';
import { nestedTooDeep } from '../../src/limits.js';
import { sweep } from '../../src/sweep.js';

/** Levels of arrays and objects, by plain recursion (the document itself is level 1; a scalar 0). */
const depth = (v: unknown): number => (v === null || typeof v !== 'object' ? 0 : 1 + Math.max(0, ...Object.values(v).map(depth)));

const arrays = (levels: number): unknown => {
  let v: unknown = 1;
  for (let i = 0; i < levels; i++) v = [v];
  return v;
};
const objects = (levels: number, key = 'a'): unknown => {
  let v: unknown = 1;
  for (let i = 0; i < levels; i++) v = { [key]: v };
  return v;
};

const follow = (v: unknown, path: readonly (string | number)[]): unknown => path.reduce<unknown>((at, k) => (at as Record<string | number, unknown>)[k], v);

const organ = { mass: 6e-9, arm: 8.5e-4, frequency: 180, amplitude: 1, rest: [0, 1, 0], normal: [1, 0, 0] };

const refusal = (path: string, kind = 'a scenario document needs at most 7') => ({
  ok: false,
  issues: [{ path, message: `is at nesting level 33, over the limit of 32 levels of arrays and objects; ${kind}`, limit: 'nesting' }],
});

describe('nestedTooDeep', () => {
  it('agrees with a recursive depth on random JSON, and its path leads to a container one level too deep', () => {
    fc.assert(
      fc.property(fc.jsonValue({ maxDepth: 10 }), fc.integer({ min: 1, max: 10 }), (v, max) => {
        const path = nestedTooDeep(v, max);
        expect(path === undefined).toBe(depth(v) <= max);
        if (path) {
          expect(path.length).toBe(max); // the container at level max + 1
          const at = follow(v, path);
          expect(at !== null && typeof at === 'object').toBe(true);
        }
      }),
      { numRuns: 2000 },
    );
  });

  it('measures a document of any depth without the call stack', () => {
    expect(LIMITS.nesting).toBe(32);
    expect(nestedTooDeep(arrays(32))).toBeUndefined();
    expect(nestedTooDeep(arrays(33))).toEqual(Array.from({ length: 32 }, () => 0));
    expect(nestedTooDeep(arrays(100_000))?.length).toBe(32);
    expect(nestedTooDeep(objects(100_000))?.length).toBe(32);
    const cycle: Record<string, unknown> = { organ: {} };
    (cycle.organ as Record<string, unknown>).self = cycle;
    expect(nestedTooDeep(cycle)?.slice(0, 3)).toEqual(['organ', 'self', 'organ']);
  });
});

describe('documents nested too deep', () => {
  const deepArray = arrays(200_000);
  const deepInOrgan = { organ: { ...organ, extra: objects(200_000, 'x') } };

  it('are refused with the limit named, by every entry point', () => {
    for (const run of [parseScenario, forces, sensing, turn]) {
      expect(run(deepArray)).toEqual(refusal('[0][0][0][0][0][0][0][0]…'));
      expect(run(deepInOrgan)).toEqual(refusal('organ.extra.x.x.x.x.x.x…'));
    }
    expect(sweep(deepArray)).toEqual(refusal('[0][0][0][0][0][0][0][0]…', 'a sweep request needs at most 8'));
    expect(sweep({ scenario: deepInOrgan, vary: [{ field: 'body.rate.yaw', values: [1] }], outputs: [] })).toEqual(
      refusal('scenario.organ.extra.x.x.x.x.x…', 'a sweep request needs at most 8'),
    );
  });

  it('shows the first 8 steps of the path; a document within the limit gets its ordinary issues', () => {
    const doc = { organ: { ...organ, extra: arrays(31) } }; // levels: document, organ, extra's 31 arrays
    expect(forces(doc)).toEqual(refusal('organ.extra[0][0][0][0][0][0]…'));
    expect(forces({ organ: { ...organ, extra: arrays(30) } })).toEqual({
      ok: false,
      issues: [{ path: 'organ.extra', message: 'is not a field here; check the spelling against the scenario reference' }],
    });
    expect(parseScenario(objects(33))).toEqual(refusal('a.a.a.a.a.a.a.a…'));
  });

  it('a cyclic object from a library caller is refused, not followed forever', () => {
    const doc: Record<string, unknown> = { organ: { ...organ } };
    (doc.organ as Record<string, unknown>).stalk = doc;
    const r = forces(doc);
    expect(r.ok).toBe(false);
    expect(r.ok ? undefined : r.issues[0]?.limit).toBe('nesting');
  });
});
