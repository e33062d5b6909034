/**
 * The speed of sensing (issue 3):
 *
 *   fly-sensing / mems-sensing · closed form   sensingOf(scenario, model) on a compiled model, both
 *                organs, series off: the whole JSON-ready answer (target ≤ 50 µs each); baseline
 *                in the same run: the same answer by the sampled path (the core's loads per motion)
 *   from the document                          sensing(doc): parsing and compiling included (no target)
 *   rate sweep · 10,000 rates                  prepareSensing + rateSweep over 10,000 body rates, by
 *                the linearity of the Coriolis lines and the centrifugal quadratic form (target
 *                ≤ 20 ms); baseline: a fresh prepareSensing per rate, timed per rate × 10,000
 */
import { existsSync, readFileSync } from 'node:fs';
import { compile, type Model } from '../src/model.js';
import { parseScenario, type Scenario } from '../src/scenario.js';
import { prepareSensing, rateSweep, sensing, sensingOf } from '../src/sensing/sensing.js';
import type { BenchRow, Suite } from './run.js';

const ANSWER_TARGET = 50e-6;
const SWEEP_TARGET = 20e-3;
const SWEEP_RATES = 10_000;

function root(): URL {
  for (const up of ['../../', '../']) {
    const u = new URL(up, import.meta.url);
    if (existsSync(new URL('examples/fly-sensing.json', u))) return u;
  }
  throw new Error('examples/ not found');
}

function load(name: string): { doc: unknown; scenario: Scenario; model: Model } {
  const doc = JSON.parse(readFileSync(new URL(`examples/${name}.json`, root()), 'utf8')) as Record<string, unknown>;
  const p = parseScenario({ ...doc, output: { series: false } });
  if (!p.ok) throw new Error(JSON.stringify(p.issues));
  const c = compile(p.scenario);
  if (!c.ok) throw new Error(JSON.stringify(c.issues));
  return { doc, scenario: p.scenario, model: c.model };
}

export const sensingSuite: Suite = {
  name: 'sensing',
  run(ctx) {
    const rows: BenchRow[] = [];
    for (const name of ['fly-sensing', 'mems-sensing']) {
      const { doc, scenario, model } = load(name);
      const sampled: Scenario = { ...scenario, output: { ...scenario.output, path: 'sampled' } };
      // A longer warm-up: the first cases of a run otherwise include the optimising compiler's tiers.
      const fast = ctx.measure(() => sensingOf(scenario, model), { warmup: 1.5 });
      const slow = ctx.measure(() => sensingOf(sampled, model), { batches: 11 });
      const mem = ctx.allocation(() => sensingOf(scenario, model));
      rows.push({
        name: `${name} · closed form · both organs, series off`,
        perEval: fast.perEval,
        wall: fast.wall,
        target: ANSWER_TARGET,
        baseline: { name: 'sampled path', perEval: slow.perEval },
        note: Number.isFinite(mem.bytesPerCall) ? `${(mem.bytesPerCall / 1024).toFixed(1)} kB allocated per answer` : undefined,
      });
      const whole = ctx.measure(() => sensing(doc), { batches: 11 });
      rows.push({ name: `${name} · from the document (parse + compile + answer)`, perEval: whole.perEval, wall: whole.wall });
    }
    const { scenario, model } = load('fly-sensing');
    const rates = new Float64Array(3 * SWEEP_RATES);
    for (let i = 0; i < SWEEP_RATES; i++) {
      const t = i / SWEEP_RATES;
      rates[3 * i] = 5 * Math.sin(2 * Math.PI * 3 * t);
      rates[3 * i + 1] = 5 * Math.cos(2 * Math.PI * 5 * t);
      rates[3 * i + 2] = 20 * (2 * t - 1);
    }
    const sweep = ctx.measure(() => {
      const p = prepareSensing(scenario, model);
      if (!p.ok) throw new Error('prepare');
      return rateSweep(p.prepared, rates);
    }, { batch: 0.2, batches: 11 });
    let k = 0;
    const perRate = ctx.measure(() => {
      const at = { ...model, motion: { ...model.motion, omega: [rates[3 * k] as number, rates[3 * k + 1] as number, rates[3 * k + 2] as number] as [number, number, number] } };
      k = (k + 1) % SWEEP_RATES;
      return prepareSensing(scenario, at);
    }, { batches: 11 });
    rows.push({
      name: `rate sweep · ${SWEEP_RATES.toLocaleString('en-US')} rates, fly-sensing, both organs + pair estimate`,
      perEval: sweep.perEval,
      wall: sweep.wall,
      target: SWEEP_TARGET,
      baseline: { name: `prepareSensing per rate × ${SWEEP_RATES.toLocaleString('en-US')}`, perEval: perRate.perEval * SWEEP_RATES },
    });
    return rows;
  },
};
