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
    series.push({ label: `true ${ax}`, stroke: AXIS_COLOURS[ax], width: 2 });
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
  const series: uPlot.Series[] = [{ label: 'time (ms)' }];
  const data: number[][] = [t];
  let caption: string;
  let unit: string;
  if (organ.strain) {
    for (const [kind, leaf] of Object.entries(organ.strain)) {
      for (const { suffix, ys } of leafSeries(leaf)) {
        series.push({ label: `${STRAIN_NAMES[kind] ?? kind} strain${suffix}`, stroke: STRAIN_COLOURS[kind] ?? '#333', width: 1.3 });
        data.push(ys);
      }
    }
    const peak = a.peakStrain?.outOfPlane;
    caption = `strain at the stalk base, ${organ.side} organ${peak ? ` · peak out of plane ${eng(peak.value, 'ε')} at ${eng(peak.time, 's')} (beat ${peak.beat})` : ''}`;
    unit = 'ε';
  } else {
    const leaf = organ.loads.total?.[loadAxis];
    if (!leaf) return;
    for (const { suffix, ys } of leafSeries(leaf)) {
      series.push({ label: `total load, ${loadAxis}${suffix}`, stroke: '#1d2530', width: 1.2 });
      data.push(ys);
    }
    caption = `total load on the ${loadAxis} axis, ${organ.side} organ (no stalk: no strain)`;
    unit = 'N';
  }
  const box = h('div', { class: 'plot-host' });
  host.append(h('figure', { class: 'panel' }, h('figcaption', {}, caption), box));
  plot('turn-trace', caption, box, {
    height: 230,
    scales: { x: { time: false } },
    legend: { show: true, live: false },
    series,
    axes: [{ ...AXIS_STYLE, label: 'time (ms)', size: 34, labelSize: 14 }, { ...AXIS_STYLE, values: engTicks(unit), size: 62 }],
  }, data as uPlot.AlignedData);
}
