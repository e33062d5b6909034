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

/** Python (standard library only, as examples/notebook_client.py) that reruns the same request. */
export function pythonRequest(origin: string, route: string, doc: Doc): string {
  const json = JSON.stringify(doc, null, 2);
  return [
    'import json',
    'import urllib.request',
    '',
    `BASE = ${JSON.stringify(origin)}`,
    `scenario = json.loads(r"""${json.replace(/"""/g, '\\"\\"\\"')}""")`,
    '',
    `request = urllib.request.Request(BASE + "/api/v1/${route}", data=json.dumps(scenario).encode(),`,
    '                                 headers={"content-type": "application/json"}, method="POST")',
    'with urllib.request.urlopen(request) as response:',
    '    answer = json.load(response)',
    `print(answer["version"], answer.get("inputHash"))`,
  ].join('\n');
}
