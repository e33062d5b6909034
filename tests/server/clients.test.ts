/**
 * The shipped clients against a live server on a free port of 127.0.0.1: the Python notebook
 * client (standard library only) and the curl lines. Skipped, with a note, where python3 or curl
 * is not installed.
 */
import { execFile, spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../server/app.js';
import { sensing } from '../../src/index.js';
import { sweep } from '../../src/sweep.js';
import { example, PKG_VERSION, ROOT } from './helpers.js';

const run = promisify(execFile);
const available = (cmd: string): boolean => spawnSync(cmd, ['--version'], { stdio: 'ignore' }).status === 0;
const python = available('python3');
const curl = available('curl') && available('bash');
if (!python) console.warn('note: python3 not found; the notebook client test is skipped');
if (!curl) console.warn('note: curl or bash not found; the requests.sh test is skipped');

const file = (p: string): string => fileURLToPath(new URL(p, ROOT));

let app: FastifyInstance;
let base = '';
beforeAll(async () => {
  app = buildApp({ webRoot: null });
  await app.listen({ host: '127.0.0.1', port: 0 });
  const a = app.server.address();
  base = typeof a === 'object' && a ? `http://127.0.0.1:${a.port}` : '';
});
afterAll(async () => {
  await app.close();
});

describe('examples/notebook_client.py against a live server', () => {
  it.skipIf(!python)('runs a sweep and prints the table the service computes, the pair minimum rates, and a measured trace\'s verdict per axis', async () => {
    const { stdout } = await run('python3', [file('examples/notebook_client.py'), base], { timeout: 60_000, env: { ...process.env, BEATFORCE_URL: '' } });
    const lines = stdout.trimEnd().split('\n');
    expect(lines[0]).toBe(`beatforce ${PKG_VERSION} at ${base}`);
    expect(lines[1]).toMatch(/^sweep of body\.rate\.yaw, 11 points \(input hash [0-9a-f]{16}\)$/);
    expect(lines[2]?.trim().split(/\s+/)).toEqual(['body.rate.yaw_rad/s', 'right_coriolis_normal_k2_N', 'left_coriolis_normal_k2_N', 'right_total_normal_k1_phase_rad']);
    // The same sweep computed here: the printed numbers are the service's, digit for digit.
    const expected = sweep({
      scenario: example('fly-tilted-stroke'),
      vary: [{ field: 'body.rate.yaw', from: '-500 deg/s', to: '500 deg/s', steps: 11 }],
      outputs: [
        { line: { component: 'coriolis', axis: 'normal', order: 2, organ: 'specified' } },
        { line: { component: 'coriolis', axis: 'normal', order: 2, organ: 'mirror' } },
        { line: { component: 'total', axis: 'normal', order: 1 }, value: 'phase' },
      ],
    });
    if (!expected.ok) throw new Error(JSON.stringify(expected.issues));
    const printed = lines.slice(3, 14).map((l) => l.trim().split(/\s+/).map(Number));
    expect(printed).toEqual(expected.answer.rows);
    const s = sensing(example('fly-sensing'));
    if (!s.ok) throw new Error('fly-sensing invalid');
    expect(lines[14]).toMatch(/^pair minimum detectable rate \(rad\/s\), input hash [0-9a-f]{16}:$/);
    expect(lines.slice(15, 18)).toEqual((['roll', 'pitch', 'yaw'] as const).map((a) => `  ${a}: ${String(s.answer.pair[a].minimumRate)}`));
    // The measured trace on fly-sensing's stalk and readout: the verdict printed is the library's.
    const measured = { ...example('measured-stroke'), sensor: example('fly-sensing').sensor, output: { series: false } } as Record<string, unknown>;
    measured.organ = { ...(measured.organ as object), stalk: (example('fly-sensing').organ as Record<string, unknown>).stalk };
    const m = sensing(measured);
    if (!m.ok) throw new Error(JSON.stringify(m.issues));
    const organ = m.answer.organs[0];
    expect(lines[18]).toBe(`measured stroke, ${organ?.side} organ, strain at the stalk base (${m.answer.path} path):`);
    expect(lines.slice(19)).toEqual((['roll', 'pitch', 'yaw'] as const).map((ax) => {
      const a = organ?.axes[ax];
      const seen = a?.detectable === true ? 'detectable' : a?.detectable === false ? 'not detectable' : 'no rate about this axis';
      return `  ${ax}: ${seen}; ${a?.channel?.axis} line k=${a?.channel?.order} (${a?.channel?.frequency.toFixed(0)} Hz), signal ${((a?.signal ?? NaN) * 1e6).toFixed(4)} microstrain, SNR ${(a?.snr ?? NaN).toFixed(2)}`;
    }));
    expect(lines[21]).toMatch(/^ {2}yaw: detectable; normal line k=2 \(350 Hz\)/);
  });

  it.skipIf(!python)('exits with a clear message, no traceback, when the server is not there', async () => {
    const refused = await run('python3', [file('examples/notebook_client.py'), 'http://127.0.0.1:1'], { timeout: 30_000 }).then(
      () => ({ code: 0, stderr: '' }),
      (e: { code: number; stderr: string }) => e,
    );
    expect(refused.code).toBe(1);
    expect(refused.stderr).not.toMatch(/Traceback/);
    expect(refused.stderr).toMatch(/^cannot reach http:\/\/127\.0\.0\.1:1: .*; start the service with `npm start`/);
  });
});

describe('examples/requests.sh against a live server', () => {
  it.skipIf(!curl)('calls every route and prints each answer, ending with a refusal', async () => {
    const { stdout } = await run('bash', [file('examples/requests.sh'), base], { timeout: 60_000 });
    const text = stdout.replace(/\r/g, '');
    const titles = [...text.matchAll(/^== (.*)$/gm)].map((m) => m[1]);
    expect(titles).toEqual([
      'GET /health', 'GET /api/v1/examples', 'GET /api/v1/examples/fly-tilted-stroke', 'GET /api/v1/openapi.json',
      'POST /api/v1/forces', 'POST /api/v1/forces again: its headers', 'POST /api/v1/forces?format=csv', 'POST /api/v1/sensing (Accept: text/csv)', 'POST /api/v1/turn?format=csv',
      'POST /api/v1/sweep?format=csv', 'POST /api/v1/forces with an invalid scenario: HTTP 400',
    ]);
    const after = (title: string): string => text.split(`== ${title}\n`)[1]?.split('\n')[0] ?? '';
    expect(after('GET /health')).toBe(`{"status":"ok","version":"${PKG_VERSION}"}`);
    expect(after('GET /api/v1/openapi.json')).toMatch(/^\{"openapi":"3\.0\.3",/);
    expect(after('POST /api/v1/forces')).toMatch(/^\{"version":"[^"]+","inputHash":"[0-9a-f]{16}","path":"closed-form",/);
    const repeated = text.split('== POST /api/v1/forces again: its headers\n')[1]?.split('\n\n')[0]?.toLowerCase().split('\n') ?? [];
    expect(repeated).toEqual([expect.stringMatching(/^x-input-hash: [0-9a-f]{16}$/), 'x-answer-cache: hit']);
    expect(after('POST /api/v1/forces?format=csv')).toBe('side,role,component,axis,order,amplitude_N,phase_rad');
    expect(after('POST /api/v1/sensing (Accept: text/csv)')).toMatch(/^side,role,axis,channel_axis,order,frequency_Hz,/);
    expect(after('POST /api/v1/turn?format=csv')).toMatch(/^beat,time_s,true_roll_rad_s,/);
    expect(after('POST /api/v1/sweep?format=csv')).toBe('body.rate.yaw_rad/s,specified.coriolis.normal.2.amplitude_N');
    expect(after('POST /api/v1/forces with an invalid scenario: HTTP 400')).toMatch(/^\{"error":"invalid_scenario","message":"the scenario is invalid","issues":\[\{"path":"organ.mass","message":"'12 mV' is not a mass;/);
  });
});
