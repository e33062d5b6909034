/**
 * Fuzz: thousands of random and malformed documents (fast-check) on every compute route answer
 * only 200, 400 or 413 — never a 5xx — every refusal is in the error shape, every 400 names a
 * field (a path into the document, or "(document)" when the document itself is not an object),
 * and every 413 names its limit.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ERRORS } from '../../server/errors.js';
import { example, JSON_HEADERS, useApp } from './helpers.js';

const app = useApp();

const BASES = ['fly-tilted-stroke', 'mems-tuning-fork', 'measured-stroke', 'fly-sensing', 'mems-sensing', 'fly-saccade'].map(example);

const QUANTITIES = ['12 mV', '-3 deg', '1e400 Hz', 'NaN kg', '', 'µg', '5 GPa', '7 ug', '0.9 mm', '170 Hz', '80 deg', '200 deg/s', '1 N / sqrt(Hz)', '3 * 4', 'x'.repeat(120), '1 kg m', 'Infinity', '1e-300 m', '0 Hz', '-1 ug', 'sine', 'triangle', '10 rad', '1e6 deg/s', '__proto__', 'constructor'];

const leaf: fc.Arbitrary<unknown> = fc.oneof(
  fc.jsonValue({ maxDepth: 2 }),
  fc.constantFrom(...QUANTITIES),
  fc.double(),
  fc.integer({ min: -100_000, max: 100_000 }),
  fc.constantFrom(0, -1, 1, 2, 7, 8, 64, 65, 256, 8192, 8193, 65536, 1e308, -1e-308, 0.5),
  fc.constant(null),
  fc.array(fc.double(), { maxLength: 4 }),
);

type Path = (string | number)[];

function paths(v: unknown, at: Path = [], out: Path[] = []): Path[] {
  out.push(at);
  if (Array.isArray(v)) v.slice(0, 6).forEach((x, i) => paths(x, [...at, i], out));
  else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) paths(x, [...at, k], out);
  return out;
}

type Op = { kind: 'set'; path: number; value: unknown } | { kind: 'delete'; path: number } | { kind: 'junk'; path: number; key: string; value: unknown };

function mutate(doc: unknown, ops: Op[]): unknown {
  let d = structuredClone(doc);
  for (const op of ops) {
    const all = paths(d);
    const p = all[op.path % all.length] as Path;
    if (p.length === 0) {
      if (op.kind === 'set') d = op.value;
      continue;
    }
    let parent: unknown = d;
    for (const s of p.slice(0, -1)) parent = (parent as Record<string | number, unknown>)[s];
    const last = p[p.length - 1] as string | number;
    const container = parent as Record<string | number, unknown>;
    if (op.kind === 'set') container[last] = op.value;
    else if (op.kind === 'delete') {
      if (Array.isArray(container)) container.splice(last as number, 1);
      else delete container[last];
    } else {
      const target = container[last];
      if (target !== null && typeof target === 'object' && !Array.isArray(target)) (target as Record<string, unknown>)[op.key] = op.value;
    }
  }
  return d;
}

const op: fc.Arbitrary<Op> = fc.oneof(
  fc.record({ kind: fc.constant('set' as const), path: fc.nat(), value: leaf }),
  fc.record({ kind: fc.constant('delete' as const), path: fc.nat() }),
  fc.record({ kind: fc.constant('junk' as const), path: fc.nat(), key: fc.oneof(fc.string({ maxLength: 8 }), fc.constantFrom('mass', 'rate', 'drive', 'toString')), value: leaf }),
);

/** A mutated example, an example with a random subtree, or any JSON at all. */
const scenarioDoc: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 6, arbitrary: fc.tuple(fc.constantFrom(...BASES), fc.array(op, { minLength: 1, maxLength: 4 })).map(([b, ops]) => mutate(b, ops)) },
  { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 4 }) },
  { weight: 1, arbitrary: fc.record({ organ: fc.jsonValue({ maxDepth: 3 }), body: fc.option(fc.jsonValue({ maxDepth: 3 })), sampling: fc.option(fc.jsonValue({ maxDepth: 2 })) }, { requiredKeys: ['organ'] }) },
);

