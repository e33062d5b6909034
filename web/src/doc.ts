/** Reading and writing a scenario document by path ("organ.hinge[0]" ↔ ['organ', 'hinge', 0]). */
import type { Doc, Json } from './types.js';

export type Path = readonly (string | number)[];

export const pathText = (p: Path): string =>
  p.reduce<string>((acc, k) => (typeof k === 'number' ? `${acc}[${k}]` : acc ? `${acc}.${k}` : k), '');

export function getAt(doc: Json | undefined, p: Path): Json | undefined {
  let cur: Json | undefined = doc;
  for (const k of p) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string | number, Json>)[k];
  }
  return cur;
}

/** Set (or, with `undefined`, delete) the value at a path, creating objects on the way; empty objects left behind are removed. */
export function setAt(doc: Doc, p: Path, value: Json | undefined): void {
  if (p.length === 0) return;
  const chain: Record<string | number, Json>[] = [];
  let cur = doc as Record<string | number, Json>;
  for (let i = 0; i < p.length - 1; i++) {
    const k = p[i] as string | number;
    let next = cur[k];
    if (next === null || typeof next !== 'object') {
      if (value === undefined) return;
      next = typeof p[i + 1] === 'number' ? [] : {};
      cur[k] = next;
    }
    chain.push(cur);
    cur = next as Record<string | number, Json>;
  }
  const last = p[p.length - 1] as string | number;
  if (value === undefined) {
    delete cur[last];
    for (let i = chain.length - 1; i >= 0; i--) {
      const parent = chain[i] as Record<string | number, Json>;
      const key = p[i] as string | number;
      const child = parent[key];
      if (child && typeof child === 'object' && !Array.isArray(child) && Object.keys(child).length === 0) delete parent[key];
      else break;
    }
  } else cur[last] = value;
}

export const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

/** Does an issue path (e.g. "organ.hinge[1]") fall under a field path (e.g. "organ.hinge")? */
export const under = (issuePath: string, fieldPath: string): boolean =>
  issuePath === fieldPath || issuePath.startsWith(`${fieldPath}.`) || issuePath.startsWith(`${fieldPath}[`);

/** JSON with one-space indents, but lists of plain numbers (or short quantities) kept on one line. */
export const pretty = (v: unknown): string =>
  JSON.stringify(v, null, 1).replace(/\[\s*((?:-?[\d.eE+-]+|"[^"\n]{0,16}")(?:,\s*(?:-?[\d.eE+-]+|"[^"\n]{0,16}"))*)\s*\]/g, (_m, inner: string) => `[${inner.replace(/,\n\s*/g, ', ')}]`); // JSON.stringify puts no newline inside a string
