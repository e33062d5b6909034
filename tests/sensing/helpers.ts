import { readFileSync } from 'node:fs';
import { compile, type Model } from '../../src/model.js';
import { parseScenario, type Scenario } from '../../src/scenario.js';
import { sensing, type SensingAnswer } from '../../src/sensing/sensing.js';

export const example = (name: string): Record<string, unknown> => JSON.parse(readFileSync(new URL(`../../examples/${name}.json`, import.meta.url), 'utf8'));

/** A deep copy of a document with fields merged in (objects merged one level per key path). */
export function withFields(doc: Record<string, unknown>, patch: Record<string, unknown>): Record<string, unknown> {
  const out = structuredClone(doc);
  for (const [k, v] of Object.entries(patch)) {
    const cur = out[k];
    out[k] = v !== null && typeof v === 'object' && !Array.isArray(v) && cur !== null && typeof cur === 'object' && !Array.isArray(cur) ? { ...(cur as object), ...(v as object) } : v;
  }
  return out;
}

export function answerOf(doc: unknown): SensingAnswer {
  const r = sensing(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.answer;
}

export function compiled(doc: unknown): { scenario: Scenario; model: Model } {
  const p = parseScenario(doc);
  if (!p.ok) throw new Error(JSON.stringify(p.issues));
  const c = compile(p.scenario);
  if (!c.ok) throw new Error(JSON.stringify(c.issues));
  return { scenario: p.scenario, model: c.model };
}

export const DEG = Math.PI / 180;