const sweepDoc: fc.Arbitrary<unknown> = fc.oneof(
  fc.record({
    scenario: scenarioDoc,
    vary: fc.oneof(
      fc.constant([{ field: 'body.rate.yaw', values: [0, 1] }]),
      fc.array(fc.record({ field: fc.constantFrom('body.rate.yaw', 'organ.mass', 'organ.amplitude', 'sampling.pointsPerBeat', 'nope', 'organ.hinge[1]'), values: fc.option(fc.array(leaf, { maxLength: 3 })), from: fc.option(leaf), to: fc.option(leaf), steps: fc.option(fc.integer({ min: -2, max: 20_000 })), spacing: fc.option(fc.constantFrom('linear', 'log', 'cubic')) }, { requiredKeys: ['field'] }), { maxLength: 3 }),
      fc.jsonValue({ maxDepth: 2 }),
    ),
    outputs: fc.oneof(
      fc.constant([{ line: { component: 'coriolis', axis: 'normal', order: 2 } }]),
      fc.array(fc.record({ line: fc.record({ component: fc.constantFrom('coriolis', 'total', 'nope'), axis: fc.constantFrom('x', 'normal', 'sense', 'q'), order: fc.oneof(fc.integer({ min: -1, max: 70 }), leaf), organ: fc.option(fc.constantFrom('specified', 'mirror', 'left')) }, { requiredKeys: ['component', 'axis', 'order'] }), value: fc.option(fc.constantFrom('amplitude', 'phase', 'power')) }, { requiredKeys: ['line'] }), { maxLength: 3 }),
      fc.jsonValue({ maxDepth: 2 }),
    ),
  }, { requiredKeys: [] }),
  fc.jsonValue({ maxDepth: 3 }),
);

const KNOWN = ['organ', 'body', 'sensor', 'sampling', 'output', 'name', 'description', 'scenario', 'vary', 'outputs'];

/** The path starts with a field of the document (or of the schema): it names where the problem is. */
function namesField(path: string, sent: Record<string, unknown>): boolean {
  const starts = (k: string) => path === k || path.startsWith(`${k}.`) || path.startsWith(`${k}[`);
  return [...KNOWN, ...Object.keys(sent)].some((k) => k !== '' && starts(k));
}

function check(status: number, body: string, sent: unknown, route: string): void {
  expect([200, 400, 413], `${route} ${status}: ${body.slice(0, 300)}`).toContain(status);
  if (status === 200) return;
  const b = JSON.parse(body) as { error: keyof typeof ERRORS; issues: { path: string; message: string; limit?: string }[]; limit?: string };
  expect(Object.keys(ERRORS)).toContain(b.error);
  expect(b.issues.length, body).toBeGreaterThan(0);
  for (const i of b.issues) {
    expect(typeof i.message).toBe('string');
    expect(i.message.length).toBeGreaterThan(0);
    expect(i.message).not.toMatch(/\n\s+at |Error:|undefined is not|Cannot read/);
    // The project's words, not the validator's defaults (which name a type but not the value).
    expect(i.message).not.toMatch(/^Invalid input|expected \w+, received /);
    const isObject = sent !== null && typeof sent === 'object' && !Array.isArray(sent);
    // An unknown key that is the empty string cannot be named by a dotted path.
    const emptyKey = isObject && Object.hasOwn(sent as object, '');
    // A "__proto__" key is refused by the JSON parser itself (invalid_json, the whole document).
    const poisoned = b.error === 'invalid_json' && i.path === '(document)' && /"__proto__"|"constructor"/.test(JSON.stringify(sent));
    if (status === 400 && isObject && !poisoned && !(emptyKey && i.path === '(document)')) expect(namesField(i.path, sent as Record<string, unknown>), `${route}: ${JSON.stringify(i)}`).toBe(true);
    else expect(i.path.length).toBeGreaterThan(0);
  }
  if (status === 413) expect(typeof b.limit).toBe('string');
}

