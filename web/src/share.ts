/**
 * The scenario in the address (`#s=` + base64url of the deflated JSON) and in local storage, so a
 * view can be shared and reloaded. View choices (axis, organ) ride along as plain parameters.
 */
import type { Doc } from './types.js';

const KEY = 'beatforce.bench.scenario';

const toB64url = (bytes: Uint8Array): string => {
  let s = '';
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(s).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
};

const fromB64url = (text: string): Uint8Array<ArrayBuffer> => {
  const s = atob(text.replace(/-/g, '+').replace(/_/g, '/'));
  const out = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) out[i] = s.charCodeAt(i);
  return out;
};

async function pipe(bytes: Uint8Array<ArrayBuffer>, stream: CompressionStream | DecompressionStream): Promise<Uint8Array<ArrayBuffer>> {
  const out = new Response(new Blob([bytes]).stream().pipeThrough(stream));
  return new Uint8Array(await out.arrayBuffer());
}

export async function encodeDoc(doc: Doc): Promise<string> {
  const raw = new TextEncoder().encode(JSON.stringify(doc));
  return toB64url(await pipe(raw, new CompressionStream('deflate-raw')));
}

export async function decodeDoc(text: string): Promise<Doc | undefined> {
  try {
    const bytes = await pipe(fromB64url(text), new DecompressionStream('deflate-raw'));
    const doc = JSON.parse(new TextDecoder().decode(bytes)) as unknown;
    return doc && typeof doc === 'object' && !Array.isArray(doc) ? (doc as Doc) : undefined;
  } catch {
    return undefined;
  }
}

export interface View {
  axis?: string;
  organ?: string;
}

/** Read `#s=…&axis=…&organ=…`. */
export async function readHash(): Promise<{ doc?: Doc; view: View }> {
  const params = new URLSearchParams(location.hash.replace(/^#/, ''));
  const s = params.get('s');
  const view: View = { axis: params.get('axis') ?? undefined, organ: params.get('organ') ?? undefined };
  return { doc: s ? await decodeDoc(s) : undefined, view };
}

export async function writeHash(doc: Doc, view: View): Promise<string> {
  const params = new URLSearchParams();
  params.set('s', await encodeDoc(doc));
  if (view.axis) params.set('axis', view.axis);
  if (view.organ) params.set('organ', view.organ);
  const hash = `#${params.toString()}`;
  if (location.hash !== hash) history.replaceState(null, '', hash);
  return hash;
}

export function saveLocal(doc: Doc): void {
  try {
    localStorage.setItem(KEY, JSON.stringify(doc));
  } catch {
    /* storage may be full or disabled; the address still holds the scenario */
  }
}

export function loadLocal(): Doc | undefined {
  try {
    const t = localStorage.getItem(KEY);
    const d = t ? (JSON.parse(t) as unknown) : undefined;
    return d && typeof d === 'object' && !Array.isArray(d) ? (d as Doc) : undefined;
  } catch {
    return undefined;
  }
}
