/** Export: downloads (JSON, CSV) and the exact request as curl and as Python for a notebook. */
import { h } from './dom.js';
import type { Doc } from './types.js';

export function download(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = h('a', { href: url, download: name, hidden: true });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

const shellQuote = (s: string): string => `'${s.replace(/'/g, `'\\''`)}'`;

/** A curl line that posts the scenario to a route of this service. */
export function curlRequest(origin: string, route: string, doc: Doc): string {
  const body = JSON.stringify(doc);
  return [
    `curl -sS -X POST ${shellQuote(`${origin}/api/v1/${route}`)} \\`,
    `  -H 'content-type: application/json' \\`,
    `  --data-binary ${shellQuote(body)}`,
  ].join('\n');
}

/**
 * Python for a notebook through the project's client (examples/notebook_client.py, standard
 * library only): `call(base, path, body)` returns the parsed answer and the response headers.
 */
export function pythonRequest(origin: string, route: string, doc: Doc): string {
  const json = JSON.stringify(doc, null, 2).replace(/\\/g, '\\\\').replace(/"""/g, '\\"\\"\\"');
  return [
    '# needs examples/notebook_client.py on the path (or its `call` function pasted in a cell)',
    'import json',
    'from notebook_client import call',
    '',
    `BASE = ${JSON.stringify(origin)}`,
    `scenario = json.loads("""${json}""")`,
    '',
    `answer, headers = call(BASE, "/api/v1/${route}", scenario)`,
    'print(answer["version"], answer["inputHash"])',
  ].join('\n');
}