describe('fuzz: random and malformed documents', () => {
  for (const [route, runs] of [['forces', 1000], ['sensing', 800], ['turn', 300]] as const) {
    it(`POST /api/v1/${route} answers 200, 400 or 413 for ${runs} random scenario documents`, async () => {
      await fc.assert(
        fc.asyncProperty(scenarioDoc, async (doc) => {
          const payload = JSON.stringify(doc) ?? 'null';
          const r = await app().inject({ method: 'POST', url: `/api/v1/${route}`, payload, headers: JSON_HEADERS });
          check(r.statusCode, r.body, JSON.parse(payload), route);
        }),
        { numRuns: runs },
      );
    });
  }

  it('POST /api/v1/sweep answers 200, 400 or 413 for 600 random sweep requests', async () => {
    await fc.assert(
      fc.asyncProperty(sweepDoc, async (doc) => {
        const payload = JSON.stringify(doc) ?? 'null';
        const r = await app().inject({ method: 'POST', url: '/api/v1/sweep', payload, headers: JSON_HEADERS });
        check(r.statusCode, r.body, JSON.parse(payload), 'sweep');
      }),
      { numRuns: 600 },
    );
  });

  it('answers 413 naming the nesting limit for 200 documents with a value nested up to 200,000 levels deep anywhere', async () => {
    const MARK = 'nested-value-goes-here';
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...BASES), fc.nat(), fc.integer({ min: 1, max: 200_000 }), fc.boolean(), fc.constantFrom('forces', 'sensing', 'turn', 'sweep'),
        async (base, at, levels, inArrays, route) => {
          const all = paths(base);
          const where = all[at % all.length] as Path; // the value there sits inside where.length containers
          const doc = mutate(base, [{ kind: 'set', path: at, value: MARK }]);
          const sent = route === 'sweep' ? { scenario: doc, vary: [{ field: 'body.rate.yaw', values: [0, 1] }], outputs: [{ line: { component: 'coriolis', axis: 'normal', order: 2 } }] } : doc;
          const deepest = where.length + levels + (route === 'sweep' ? 1 : 0);
          // Built as text: the serialiser, like any recursive walk, cannot take such a document.
          const payload = JSON.stringify(sent).replace(`"${MARK}"`, (inArrays ? '[' : '{"x":').repeat(levels) + '1' + (inArrays ? ']' : '}').repeat(levels));
          const r = await app().inject({ method: 'POST', url: `/api/v1/${route}`, payload, headers: JSON_HEADERS });
          if (deepest > 32) {
            expect(r.statusCode, `${route}, ${deepest} levels`).toBe(413);
            expect(r.json()).toMatchObject({ error: 'over_limit', limit: 'nesting', issues: [{ limit: 'nesting' }] });
          } else check(r.statusCode, r.body, JSON.parse(payload), route);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('answers 400 for 300 malformed JSON bodies (truncated, garbage, prototype keys)', async () => {
    const text = fc.oneof(
      fc.string({ maxLength: 40 }),
      fc.constantFrom(...BASES).map((b) => JSON.stringify(b)).chain((s) => fc.nat({ max: s.length - 2 }).map((n) => s.slice(0, n + 1))),
      fc.constantFrom('{"organ": {"__proto__": {"x": 1}}}', '{"constructor": {"prototype": {"x": 1}}}', '{"organ": NaN}', "{'organ': 1}", '{"organ": 1,}', '\u0000'),
    );
    await fc.assert(
      fc.asyncProperty(text, fc.constantFrom('/api/v1/forces', '/api/v1/sensing', '/api/v1/turn', '/api/v1/sweep'), async (payload, url) => {
        let parsed: unknown;
        let valid = true;
        try {
          parsed = JSON.parse(payload);
        } catch {
          valid = false;
        }
        const r = await app().inject({ method: 'POST', url, payload, headers: JSON_HEADERS });
        if (!valid) {
          expect(r.statusCode, payload).toBe(400);
          expect((r.json() as { error: string }).error).toBe('invalid_json');
        } else if (/"__proto__"|"constructor"/.test(payload)) {
          // Refused by the JSON parser (prototype poisoning) or by the schema (not a field here).
          expect(r.statusCode, payload).toBe(400);
          expect(['invalid_json', 'invalid_scenario', 'invalid_request']).toContain((r.json() as { error: string }).error);
        } else check(r.statusCode, r.body, parsed, url);
      }),
      { numRuns: 300 },
    );
  });
});
