/**
 * Load components across one beat on one axis: a small panel per component, each with its own
 * vertical scale (the Coriolis load sits decades below the primary one), both organs overlaid.
 */
import type uPlot from 'uplot';
import { h } from '../dom.js';
import { eng } from '../format.js';
import type { ForcesAnswer } from '../types.js';
import { AXIS_STYLE, COMPONENT_COLOURS, COMPONENT_NAMES, COMPONENT_ORDER, dropPlots, engTicks, NUMERICAL_ZERO, plot } from './base.js';

const firstBeat = (xs: number[] | undefined, n: number): number[] => (xs ?? []).slice(0, n);

export function drawLoads(host: HTMLElement, note: HTMLElement, a: ForcesAnswer, axis: string, askForSeries?: () => void): void {
  dropPlots('loads-');
  host.replaceChildren();
  const n = a.scenario.sampling.pointsPerBeat;
  const spec = a.organs.find((o) => o.role === 'specified');
  const mirror = a.organs.find((o) => o.role === 'mirror');
  if (!spec?.series) {
    const button = h('button', { type: 'button', class: 'small', id: 'ask-series' }, 'Ask for the series');
    if (askForSeries) button.addEventListener('click', askForSeries);
    note.replaceChildren('This scenario asks for harmonic lines only (output.series is false), so there is no beat to draw. ', button);
    return;
  }
  const time = firstBeat(spec.series.time, n).map((t) => t * 1e3);
  const zero: string[] = [];
  const largest = Math.max(0, ...a.organs.flatMap((o) => Object.values(o.series?.loads ?? {}).flatMap((byAxis) => Object.values(byAxis).map((ys) => Math.max(...ys.slice(0, n).map(Math.abs))))));
  for (const c of COMPONENT_ORDER) {
    const ys = firstBeat(spec.series.loads[c]?.[axis], n);
    const ym = mirror?.series ? firstBeat(mirror.series.loads[c]?.[axis], n) : undefined;
    if (ys.length === 0) continue;
    const peak = Math.max(...ys.map(Math.abs), ...(ym ?? []).map(Math.abs));
    if (!(peak > largest * NUMERICAL_ZERO)) {
      zero.push(COMPONENT_NAMES[c] ?? c);
      continue;
    }
    const colour = COMPONENT_COLOURS[c] ?? '#333';
    const box = h('div', { class: 'plot-host' });
    const fig = h('figure', { class: `panel comp-${c}` }, h('figcaption', {}, h('span', { class: 'swatch', style: `background:${colour}` }), `${COMPONENT_NAMES[c] ?? c}`, h('span', { class: 'peak' }, ` peak ${eng(peak, 'N')}`)), box);
    host.append(fig);
    const series: uPlot.Series[] = [
      { label: 'time (ms)' },
      { label: `${spec.side} organ`, stroke: colour, width: 1.6, points: { show: false } },
    ];
    const data: (number | null)[][] = [time, ys];
    if (ym) {
      series.push({ label: `${mirror?.side ?? 'mirror'} organ (mirror)`, stroke: colour, width: 1.2, dash: [5, 4], alpha: 0.75, points: { show: false } } as uPlot.Series);
      data.push(ym);
    }
    plot(`loads-${c}`, `${COMPONENT_NAMES[c] ?? c}, ${axis}`, box, {
      height: 150,
      scales: { x: { time: false }, y: { auto: true } },
      legend: { show: false },
      cursor: { drag: { x: false, y: false } },
      series,
      axes: [
        { ...AXIS_STYLE, label: 'time in beat (ms)', size: 34, labelSize: 14 },
        { ...AXIS_STYLE, values: engTicks('N'), size: 58 },
      ],
    }, data as uPlot.AlignedData);
  }
  note.replaceChildren();
  note.textContent = zero.length ? `Zero on this axis (below 1e-13 of the largest load): ${zero.join(', ')}.` : '';
}
