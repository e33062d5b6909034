/** The answers of `forces` as CSV tables: harmonic lines, and load series. */
import { toCsv, type Cell } from './csv.js';
import type { ForcesAnswer } from './forces.js';

/** One row per organ, component, axis and order. */
export function harmonicsCsv(a: ForcesAnswer): string {
  const rows: Cell[][] = [];
  for (const o of a.organs) for (const l of o.harmonics) rows.push([o.side, o.role, l.component, l.axis, l.order, l.amplitude, l.phase]);
  return toCsv(['side', 'role', 'component', 'axis', 'order', 'amplitude_N', 'phase_rad'], rows);
}

/** One row per organ and sample; a column per component and axis. */
export function seriesCsv(a: ForcesAnswer): string {
  const first = a.organs.find((o) => o.series)?.series;
  if (!first) return toCsv(['note'], [['no series: set output.series to true']]);
  const keys: [string, string][] = [];
  for (const [c, byAxis] of Object.entries(first.loads)) for (const ax of Object.keys(byAxis)) keys.push([c, ax]);
  const strokeUnit = a.scenario.organ.drive === 'rotary' ? 'rad' : 'm';
  const header = ['side', 'role', 'time_s', `stroke_${strokeUnit}`, ...(first.deviation ? ['deviation_rad'] : []), ...keys.map(([c, ax]) => `${c}_${ax}_N`)];
  const rows: Cell[][] = [];
  for (const o of a.organs) {
    const s = o.series;
    if (!s) continue;
    for (let j = 0; j < s.time.length; j++) {
      const row: Cell[] = [o.side, o.role, s.time[j], s.stroke[j]];
      if (s.deviation) row.push(s.deviation[j]);
      for (const [c, ax] of keys) row.push((s.loads as Record<string, Record<string, number[]>>)[c]?.[ax]?.[j]);
      rows.push(row);
    }
  }
  return toCsv(header, rows);
}
