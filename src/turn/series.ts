/**
 * Decimation of a turn's full-rate series (design §7: long outputs are decimated on request, never
 * silently truncated). Without `output.decimate` every sample is kept; `{ every: k }` keeps samples
 * 0, k, 2k, … (times exact, nothing averaged); `{ envelope: true }` keeps, for every beat, the
 * minimum and maximum of each series over that beat's samples, at the beat's centre time.
 */
import type { TurnPlan } from './run.js';
import type { Decimate } from './schema.js';

/** A decimated series: samples, or per-beat min/max envelopes. */
export type Leaf = number[] | { min: number[]; max: number[] };

export type Decimation = { kind: 'every'; every: number; kept: number } | { kind: 'envelope'; kept: number };

export function decimation(d: Decimate | undefined, plan: TurnPlan): Decimation {
  if (d && 'envelope' in d) return { kind: 'envelope', kept: plan.beats };
  const every = d?.every ?? 1;
  return { kind: 'every', every, kept: Math.ceil(plan.samples / every) };
}

/** The decimation as the answer states it. */
export const describeDecimation = (d: Decimation): { every: number } | { envelope: true } => (d.kind === 'every' ? { every: d.every } : { envelope: true });

/** Times (s) of the kept points: sample times, or beat centres for envelopes. */
export function keptTimes(d: Decimation, plan: TurnPlan): number[] {
  const out = new Array<number>(d.kept);
  if (d.kind === 'envelope') for (let b = 0; b < d.kept; b++) out[b] = (b + 0.5) / plan.frequency;
  else for (let i = 0; i < d.kept; i++) out[i] = i * d.every * plan.dt;
  return out;
}

/**
 * Decimate one series of plan.samples samples stored in beat blocks: sample j = b·n + i at
 * x[b·block + start + i] (block = n for a contiguous series, 42 n for a turn's loads).
 */
export function decimate(d: Decimation, plan: TurnPlan, x: Float64Array, start = 0, block = plan.pointsPerBeat): Leaf {
  const n = plan.pointsPerBeat;
  if (d.kind === 'every') {
    const out = new Array<number>(d.kept);
    for (let k = 0, j = 0; k < d.kept; k++, j += d.every) {
      const b = Math.floor(j / n);
      out[k] = x[b * block + start + (j - b * n)] as number;
    }
    return out;
  }
  const min = new Array<number>(d.kept), max = new Array<number>(d.kept);
  for (let b = 0; b < d.kept; b++) {
    let lo = Infinity, hi = -Infinity;
    const at = b * block + start;
    for (let j = at; j < at + n; j++) {
      const v = x[j] as number;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    min[b] = lo;
    max[b] = hi;
  }
  return { min, max };
}
