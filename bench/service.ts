/**
 * The service's speed (issue 5), with autocannon against a server on 127.0.0.1 started in this
 * process (logger off, as `npm start` runs it):
 *   - GET /health and POST /api/v1/sensing (a shipped example), 32 connections, in the same run:
 *     sensing at ≥ 0.3 × the health rate, p99 latency < 20 ms;
 *   - POST /api/v1/forces for the default example (for reference);
 *   - a 10,000-point rate sweep end to end over HTTP (fetch, JSON answer): < 100 ms (median).
 * autocannon runs in a worker thread, so the client does not share the server's event loop.
 */
import { existsSync, readFileSync } from 'node:fs';
import autocannon from 'autocannon';
import { buildApp } from '../server/app.js';
import type { BenchRow, Suite } from './run.js';

const CONNECTIONS = 32;
const SECONDS = Number(process.env.BENCH_SERVICE_SECONDS ?? 5);
const RATIO_TARGET = 0.3;
const P99_TARGET_MS = 20;
const SWEEP_TARGET = 0.1;

function root(): URL {
  for (const up of ['../../', '../']) {
    const u = new URL(up, import.meta.url);
    if (existsSync(new URL('examples/fly-tilted-stroke.json', u))) return u;
  }
  throw new Error('examples/ not found');
}

const exampleText = (name: string): string => readFileSync(new URL(`examples/${name}.json`, root()), 'utf8');

interface Load {
  rate: number;
  p99: number;
  p50: number;
  errors: number;
  non2xx: number;
  requests: number;
}

async function load(url: string, opts: { method?: 'GET' | 'POST'; body?: string }): Promise<Load> {
  const r = await autocannon({
    url,
    connections: CONNECTIONS,
    duration: SECONDS,
    method: opts.method ?? 'GET',
    ...(opts.body ? { body: opts.body, headers: { 'content-type': 'application/json' } } : {}),
    workers: 1,
  });
  return { rate: r.requests.average, p99: r.latency.p99, p50: r.latency.p50, errors: r.errors + r.timeouts, non2xx: r.non2xx, requests: r.requests.total };
}

const describe = (l: Load): string => `${Math.round(l.rate).toLocaleString('en-US')} req/s, p50 ${l.p50} ms, p99 ${l.p99} ms, ${l.requests} requests, ${l.errors} errors, ${l.non2xx} non-2xx`;

/** Median wall time of a full HTTP round trip (request, compute, serialise, receive, JSON.parse). */
async function roundTrip(url: string, body: string, runs = 15): Promise<{ median: number; bytes: number; points: number }> {
  const times: number[] = [];
  let bytes = 0, points = 0;
  for (let i = 0; i < runs + 3; i++) {
    const t0 = performance.now();
    const res = await fetch(url, { method: 'POST', body, headers: { 'content-type': 'application/json' } });
    const text = await res.text();
    const json = JSON.parse(text) as { points?: number };
    const dt = (performance.now() - t0) / 1000;
    if (res.status !== 200) throw new Error(`sweep answered ${res.status}: ${text.slice(0, 300)}`);
    if (i >= 3) times.push(dt);
    bytes = text.length;
    points = json.points ?? 0;
  }
  times.sort((a, b) => a - b);
  return { median: times[Math.floor(times.length / 2)] as number, bytes, points };
}

export const serviceSuite: Suite = {
  name: 'service',
  async run() {
    const app = buildApp({ logger: false });
    await app.listen({ host: '127.0.0.1', port: 0 });
    const address = app.server.address();
    const base = typeof address === 'object' && address ? `http://127.0.0.1:${address.port}` : '';
    const rows: BenchRow[] = [];
    try {
      const sensingExample = ['fly-sensing', 'mems-sensing', 'fly-tilted-stroke'].find((n) => existsSync(new URL(`examples/${n}.json`, root()))) as string;
      const probe = await fetch(`${base}/api/v1/sensing`, { method: 'POST', body: exampleText(sensingExample), headers: { 'content-type': 'application/json' } });
      const hasSensing = probe.status === 200;
      await probe.text();

      const health = await load(`${base}/health`, {});
      rows.push({ name: `GET /health · ${CONNECTIONS} connections, ${SECONDS} s`, perEval: 1 / health.rate, note: describe(health), pass: health.errors === 0 && health.non2xx === 0 });
      if (hasSensing) {
        const sensing = await load(`${base}/api/v1/sensing`, { method: 'POST', body: exampleText(sensingExample) });
        const ratio = sensing.rate / health.rate;
        rows.push({
          name: `POST /api/v1/sensing (${sensingExample}) · rate vs health`,
          perEval: 1 / sensing.rate,
          target: 1 / (RATIO_TARGET * health.rate),
          baseline: { name: 'GET /health', perEval: 1 / health.rate },
          note: `${(ratio).toFixed(2)} of the health rate (target ≥ ${RATIO_TARGET}); ${describe(sensing)}`,
        });
        rows.push({ name: `POST /api/v1/sensing · p99 latency`, note: `p99 ${sensing.p99} ms (target < ${P99_TARGET_MS} ms); errors ${sensing.errors}, non-2xx ${sensing.non2xx}`, pass: sensing.p99 < P99_TARGET_MS && sensing.errors === 0 && sensing.non2xx === 0 });
      } else {
        rows.push({ name: 'POST /api/v1/sensing', note: `not measured: the route answered ${probe.status} (sensing is not wired into the service yet)`, pass: false });
      }
      const forcesBody = exampleText('fly-tilted-stroke');
      const forcesLoad = await load(`${base}/api/v1/forces`, { method: 'POST', body: forcesBody });
      rows.push({ name: 'POST /api/v1/forces (fly-tilted-stroke, series on) · reference', perEval: 1 / forcesLoad.rate, baseline: { name: 'GET /health', perEval: 1 / health.rate }, note: describe(forcesLoad), pass: forcesLoad.errors === 0 && forcesLoad.non2xx === 0 });

      const sweepBody = JSON.stringify({
        scenario: JSON.parse(forcesBody) as unknown,
        vary: [{ field: 'body.rate.yaw', from: '-2000 deg/s', to: '2000 deg/s', steps: 10_000 }],
        outputs: [{ line: { component: 'coriolis', axis: 'normal', order: 2 } }, { line: { component: 'total', axis: 'normal', order: 1, organ: 'mirror' }, value: 'phase' }],
      });
      const sweep = await roundTrip(`${base}/api/v1/sweep`, sweepBody);
      rows.push({ name: `POST /api/v1/sweep · ${sweep.points}-point rate sweep, end to end`, perEval: sweep.median, target: SWEEP_TARGET, note: `median of 15 round trips, ${(sweep.bytes / 1024).toFixed(0)} kB JSON` });
    } finally {
      await app.close();
    }
    return rows;
  },
};
