/**
 * The harmonic spectrum of each load component on one axis: stems on a log amplitude axis, the
 * rate-induced (Coriolis) lines drawn in their own colour and marked on the total as well.
 */
import type uPlot from 'uplot';
import { h } from '../dom.js';
import { eng } from '../format.js';
import type { ForcesAnswer, Line } from '../types.js';
import { AXIS_STYLE, COMPONENT_COLOURS, COMPONENT_NAMES, COMPONENT_ORDER, logAxis, dropPlots, NUMERICAL_ZERO as FLOOR, plot, stems } from './base.js';

export function drawSpectrum(host: HTMLElement, note: HTMLElement, a: ForcesAnswer, axis: string, role: string): void {
  dropPlots('spectrum-');
  host.replaceChildren();
  const organ = a.organs.find((o) => o.role === role) ?? a.organs[0];
  if (!organ) return;
  const lines = organ.harmonics.filter((l) => l.axis === axis);
  const K = a.scenario.sampling.harmonics;
  const orders = Array.from({ length: K + 1 }, (_, k) => k);
  const top = Math.max(0, ...organ.harmonics.map((l) => l.amplitude));
  const amps = (c: string): (number | null)[] => {
    const byOrder = new Map<number, Line>(lines.filter((l) => l.component === c).map((l) => [l.order, l]));
    return orders.map((k) => {
      const v = byOrder.get(k)?.amplitude ?? 0;
      return v > top * FLOOR && v > 0 ? v : null;
    });
  };
  const coriolis = amps('coriolis');
  const empty: string[] = [];
  for (const c of COMPONENT_ORDER) {
    const ys = amps(c);
    if (ys.every((v) => v === null)) {
      empty.push(COMPONENT_NAMES[c] ?? c);
      continue;
    }
    const colour = COMPONENT_COLOURS[c] ?? '#333';
    const box = h('div', { class: 'plot-host' });
    const largest = Math.max(...ys.map((v) => v ?? 0));
    host.append(h('figure', { class: `panel comp-${c}` }, h('figcaption', {}, h('span', { class: 'swatch', style: `background:${colour}` }), COMPONENT_NAMES[c] ?? c, h('span', { class: 'peak' }, ` largest ${eng(largest, 'N')}`)), box));
    const series: uPlot.Series[] = [
      { label: 'harmonic order' },
      { label: `${c} amplitude (N)`, stroke: colour, width: 2, paths: stems, points: { show: true, size: 6, fill: colour, stroke: colour } },
    ];
    const data: (number | null)[][] = [orders, ys];
    if (c === 'total' && coriolis.some((v) => v !== null)) {
      const mark = COMPONENT_COLOURS.coriolis ?? '#d1345b';
      series.push({ label: 'rate-induced (Coriolis) part', stroke: mark, width: 1, dash: [3, 3], paths: stems, points: { show: true, size: 8, fill: '#fff', stroke: mark, width: 2 } } as uPlot.Series);
      data.push(coriolis);
    }
    plot(`spectrum-${c}`, `${COMPONENT_NAMES[c] ?? c} spectrum, ${axis}`, box, {
      height: 150,
      scales: { x: { time: false, range: [-0.5, K + 0.5] }, y: { distr: 3, log: 10 } },
      legend: { show: false },
      cursor: { drag: { x: false, y: false } },
      series,
      axes: [
        { ...AXIS_STYLE, label: 'harmonic order k', size: 34, labelSize: 14, incrs: [1, 2, 4, 8, 16], values: (_u: uPlot, s: number[]) => s.map((v) => (Number.isInteger(v) ? String(v) : '')) },
        { ...AXIS_STYLE, ...logAxis('N'), size: 58 },
      ],
    }, data as uPlot.AlignedData);
  }
  note.textContent = `${organ.side} organ (${organ.role}); lines below 1e-13 of the largest are numerical zeros and not drawn.${empty.length ? ` No lines: ${empty.join(', ')}.` : ''} Open circles on the total mark the rate-induced lines.`;
}
