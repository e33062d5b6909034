/**
 * The service's speed (issue 5), with autocannon against a server on 127.0.0.1 started in this
 * process (logger off, as `npm start` runs it):
 *   - GET /health and POST /api/v1/sensing (a shipped example), 32 connections, in the same run:
 *     sensing at ≥ 0.3 × the health rate, p99 latency < 20 ms. The example is re-sent byte for
 *     byte, so after the first request it is answered from the answer store (server/answers.ts),
 *     as a notebook re-running a cell is;
 *   - the same route with every answer computed (`Cache-Control: no-cache`), for reference: what
 *     a request the store has not seen costs;
 *   - the floor under any POST answer here, for reference: a bare fastify server in this process
 *     that parses the same request body and answers a constant buffer as long as the sensing
 *     answer, doing no other work;
 *   - POST /api/v1/forces for the default example, computed, for reference;
 *   - a 10,000-point rate sweep end to end over HTTP (fetch, JSON answer, computed): < 100 ms (median).
 *
 * Each measured run follows an unmeasured warm-up of the same route (BENCH_SERVICE_WARM_UP seconds,
 * default 2). autocannon runs as a child process, so this process's CPU time is the server's alone: each row
 * gives the wall-clock rate autocannon saw and the rate per CPU-second of the server (requests /
 * server CPU seconds). Like the rest of the bench, the verdict on rates uses CPU time, which other
 * work on a shared machine does not inflate; latency is wall-clock by nature and is shown with
 * the machine's load average.
 */
import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import Fastify from 'fastify';
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
const AUTOCANNON = createRequire(import.meta.url).resolve('autocannon/autocannon.js');

interface Load {
  /** Requests per wall-clock second (autocannon's average). */
  rate: number;
  /** Requests per CPU-second of the server (this process). */
  cpuRate: number;
  p50: number;
  p99: number;
  errors: number;
  non2xx: number;
  requests: number;
}

const cpuSeconds = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};

const WARM_UP_SECONDS = Number(process.env.BENCH_SERVICE_WARM_UP ?? 2);

interface LoadOptions {
  method?: 'GET' | 'POST';
  bodyFile?: string;
  /** Compute every answer: `Cache-Control: no-cache` (the answer store is not read). */
  fresh?: boolean;
}

function autocannon(url: string, seconds: number, opts: LoadOptions): Promise<string> {
  const args = [AUTOCANNON, '-j', '-c', String(CONNECTIONS), '-d', String(seconds), '-m', opts.method ?? 'GET'];
  if (opts.bodyFile) args.push('-i', opts.bodyFile, '-H', 'content-type=application/json');
  if (opts.fresh) args.push('-H', 'cache-control=no-cache');
  args.push(url);
  return new Promise<string>((resolve, reject) => {
    execFile(process.execPath, args, { maxBuffer: 16 * 1024 * 1024 }, (error, out) => (error ? reject(error) : resolve(out)));
  });
}

/**
 * One autocannon run in a child process; the server keeps this process's event loop to itself.
 * Each route is first driven for WARM_UP_SECONDS, unmeasured, as a long-running service is: the
 * first few hundred requests run cold code (compilation of the scenario parser, first unit
 * strings, the JIT), and with them in the sample the p99 measured the start-up, not the service.
 */
async function load(url: string, opts: LoadOptions = {}): Promise<Load> {
  if (WARM_UP_SECONDS > 0) await autocannon(url, WARM_UP_SECONDS, opts);
  const cpu0 = cpuSeconds();
  const stdout = await autocannon(url, SECONDS, opts);
  const cpu = cpuSeconds() - cpu0;
  const r = JSON.parse(stdout) as { requests: { average: number; total: number }; latency: { p50: number; p99: number }; errors: number; timeouts: number; non2xx: number };
  return { rate: r.requests.average, cpuRate: r.requests.total / cpu, p50: r.latency.p50, p99: r.latency.p99, errors: r.errors + r.timeouts, non2xx: r.non2xx, requests: r.requests.total };
}

const rate = (x: number): string => Math.round(x).toLocaleString('en-US');
const describe = (l: Load): string => `${rate(l.rate)} req/s wall, ${rate(l.cpuRate)} req per server CPU-s, p50 ${l.p50} ms, p99 ${l.p99} ms, ${l.requests} requests, ${l.errors} errors, ${l.non2xx} non-2xx`;

