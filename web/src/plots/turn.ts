/**
 * A maneuver: the true body rates and the rates the pair estimates, beat by beat, and the strain
 * at the stalk base (or, without a stalk, the total load) across the whole turn. Plain arrays from
 * the turn answer; decimated series may come as per-beat envelopes (min and max).
 */
import type uPlot from 'uplot';
import { h } from '../dom.js';
import { eng, RAD_TO_DEG } from '../format.js';
import { AXIS_STYLE, dropPlots, engTicks, plot } from './base.js';

type RateAxis = 'roll' | 'pitch' | 'yaw';
type Rates = Record<RateAxis, number>;
type Leaf = number[] | { min: number[]; max: number[] };
interface Peak { value: number; time: number; beat: number }

export interface TurnAnswer {
  version?: string;
  run?: { duration: number; beats: number; pointsPerBeat: number; samples: number };
  readout?: { window?: { beats: number; time: number }; conditionNumber?: number | null; confusions?: string[] };
  beats: { time: number; trueRate: Rates; estimatedRate: Record<RateAxis, number | null> }[];
  lag?: Record<RateAxis, number | null>;
  peakStrain?: Record<string, Peak & { side?: string }>;
  series?: {
    time: number[];
    organs: { side: string; role: string; loads: Record<string, Record<string, Leaf>>; strain?: Record<string, Leaf> }[];
  };
}

const RATE_AXES: RateAxis[] = ['roll', 'pitch', 'yaw'];
const AXIS_COLOURS: Record<RateAxis, string> = { roll: '#3f8f6b', pitch: '#7a5ea8', yaw: '#d1345b' };
const STRAIN_COLOURS: Record<string, string> = { outOfPlane: '#d1345b', inPlane: '#2f5d8a', axial: '#8a6d1f' };
const STRAIN_NAMES: Record<string, string> = { outOfPlane: 'out of plane', inPlane: 'in plane', axial: 'axial' };

/** A leaf as one or two drawable arrays (an envelope gives its min and max). */
const leafSeries = (leaf: Leaf): { suffix: string; ys: number[] }[] => (Array.isArray(leaf) ? [{ suffix: '', ys: leaf }] : [{ suffix: ' (min per beat)', ys: leaf.min }, { suffix: ' (max per beat)', ys: leaf.max }]);

export function drawTurn(host: HTMLElement, note: HTMLElement, a: TurnAnswer | undefined, loadAxis: string, error?: string): void {
  dropPlots('turn-');
  host.replaceChildren();
  if (!a) {
    note.textContent = error ? `No turn answer: ${error}` : '';
    return;
  }
  drawRates(host, a);
  drawTrace(host, a, loadAxis);
  const lags = RATE_AXES.filter((ax) => typeof a.lag?.[ax] === 'number').map((ax) => `${ax} ${eng(a.lag?.[ax] as number, 's')}`);
  const win = a.readout?.window;
  note.textContent = [
    win ? `The estimate at each beat averages the last ${win.beats} beats (${eng(win.time, 's')}).` : '',
    lags.length ? `Lag of the estimate behind the true rate: ${lags.join(', ')}.` : '',
    a.readout?.confusions?.length ? `The pair cannot tell apart: ${a.readout.confusions.join('; ')}.` : '',
  ].filter(Boolean).join(' ');
}

function drawRates(host: HTMLElement, a: TurnAnswer): void {
  const t = a.beats.map((b) => b.time * 1e3);
  const series: uPlot.Series[] = [{ label: 'time (ms)' }];
  const data: (number | null)[][] = [t];
  for (const ax of RATE_AXES) {
    const tr = a.beats.map((b) => b.trueRate[ax] * RAD_TO_DEG);
    const es = a.beats.map((b) => { const v = b.estimatedRate[ax]; return v === null ? null : v * RAD_TO_DEG; });
    const moving = tr.some((v) => v !== 0) || es.some((v) => v !== null && Math.abs(v) > 1e-6 * Math.max(1, ...tr.map(Math.abs)));
    if (!moving) continue;
    series.push({ label: `true ${ax}`, stroke: AXIS_COLOURS[ax], width: 2, points: { show: false } });
    series.push({ label: `estimated ${ax}`, stroke: AXIS_COLOURS[ax], width: 1.4, dash: [5, 4], points: { show: true, size: 4, fill: '#fff' } } as uPlot.Series);
    data.push(tr, es);
  }
  const box = h('div', { class: 'plot-host' });
  host.append(h('figure', { class: 'panel' }, h('figcaption', {}, 'body rate per beat: true (solid) and estimated by the pair (dashed)'), box));
  plot('turn-rates', 'true and estimated rates per beat', box, {
    height: 230,
    scales: { x: { time: false } },
    legend: { show: true, live: false },
    series,
    axes: [{ ...AXIS_STYLE, label: 'time (ms)', size: 34, labelSize: 14 }, { ...AXIS_STYLE, label: 'rate (deg/s)', labelSize: 14, size: 56 }],
  }, data as uPlot.AlignedData);
}

function drawTrace(host: HTMLElement, a: TurnAnswer, loadAxis: string): void {
  const s = a.series;
  const organ = s?.organs.find((o) => o.role === 'specified') ?? s?.organs[0];
  if (!s || !organ) return;
  const t = s.time.map((x) => x * 1e3);
  // Each strain in its own panel: the rate-induced out-of-plane strain is far below the in-plane one.
  const traces: { id: string; caption: string; unit: string; colour: string; leaf: Leaf; name: string }[] = organ.strain
    ? ['outOfPlane', 'inPlane', 'axial'].filter((k) => organ.strain?.[k]).map((k) => {
      const peak = a.peakStrain?.[k];
      return {
        id: `turn-strain-${k}`, name: `${STRAIN_NAMES[k] ?? k} strain`, unit: 'ε', colour: STRAIN_COLOURS[k] ?? '#333', leaf: organ.strain?.[k] as Leaf,
        caption: `${STRAIN_NAMES[k] ?? k} strain at the stalk base, ${organ.side} organ${peak ? ` · peak ${eng(peak.value, 'ε')} at ${eng(peak.time, 's')} (beat ${peak.beat})` : ''}`,
      };
    })
    : organ.loads.total?.[loadAxis]
      ? [{ id: 'turn-load', name: `total load, ${loadAxis}`, unit: 'N', colour: '#1d2530', leaf: organ.loads.total[loadAxis] as Leaf, caption: `total load on the ${loadAxis} axis, ${organ.side} organ (no stalk, so no strain)` }]
      : [];
  for (const tr of traces) {
    const series: uPlot.Series[] = [{ label: 'time (ms)' }];
    const data: number[][] = [t];
    for (const { suffix, ys } of leafSeries(tr.leaf)) {
      series.push({ label: `${tr.name}${suffix}`, stroke: tr.colour, width: 1.2, points: { show: false } });
      data.push(ys);
    }
    const box = h('div', { class: 'plot-host' });
    host.append(h('figure', { class: 'panel' }, h('figcaption', {}, tr.caption), box));
    plot(tr.id, tr.caption, box, {
      height: 150,
      scales: { x: { time: false } },
      legend: { show: false },
      series,
      axes: [{ ...AXIS_STYLE, label: 'time (ms)', size: 34, labelSize: 14 }, { ...AXIS_STYLE, values: engTicks(tr.unit), size: 62 }],
    }, data as uPlot.AlignedData);
  }
}
