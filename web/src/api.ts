/** The page's only contact with the physics: JSON requests to the service under /api/v1/. */
import type { Doc, Issue } from './types.js';

export type Reply<T> =
  /** kept: the service answered from its answer store (X-Answer-Cache: hit), not by computing. */
  | { ok: true; answer: T; ms: number; kept: boolean }
  | { ok: false; status: number; error: string; issues: Issue[]; ms: number }
  | { ok: false; status: 0; error: 'aborted'; issues: []; ms: number };

export const API = '/api/v1';

async function read<T>(res: Response, t0: number): Promise<Reply<T>> {
  const text = await res.text();
  let body: unknown;
  try {
    body = text ? JSON.parse(text) : undefined;
  } catch {
    body = undefined;
  }
  const ms = performance.now() - t0; // the whole round trip: request, answer, parse
  if (res.ok) return { ok: true, answer: body as T, ms, kept: res.headers.get('x-answer-cache') === 'hit' };
  const b = (body ?? {}) as { error?: unknown; message?: unknown; issues?: unknown };
  const issues = Array.isArray(b.issues) ? (b.issues as Issue[]).filter((i) => i && typeof i.path === 'string') : [];
  const error = typeof b.error === 'string' ? b.error : typeof b.message === 'string' ? b.message : `HTTP ${res.status}`;
  return { ok: false, status: res.status, error, issues, ms };
}

/** POST a scenario (or a sweep request) to a route; never throws, an abort is reported as such. */
export async function post<T>(route: string, doc: unknown, signal?: AbortSignal): Promise<Reply<T>> {
  const t0 = performance.now();
  try {
    const res = await fetch(`${API}/${route}`, { method: 'POST', headers: { 'content-type': 'application/json', accept: 'application/json' }, body: JSON.stringify(doc), signal });
    return await read<T>(res, t0);
  } catch (e) {
    if (signal?.aborted) return { ok: false, status: 0, error: 'aborted', issues: [], ms: performance.now() - t0 };
    return { ok: false, status: -1, error: `the service did not answer (${(e as Error).message})`, issues: [], ms: performance.now() - t0 };
  }
}

/** POST and take the answer as text in another format (CSV). */
export async function postText(route: string, doc: unknown, accept: string): Promise<{ ok: true; text: string } | { ok: false; error: string }> {
  try {
    const res = await fetch(`${API}/${route}${route.includes("?") ? "&" : "?"}format=csv`, { method: 'POST', headers: { 'content-type': 'application/json', accept }, body: JSON.stringify(doc) });
    const text = await res.text();
    return res.ok ? { ok: true, text } : { ok: false, error: `HTTP ${res.status}: ${text.slice(0, 300)}` };
  } catch (e) {
    return { ok: false, error: (e as Error).message };
  }
}

export async function get<T>(route: string): Promise<Reply<T>> {
  const t0 = performance.now();
  try {
    const res = await fetch(`${API}/${route}`, { headers: { accept: 'application/json' } });
    return await read<T>(res, t0);
  } catch (e) {
    return { ok: false, status: -1, error: `the service did not answer (${(e as Error).message})`, issues: [], ms: performance.now() - t0 };
  }
}

export type { Doc };