/** Median wall time of a full HTTP round trip (request, compute, serialise, receive, JSON.parse). */
async function roundTrip(url: string, body: string, runs = 15): Promise<{ median: number; cpu: number; bytes: number; points: number }> {
  const times: number[] = [];
  const cpus: number[] = [];
  let bytes = 0, points = 0;
  for (let i = 0; i < runs + 3; i++) {
    const t0 = performance.now();
    const c0 = cpuSeconds();
    const res = await fetch(url, { method: 'POST', body, headers: { 'content-type': 'application/json', 'cache-control': 'no-cache' } });
    const text = await res.text();
    const json = JSON.parse(text) as { points?: number };
    const dt = (performance.now() - t0) / 1000;
    const dc = cpuSeconds() - c0;
    if (res.status !== 200) throw new Error(`sweep answered ${res.status}: ${text.slice(0, 300)}`);
    if (res.headers.get('x-answer-cache') !== 'miss') throw new Error(`the sweep was not computed (x-answer-cache: ${res.headers.get('x-answer-cache')})`);
    if (i >= 3) {
      times.push(dt);
      cpus.push(dc);
    }
    bytes = text.length;
    points = json.points ?? 0;
  }
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] as number;
  return { median: median(times), cpu: median(cpus), bytes, points };
}

