/** The answers of `turn` as CSV tables: the beat-by-beat read-out, and the decimated series. */
import { toCsv, type Cell } from '../csv.js';
import { UNIT_TAG } from '../sensing/table.js';
import type { Leaf } from './series.js';
import type { TurnAnswer } from './turn.js';

const AXES = ['roll', 'pitch', 'yaw'] as const;

/** One row per beat: time, true and estimated rates, then each channel's in-phase output (in its quantity: N, strain or m). */
export function beatsCsv(a: TurnAnswer): string {
  const channels = a.readout.channels.map((c) => `inphase_${c.side}_${c.axis}_k${c.order}_${UNIT_TAG[c.quantity]}`);
  const header = ['beat', 'time_s', ...AXES.map((x) => `true_${x}_rad_s`), ...AXES.map((x) => `estimated_${x}_rad_s`), ...channels];
  const rows: Cell[][] = a.beats.map((r, b) => [b, r.time, ...AXES.map((x) => r.trueRate[x]), ...AXES.map((x) => r.estimatedRate[x]), ...r.inPhase]);
  return toCsv(header, rows);
}

/** Columns of a series: one per leaf (samples) or two (min, max) per leaf (envelopes). */
function columns(name: string, unit: string, leaf: Leaf, header: string[], cols: number[][]): void {
  if (Array.isArray(leaf)) {
    header.push(`${name}_${unit}`);
    cols.push(leaf);
  } else {
    header.push(`${name}_min_${unit}`, `${name}_max_${unit}`);
    cols.push(leaf.min, leaf.max);
  }
}

/** One row per kept point (sample, or beat for envelopes); a column per series. */
export function turnSeriesCsv(a: TurnAnswer): string {
  const s = a.series;
  if (!s) return toCsv(['note'], [['no series: set output.series to true']]);
  const header: string[] = ['time_s'];
  const cols: number[][] = [s.time];
  for (const x of AXES) columns(`rate_${x}`, 'rad_s', s.rate[x], header, cols);
  for (const x of AXES) columns(`angular_acceleration_${x}`, 'rad_s2', s.angularAcceleration[x], header, cols);
  for (const x of AXES) columns(`attitude_${x}`, 'rad', s.attitude[x], header, cols);
  for (const x of ['x', 'y', 'z'] as const) columns(`gravity_${x}`, 'm_s2', s.gravity[x], header, cols);
  for (const o of s.organs) {
    for (const [c, byAxis] of Object.entries(o.loads)) for (const [ax, leaf] of Object.entries(byAxis)) columns(`${o.side}_${c}_${ax}`, 'N', leaf as Leaf, header, cols);
    if (o.strain) for (const [k, leaf] of Object.entries(o.strain)) columns(`${o.side}_strain_${k}`, '1', leaf as Leaf, header, cols);
  }
  const rows: Cell[][] = s.time.map((_, i) => cols.map((c) => c[i]));
  return toCsv(header, rows);
}
