/**
 * The speed of a turn (issue 4): examples/fly-saccade.json — a 200 ms maneuver at a 200 Hz beat,
 * 256 points per beat (10,240 samples), both organs, all components in both frames, stalk strain
 * and the beat-by-beat read-out — target ≤ 20 ms, with the series in a workspace allocated once.
 *
 *   core         turnNumbers(s, model, plan, channels, ws): rates, attitude, loads, strain and read-out
 *                into a workspace allocated before timing (target ≤ 20 ms)
 *   answer       turnOf(scenario) with series off: the JSON-ready answer (target ≤ 20 ms)
 *   decimated    turnOf(scenario) with the example's series every 16th sample (no target)
 * Baseline measured in the same run: the same loads written the way loads.ts's offsets suggest,
 * into one long strided series per component and axis instead of the beat-major blocks.
 * Allocation: bytes per core call with the workspace reused, against the series' own size.
 */
import { existsSync, readFileSync } from 'node:fs';
import { N_AXES, N_COMPONENTS } from '../src/components.js';
import { allocLoads, loads } from '../src/loads.js';
import { compile } from '../src/model.js';
import { parseScenario, type Scenario } from '../src/scenario.js';
import { allocTurn, runTurn } from '../src/turn/run.js';
import { channelsOf } from '../src/turn/channels.js';
import { planOf, turnNumbers, turnOf } from '../src/turn/turn.js';
import type { BenchRow, Suite } from './run.js';

const TARGET = 20e-3;

function root(): URL {
  for (const up of ['../../', '../']) {
    const u = new URL(up, import.meta.url);
    if (existsSync(new URL('examples/fly-saccade.json', u))) return u;
  }
  throw new Error('examples/ not found');
}

function scenario(): Scenario {
  const doc = JSON.parse(readFileSync(new URL('examples/fly-saccade.json', root()), 'utf8')) as unknown;
  const p = parseScenario(doc);
  if (!p.ok) throw new Error(JSON.stringify(p.issues));
  return p.scenario;
}

export const turnSuite: Suite = {
  name: 'turn',
  run(ctx) {
    const s = scenario();
    const quiet: Scenario = { ...s, output: { ...s.output, series: false } };
    const c = compile(s);
    if (!c.ok) throw new Error(JSON.stringify(c.issues));
    const model = c.model;
    const planned = planOf(s);
    if ('issues' in planned) throw new Error(JSON.stringify(planned.issues));
    const { plan } = planned;
    const ws = allocTurn(plan.samples, plan.pointsPerBeat);
    const chosen = channelsOf(s, model);
    if (!chosen.ok) throw new Error(JSON.stringify(chosen.issues));
    const channels = chosen.value;
    const label = `fly-saccade · ${plan.beats} beats × ${plan.pointsPerBeat} = ${plan.samples} samples, 2 organs`;

    const core = ctx.measure(() => turnNumbers(s, model, plan, channels, ws), { batch: 0.1, batches: 11 });
    const answer = ctx.measure(() => turnOf(quiet), { batch: 0.1, batches: 11 });
    const decimated = ctx.measure(() => turnOf(s), { batch: 0.1, batches: 11 });

    // Baseline: the loads of both organs into one long strided LoadSeries each (same kernel).
    const run = runTurn({ geometry: model.geometry, profile: turnNumbers(s, model, plan, channels, ws).profile, attitude: [1, 0, 0, 0], gravity: 9.80665, acceleration: [0, 0, 0], mirror: true }, plan, ws);
    const long = [allocLoads(plan.samples), allocLoads(plan.samples)];
    const n = plan.pointsPerBeat;
    const strided = ctx.measure(() => {
      for (let o = 0; o < 2; o++) {
        const motion = o === 0 ? run.motion : (run.mirrorMotion ?? run.motion);
        for (let b = 0; b < plan.beats; b++) loads(ws.kin, motion, model.geometry.mass, long[o] as ReturnType<typeof allocLoads>, b * n, b * n);
      }
      return long;
    }, { batch: 0.1, batches: 11 });
    const blocked = ctx.measure(() => {
      for (let o = 0; o < 2; o++) {
        const motion = o === 0 ? run.motion : (run.mirrorMotion ?? run.motion);
        const beats = ws.beatViews[o] ?? [];
        for (let b = 0; b < plan.beats; b++) loads(ws.kin, motion, model.geometry.mass, beats[b] as ReturnType<typeof allocLoads>, 0, b * n);
      }
      return ws;
    }, { batch: 0.1, batches: 11 });

    const seriesBytes = 2 * N_COMPONENTS * N_AXES * plan.samples * 8;
    const alloc = ctx.allocation(() => turnNumbers(s, model, plan, channels, ws), 20);
    const rows: BenchRow[] = [
      { name: `${label} · core (run + read-out, workspace reused)`, perEval: core.perEval, wall: core.wall, target: TARGET },
      { name: `${label} · turn answer, series off`, perEval: answer.perEval, wall: answer.wall, target: TARGET },
      { name: `${label} · turn answer, series every 16th sample`, perEval: decimated.perEval, wall: decimated.wall, note: 'no target: building the JSON-ready series' },
      { name: 'loads of both organs, beat-major blocks', perEval: blocked.perEval, wall: blocked.wall, baseline: { name: 'one long strided series', perEval: strided.perEval } },
      {
        name: 'allocation · core with the workspace reused',
        pass: alloc.collections === 0 ? alloc.bytesPerCall < 0.05 * seriesBytes : undefined,
        note: `${Math.round(alloc.bytesPerCall).toLocaleString('en-US')} B per call against ${seriesBytes.toLocaleString('en-US')} B of load series (must stay < 5%)${alloc.collections ? `; ${alloc.collections} GC ran, not judged` : ''}`,
      },
    ];
    return rows;
  },
};