export const serviceSuite: Suite = {
  name: 'service',
  async run() {
    const app = buildApp({ logger: false });
    await app.listen({ host: '127.0.0.1', port: 0 });
    const address = app.server.address();
    const base = typeof address === 'object' && address ? `http://127.0.0.1:${address.port}` : '';
    const dir = mkdtempSync(join(tmpdir(), 'beatforce-bench-'));
    const rows: BenchRow[] = [];
    try {
      const sensingExample = 'fly-sensing';
      const sensingFile = join(dir, 'sensing.json');
      writeFileSync(sensingFile, exampleText(sensingExample));
      const forcesFile = join(dir, 'forces.json');
      writeFileSync(forcesFile, exampleText('fly-tilted-stroke'));

      const health = await load(`${base}/health`);
      rows.push({ name: `GET /health · ${CONNECTIONS} connections, ${SECONDS} s`, perEval: 1 / health.cpuRate, wall: 1 / health.rate, note: describe(health), pass: health.errors === 0 && health.non2xx === 0 });

      // The floor: the same request and an answer of the same length, with no work between them.
      // Measured before the sensing route, which leaves its heap to the collector.
      const sensingBytes = Buffer.from(await (await fetch(`${base}/api/v1/sensing`, { method: 'POST', body: exampleText(sensingExample), headers: { 'content-type': 'application/json', 'cache-control': 'no-store' } })).arrayBuffer());
      let floor: Load | undefined;
      const bare = Fastify({ logger: false });
      bare.post('/floor', (_request, reply) => {
        reply.type('application/json; charset=utf-8').send(sensingBytes);
      });
      await bare.listen({ host: '127.0.0.1', port: 0 });
      try {
        const bareAddress = bare.server.address();
        floor = await load(`http://127.0.0.1:${typeof bareAddress === 'object' && bareAddress ? bareAddress.port : 0}/floor`, { method: 'POST', bodyFile: sensingFile });
        rows.push({
          name: `POST floor: bare fastify, same body, constant ${(sensingBytes.length / 1024).toFixed(1)} kB answer · reference`,
          perEval: 1 / floor.cpuRate,
          wall: 1 / floor.rate,
          baseline: { name: 'GET /health', perEval: 1 / health.cpuRate },
          note: `${(floor.cpuRate / health.cpuRate).toFixed(2)} of the health rate per CPU-s; ${describe(floor)}`,
          pass: floor.errors === 0 && floor.non2xx === 0,
        });
      } finally {
        await bare.close();
      }

      const aboveFloor = (l: Load): string => (floor ? `${((1 / l.cpuRate - 1 / floor.cpuRate) * 1e6).toFixed(0)} µs CPU per request above the POST floor; ` : '');

      // Re-sent byte for byte: answered from the store after the first request. The store's own
      // count of hits says whether it was (every measured request must have been one).
      const store = app.answerCache;
      const hits0 = store?.hits ?? 0;
      const sensing = await load(`${base}/api/v1/sensing`, { method: 'POST', bodyFile: sensingFile });
      const stored = (store?.hits ?? 0) - hits0 >= sensing.requests;
      const ratio = sensing.cpuRate / health.cpuRate;
      rows.push({
        name: `POST /api/v1/sensing (${sensingExample}), re-sent: from the answer store · rate vs health`,
        perEval: 1 / sensing.cpuRate,
        wall: 1 / sensing.rate,
        target: 1 / (RATIO_TARGET * health.cpuRate),
        baseline: { name: 'GET /health', perEval: 1 / health.cpuRate },
        note: `${ratio.toFixed(2)} of the health rate per CPU-s, ${(sensing.rate / health.rate).toFixed(2)} wall (target ≥ ${RATIO_TARGET}); ${stored ? 'every measured request answered from the store' : 'NOT answered from the store (is it off?)'}; ${aboveFloor(sensing)}${describe(sensing)}`,
        pass: stored && ratio >= RATIO_TARGET && sensing.errors === 0 && sensing.non2xx === 0,
      });
      rows.push({
        name: 'POST /api/v1/sensing, re-sent · p99 latency (wall)',
        note: `p99 ${sensing.p99} ms (target < ${P99_TARGET_MS} ms) at load average ${loadavg()[0]?.toFixed(2)}; errors ${sensing.errors}, non-2xx ${sensing.non2xx}`,
        pass: sensing.p99 < P99_TARGET_MS && sensing.errors === 0 && sensing.non2xx === 0,
      });

      // The same route with every answer computed: what a document the store has not seen costs.
      const hits1 = store?.hits ?? 0;
      const computed = await load(`${base}/api/v1/sensing`, { method: 'POST', bodyFile: sensingFile, fresh: true });
      const uncounted = (store?.hits ?? 0) === hits1;
      rows.push({
        name: `POST /api/v1/sensing (${sensingExample}), every answer computed (Cache-Control: no-cache) · reference`,
        perEval: 1 / computed.cpuRate,
        wall: 1 / computed.rate,
        baseline: { name: 'GET /health', perEval: 1 / health.cpuRate },
        note: `${(computed.cpuRate / health.cpuRate).toFixed(2)} of the health rate per CPU-s, ${(computed.rate / health.rate).toFixed(2)} wall; ${uncounted ? 'no request answered from the store' : 'SOME ANSWERED FROM THE STORE'}; ${aboveFloor(computed)}${describe(computed)}`,
        pass: uncounted && computed.errors === 0 && computed.non2xx === 0,
      });

      const forces = await load(`${base}/api/v1/forces`, { method: 'POST', bodyFile: forcesFile, fresh: true });
      rows.push({ name: 'POST /api/v1/forces (fly-tilted-stroke, 384 kB answer), computed · reference', perEval: 1 / forces.cpuRate, wall: 1 / forces.rate, baseline: { name: 'GET /health', perEval: 1 / health.cpuRate }, note: describe(forces), pass: forces.errors === 0 && forces.non2xx === 0 });

      const sweepBody = JSON.stringify({
        scenario: JSON.parse(exampleText('fly-tilted-stroke')) as unknown,
        vary: [{ field: 'body.rate.yaw', from: '-2000 deg/s', to: '2000 deg/s', steps: 10_000 }],
        outputs: [{ line: { component: 'coriolis', axis: 'normal', order: 2 } }, { line: { component: 'total', axis: 'normal', order: 1, organ: 'mirror' }, value: 'phase' }],
      });
      const sweep = await roundTrip(`${base}/api/v1/sweep`, sweepBody);
      rows.push({ name: `POST /api/v1/sweep · ${sweep.points}-point rate sweep, end to end`, perEval: sweep.cpu, wall: sweep.median, target: SWEEP_TARGET, note: `median of 15 round trips (client and server in this process), ${(sweep.bytes / 1024).toFixed(0)} kB JSON` });
    } finally {
      await app.close();
      rmSync(dir, { recursive: true, force: true });
    }
    return rows;
  },
};
