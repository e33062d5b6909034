/**
 * server/start.ts as `npm start` runs it: listens on loopback, logs one line with the address,
 * serves the page and the API, and closes cleanly on SIGTERM and SIGINT; a bad PORT is refused.
 */
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { exampleText, PKG_VERSION, ROOT } from './helpers.js';

const cwd = fileURLToPath(ROOT);

interface Child {
  address: Promise<string>;
  exit: Promise<{ code: number | null; stdout: string; stderr: string }>;
  kill: (signal: NodeJS.Signals) => void;
}

/** Servers started by a test, so that one whose test failed before stopping it is not left running. */
const running = new Set<ReturnType<typeof spawn>>();
afterEach(() => {
  for (const child of running) child.kill('SIGKILL');
  running.clear();
});

function start(env: Record<string, string>): Child {
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/start.ts'], { cwd, env: { ...process.env, BEATFORCE_CORS_ORIGINS: '', ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '', stderr = '';
  let found: (a: string) => void = () => {};
  const address = new Promise<string>((resolve) => {
    found = resolve;
  });
  child.stdout.on('data', (d: Buffer) => {
    stdout += d.toString();
    const m = /listening on (http:\/\/[^\s]+)/.exec(stdout);
    if (m) found(m[1] as string);
  });
  child.stderr.on('data', (d: Buffer) => {
    stderr += d.toString();
  });
  running.add(child);
  const exit = new Promise<{ code: number | null; stdout: string; stderr: string }>((resolve) =>
    child.on('exit', (code) => {
      running.delete(child);
      resolve({ code, stdout, stderr });
    }),
  );
  return { address, exit, kill: (s) => child.kill(s) };
}

describe('server/start.ts', () => {
  // The SIGINT run also turns the answer store off (BEATFORCE_ANSWER_CACHE_MB=0).
  for (const [signal, cacheMb, marks] of [['SIGTERM', '', ['miss', 'hit']], ['SIGINT', '0', [null, null]]] as const) {
    it(`listens on 127.0.0.1 by default, logs one line, serves, and closes on ${signal}${cacheMb === '0' ? ' (no answer store)' : ''}`, async () => {
      const c = start({ PORT: '0', HOST: '', BEATFORCE_ANSWER_CACHE_MB: cacheMb });
      const base = await c.address;
      expect(base).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
      const health = await fetch(`${base}/health`);
      expect(await health.json()).toEqual({ status: 'ok', version: PKG_VERSION });
      const page = await fetch(`${base}/`);
      expect(page.status).toBe(200);
      expect(page.headers.get('content-type')).toBe('text/html; charset=utf-8');
      const seen: (string | null)[] = [];
      for (let i = 0; i < 2; i++) {
        const r = await fetch(`${base}/api/v1/forces`, { method: 'POST', body: exampleText('mems-tuning-fork'), headers: { 'content-type': 'application/json' } });
        expect(r.status).toBe(200);
        seen.push(r.headers.get('x-answer-cache'));
      }
      expect(seen).toEqual(marks);
      c.kill(signal);
      const { code, stdout, stderr } = await c.exit;
      expect(code).toBe(0);
      expect(stdout).toBe(`beatforce ${PKG_VERSION} listening on ${base} (page at /, API under /api/v1/)\nbeatforce: ${signal}, closed\n`);
      expect(stderr).toBe('');
    });
  }

  it('refuses a PORT that is not a port, with a message and exit code 1', async () => {
    const c = start({ PORT: 'eighty' });
    const { code, stderr } = await c.exit;
    expect(code).toBe(1);
    expect(stderr).toBe("beatforce: PORT 'eighty' is not a port; expected a whole number from 0 to 65535\n");
  });

  it('refuses an answer store size that is not a size', async () => {
    const c = start({ PORT: '0', BEATFORCE_ANSWER_CACHE_MB: '-5' });
    const { code, stderr } = await c.exit;
    expect(code).toBe(1);
    expect(stderr).toBe("beatforce: BEATFORCE_ANSWER_CACHE_MB '-5' is not a size; expected megabytes from 0 (no answer store) to 65536\n");
  });

  it('refuses a CORS allow-list entry that is not an origin', async () => {
    const c = start({ PORT: '0', BEATFORCE_CORS_ORIGINS: 'lab.example' });
    const { code, stderr } = await c.exit;
    expect(code).toBe(1);
    expect(stderr).toBe("beatforce: BEATFORCE_CORS_ORIGINS: CORS origin 'lab.example' is not an origin; expected scheme://host[:port], e.g. http://127.0.0.1:8888, or *\n");
  });
});
