/**
 * `npm run bench`: runs every suite listed in bench/suites.ts and prints, per case, the time per
 * evaluation (median of timed batches after a warm-up), evaluations per second, the target and
 * PASS/FAIL against it, and the ratio against a baseline measured in the same run.
 *
 * A suite is `{ name, run(ctx) }` returning rows; `measure()` below times a function. Speed targets
 * are checked here, never in unit tests. Usage: `npm run bench [-- NAME...]` runs only the suites
 * whose name contains one of the NAMEs.
 */
import { spawnSync } from 'node:child_process';
import { getHeapSpaceStatistics, setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';

export interface Timing {
  /** Median CPU seconds (user + system of this process) per evaluation over the timed batches. */
  perEval: number;
  /** Median wall-clock seconds per evaluation (equal to perEval on an idle machine). */
  wall: number;
  /** Fastest batch, CPU seconds per evaluation. */
  min: number;
  batches: number;
  iterations: number;
}

export interface BenchRow {
  /** The case, e.g. "fly-tilted-stroke · sampled". */
  name: string;
  /** CPU seconds per evaluation (median); absent for rows that report something else (`note`). */
  perEval?: number;
  /** Wall-clock seconds per evaluation (median), when measured. */
  wall?: number;
  /** Target in seconds per evaluation. */
  target?: number;
  /** What the ratio compares against, and its time per evaluation measured in this run. */
  baseline?: { name: string; perEval: number };
  /** Anything else worth printing (e.g. allocation per evaluation). */
  note?: string;
  /** For rows with no time: an explicit verdict (e.g. an allocation check). */
  pass?: boolean;
}

export interface BenchContext {
  measure: typeof measure;
  /** Python with NumPy, if available (for baselines written in NumPy); undefined otherwise. */
  python?: { run: (script: string, input: string) => { ok: boolean; stdout: string; stderr: string } };
  /** Bytes allocated per call of fn (young generation and array buffers; see `allocation`). */
  allocation: typeof allocation;
}

export interface Suite {
  name: string;
  run: (ctx: BenchContext) => BenchRow[] | Promise<BenchRow[]>;
}

const now = (): number => Number(process.hrtime.bigint()) / 1e9;
const cpu = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};
const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] as number;

/**
 * Time fn: warm up for `warmup` seconds, size a batch to last about `batch` seconds, then time
 * `batches` batches and return the median time per call, in CPU time of this process (so that
 * other work on a shared machine does not count) and in wall-clock time. The result of fn is kept
 * in a sink so that the optimiser cannot drop the work. (No collection is forced first: a forced
 * full collection was seen to make the engine collect more often for seconds afterwards.)
 */
export function measure(fn: () => unknown, opts: { warmup?: number; batch?: number; batches?: number } = {}): Timing {
  const { warmup = 0.3, batch = 0.03, batches = 21 } = opts;
  let sink: unknown;
  const start = now();
  let calls = 0;
  while (now() - start < warmup || calls < 5) {
    sink = fn();
    calls++;
  }
  const per = (now() - start) / calls;
  const iterations = Math.max(1, Math.round(batch / per));
  const cpuTimes: number[] = [];
  const wallTimes: number[] = [];
  for (let b = 0; b < batches; b++) {
    const w0 = now(), c0 = cpu();
    for (let i = 0; i < iterations; i++) sink = fn();
    cpuTimes.push((cpu() - c0) / iterations);
    wallTimes.push((now() - w0) / iterations);
  }
  keep(sink);
  return { perEval: median(cpuTimes), wall: median(wallTimes), min: Math.min(...cpuTimes), batches, iterations };
}

let kept: unknown;
const keep = (x: unknown): void => {
  kept = x;
};

let gcFn: (() => void) | undefined;
/** The engine's gc(), exposed at run time (no command-line flag needed). */
function forceGc(): void {
  if (!gcFn) {
    setFlagsFromString('--expose-gc');
    gcFn = runInNewContext('gc') as () => void;
  }
  gcFn();
}

/** Bytes in the young generation (new objects) plus array-buffer backing stores. */
function youngBytes(): number {
  let used = 0;
  for (const sp of getHeapSpaceStatistics()) if (sp.space_name === 'new_space' || sp.space_name === 'new_large_object_space') used += sp.space_used_size;
  return used + process.memoryUsage().arrayBuffers;
}

/**
 * Bytes allocated per call of fn: after a full collection, run `calls` calls and read how much the
 * young generation and the array buffers grew. Repeated `rounds` times; a round in which a
 * scavenge ran (the young generation shrank) is dropped; the median of the others is returned.
 * `collections` is 0 when the figure is valid, else the number of rounds (each saw a collection).
 */
