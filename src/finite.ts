/**
 * Answers hold finite numbers only. JSON has no Infinity or NaN (they would print as null, with no
 * word of why), so an answer that overflowed double precision is refused instead, naming the input
 * of most extreme magnitude (the likely cause) and the first member of the answer that is not
 * finite. Scenarios that a rate sensor can have stay many decades inside the range of a double;
 * only inputs such as a 1e200 rad/s turn or a 1e300 Hz beat reach it.
 */
import { show } from './quantity.js';
import type { Issue } from './scenario.js';
import { DIMENSIONS, toSI, type DimensionName } from './units.js';

export interface NonFinite {
  /** Where, e.g. "organs[0].harmonics[3].amplitude". */
  path: string;
  value: number;
}

/** True when some number in v (plain objects, arrays, typed arrays) is not finite; no allocation. */
function anyNonFinite(v: unknown): boolean {
  if (typeof v === 'number') return !Number.isFinite(v);
  if (v === null || typeof v !== 'object') return false;
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      const x: unknown = v[i];
      if (typeof x === 'number') {
        if (x - x !== 0) return true; // NaN or ±Infinity
      } else if (x !== null && typeof x === 'object' && anyNonFinite(x)) return true;
    }
    return false;
  }
  if (ArrayBuffer.isView(v)) {
    const a = v as unknown as ArrayLike<number>;
    for (let i = 0; i < a.length; i++) if ((a[i] as number) - (a[i] as number) !== 0) return true;
    return false;
  }
  for (const k in v) {
    const x = (v as Record<string, unknown>)[k];
    if (typeof x === 'number') {
      if (x - x !== 0) return true;
    } else if (x !== null && typeof x === 'object' && anyNonFinite(x)) return true;
  }
  return false;
}

/** The first number in an answer (plain objects, arrays, typed arrays) that is not finite, or undefined. */
export function firstNonFinite(v: unknown, at = ''): NonFinite | undefined {
  if (!anyNonFinite(v)) return undefined; // the common case, without building paths
  if (typeof v === 'number') return { path: at || '(answer)', value: v };
  if (ArrayBuffer.isView(v)) {
    const a = v as unknown as ArrayLike<number>;
    for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return { path: `${at}[${i}]`, value: a[i] as number };
    return undefined;
  }
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      const f = firstNonFinite(v[i], `${at}[${i}]`);
      if (f) return f;
    }
    return undefined;
  }
  for (const k of Object.keys(v as object)) {
    const f = firstNonFinite((v as Record<string, unknown>)[k], at ? `${at}.${k}` : k);
    if (f) return f;
  }
  return undefined;
}

const ANY_DIMENSION = Object.keys(DIMENSIONS) as DimensionName[];

/**
 * The quantities of a document (numbers, and unit strings in SI) with their paths as the document
 * spells them, most extreme decimal exponent first; zeros and text left out.
 */
export function extremeInputs(doc: unknown, count = 3): { path: string; shown: string; value: number }[] {
  const found: { path: string; shown: string; value: number; size: number }[] = [];
  const add = (at: string, shown: string, value: number): void => {
    if (value !== 0 && Number.isFinite(value)) found.push({ path: at, shown, value, size: Math.abs(Math.log10(Math.abs(value))) });
  };
  const walk = (v: unknown, at: string): void => {
    if (typeof v === 'number') add(at, String(v), v);
    else if (typeof v === 'string') {
      const q = v.length <= 60 ? toSI(v, ANY_DIMENSION) : undefined;
      if (q?.ok) add(at, show(v), q.value);
    } else if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${at}[${i}]`));
    else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, at ? `${at}.${k}` : k);
  };
  walk(doc, '');
  return found.sort((a, b) => b.size - a.size).slice(0, count).map(({ path, shown, value }) => ({ path, shown, value }));
}

/** The refusal of an answer that overflowed at `where` (the value `bad`), naming the inputs of `doc` most likely to blame. */
export function overflowIssue(doc: unknown, where: string, bad: number): Issue {
  const [first, ...next] = extremeInputs(doc);
  const also = next.length > 0 ? `; next in magnitude: ${next.map((x) => `${x.path} = ${x.shown}`).join(', ')}` : '';
  const what = `the answer overflows double precision (${where} is ${bad}); expected magnitudes that a rate sensor can have`;
  return first ? { path: first.path, message: `${first.shown} is the input of most extreme magnitude, and ${what}${also}` } : { path: '(document)', message: what };
}

/**
 * The result itself when every number of its answer is finite; the overflow refusal otherwise.
 * `input` is the document as given (paths as its author wrote them), or the parsed scenario.
 */
export function finiteAnswer<A>(input: unknown, r: { ok: true; answer: A }): { ok: true; answer: A } | { ok: false; issues: Issue[] } {
  const bad = firstNonFinite(r.answer);
  return bad ? { ok: false, issues: [overflowIssue(input, bad.path, bad.value)] } : r;
}