export function allocation(fn: () => unknown, calls = 20, rounds = 15): { bytesPerCall: number; collections: number } {
  for (let i = 0; i < 2000; i++) keep(fn()); // past the optimising compiler's own allocations
  const per: number[] = [];
  for (let r = 0; r < rounds; r++) {
    forceGc();
    const before = youngBytes();
    for (let i = 0; i < calls; i++) keep(fn());
    const grown = youngBytes() - before;
    if (grown >= 0) per.push(grown / calls);
  }
  return per.length ? { bytesPerCall: median(per), collections: 0 } : { bytesPerCall: Number.NaN, collections: rounds };
}

function pythonWithNumpy(): BenchContext['python'] {
  const probe = spawnSync('python3', ['-c', 'import numpy; print(numpy.__version__)'], { encoding: 'utf8' });
  if (probe.status !== 0) return undefined;
  return {
    run: (script, input) => {
      const r = spawnSync('python3', [script], { input, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024, env: { ...process.env, OPENBLAS_NUM_THREADS: '1', OMP_NUM_THREADS: '1' } });
      return { ok: r.status === 0, stdout: r.stdout ?? '', stderr: r.stderr ?? String(r.error ?? '') };
    },
  };
}

const fmtTime = (s: number | undefined): string => {
  if (s === undefined) return '';
  if (s === 0) return '0';
  if (s < 1e-6) return `${(s * 1e9).toFixed(0)} ns`;
  if (s < 1e-3) return `${(s * 1e6).toFixed(2)} µs`;
  return `${(s * 1e3).toFixed(2)} ms`;
};
const fmtRate = (s: number | undefined): string => (s === undefined ? '' : Math.round(1 / s).toLocaleString('en-US'));

function table(rows: BenchRow[]): string {
  const head = ['case', 'CPU/eval', 'evals/s', 'wall/eval', 'target', 'verdict', 'baseline (same run, CPU)', 'speed-up'];
  const body = rows.map((r) => {
    const verdict = r.target !== undefined && r.perEval !== undefined ? (r.perEval <= r.target ? 'PASS' : 'FAIL') : r.pass === undefined ? '' : r.pass ? 'PASS' : 'FAIL';
    const base = r.baseline ? `${r.baseline.name} ${fmtTime(r.baseline.perEval)}` : '';
    const ratio = r.baseline && r.perEval ? `${(r.baseline.perEval / r.perEval).toFixed(1)}×` : '';
    return [r.name, fmtTime(r.perEval), fmtRate(r.perEval), fmtTime(r.wall), r.target === undefined ? '' : `≤ ${fmtTime(r.target)}`, verdict, base, ratio, r.note ?? ''];
  });
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => (b[i] ?? '').length)));
  const line = (cells: string[]) => cells.map((c, i) => (i < head.length ? c.padEnd(widths[i] as number) : c)).join('  ').trimEnd();
  return [line(head), line(widths.map((w) => '-'.repeat(w))), ...body.map(line)].join('\n');
}

export async function main(argv: readonly string[]): Promise<number> {
  const { SUITES } = await import('./suites.js');
  const chosen = argv.length ? SUITES.filter((s) => argv.some((a) => s.name.includes(a))) : SUITES;
  const python = pythonWithNumpy();
  const ctx: BenchContext = { measure, python, allocation };
  console.log(`beatforce bench · node ${process.version} · ${process.platform}/${process.arch} · load average ${(await import('node:os')).loadavg().map((x) => x.toFixed(2)).join(' ')}`);
  console.log('times: median of timed batches after a warm-up; CPU time of this process decides the verdict (wall time shown beside it)');
  if (!python) console.log('note: python3 with numpy not found; NumPy baselines are skipped');
  let failed = 0;
  for (const suite of chosen) {
    const rows = await suite.run(ctx);
    console.log(`\n## ${suite.name}\n${table(rows)}`);
    failed += rows.filter((r) => (r.target !== undefined && r.perEval !== undefined && r.perEval > r.target) || r.pass === false).length;
  }
  console.log(`\n${failed === 0 ? 'all targets met' : `${failed} target(s) missed`}`);
  keep(kept);
  return failed === 0 ? 0 : 1;
}

if (process.argv[1] && import.meta.url === new URL(`file://${process.argv[1]}`).href) {
  main(process.argv.slice(2)).then(
    (code) => {
      process.exitCode = code;
    },
    (e: unknown) => {
      console.error(e);
      process.exitCode = 2;
    },
  );
}
