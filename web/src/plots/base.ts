/**
 * uPlot panels: creation, the stem path for spectra, log-axis ticks with SI prefixes, and a
 * registry that the end-to-end tests read (the data each plot was given, exactly).
 */
import uPlot from 'uplot';
import { eng } from '../format.js';

const registry = new Map<string, uPlot>();
const titles = new Map<string, string>();
const marks = new Map<string, Record<string, number | null>>();

/** Values marked on a plot outside its data (e.g. minimum rates), recorded for tests. */
export function setMarks(id: string, m: Record<string, number | null>): void {
  marks.set(id, m);
}

export interface PlotRecord {
  title: string;
  labels: string[];
  data: (number | null)[][];
  scales: Record<string, { min?: number; max?: number; distr?: number }>;
  marks?: Record<string, number | null>;
}

/** Every live plot's labels and data, as drawn (for tests and for the curious in the console). */
export function plotRecords(): Record<string, PlotRecord> {
  const out: Record<string, PlotRecord> = {};
  for (const [id, u] of registry) {
    out[id] = {
      title: titles.get(id) ?? id,
      labels: u.series.map((s) => String(s.label ?? '')),
      data: u.data.map((d) => Array.from(d as ArrayLike<number | null>)),
      ...(marks.has(id) ? { marks: marks.get(id) } : {}),
      scales: Object.fromEntries(Object.entries(u.scales).map(([k, s]) => [k, { min: s.min ?? undefined, max: s.max ?? undefined, distr: s.distr }])),
    };
  }
  return out;
}

/** Destroy the plots whose id starts with a prefix (a section about to redraw). */
export function dropPlots(prefix: string): void {
  for (const [id, u] of registry) {
    if (id.startsWith(prefix)) {
      u.destroy();
      registry.delete(id);
      titles.delete(id);
      marks.delete(id);
    }
  }
}

export function resizePlots(): void {
  for (const u of registry.values()) {
    const host = u.root.parentElement;
    if (!host) continue;
    const w = Math.max(160, Math.floor(host.clientWidth));
    if (Math.abs(w - u.width) > 2) u.setSize({ width: w, height: u.height });
  }
}

/** Make a plot inside `host` (its width follows the host's). */
export function plot(id: string, title: string, host: HTMLElement, opts: Omit<uPlot.Options, 'width'>, data: uPlot.AlignedData): uPlot {
  registry.get(id)?.destroy();
  const width = Math.max(160, Math.floor(host.clientWidth || 320));
  const u = new uPlot({ ...opts, width }, data, host);
  u.root.dataset.plot = id;
  registry.set(id, u);
  titles.set(id, title);
  return u;
}

/** Vertical stems from the bottom of the plot to each value (nulls skipped). */
export const stems: uPlot.Series.PathBuilder = (u, seriesIdx, idx0, idx1) => {
  const xs = u.data[0] as ArrayLike<number>;
  const ys = u.data[seriesIdx] as ArrayLike<number | null>;
  const scaleKey = u.series[seriesIdx]?.scale ?? 'y';
  const bottom = u.bbox.top + u.bbox.height;
  const path = new Path2D();
  for (let i = idx0; i <= idx1; i++) {
    const y = ys[i];
    if (y === null || y === undefined) continue;
    const cx = Math.round(u.valToPos(xs[i] as number, 'x', true)) + 0.5;
    path.moveTo(cx, bottom);
    path.lineTo(cx, u.valToPos(y, scaleKey, true));
  }
  return { stroke: path, fill: null, clip: null, flags: 0 };
};

/** Axis tick labels with SI prefixes ("10 nN"). */
export const engTicks = (unit: string) => (_u: uPlot, splits: number[]) => splits.map((v) => (v === null || v === undefined ? '' : eng(v, unit, 2)));

/** Log-axis labels at whole decades, thinned from the lowest one so that at most about five show. */
export const decadeTicks = (unit: string) => (_u: uPlot, splits: number[]) => {
  const decade = (v: number): number | undefined => {
    if (!(v > 0)) return undefined;
    const l = Math.log10(v);
    return Math.abs(l - Math.round(l)) < 1e-6 ? Math.round(l) : undefined;
  };
  const decades = splits.map(decade).filter((d): d is number => d !== undefined);
  const low = decades.length ? Math.min(...decades) : 0;
  const step = Math.max(1, Math.ceil((decades.length ? Math.max(...decades) - low : 0) / 4));
  return splits.map((v) => {
    const d = decade(v);
    return d !== undefined && (d - low) % step === 0 ? eng(v, unit, 1) : '';
  });
};

/** A log axis that labels decades itself (uPlot's own thinning would fight the labels). */
export const logAxis = (unit: string) => ({ values: decadeTicks(unit), filter: (_u: uPlot, splits: number[]) => splits });

/** A series whose largest magnitude is below this fraction of the largest of its kind is a numerical zero. */
export const NUMERICAL_ZERO = 1e-13;

export const AXIS_STYLE = {
  stroke: '#39424e',
  grid: { stroke: 'rgba(40, 52, 68, 0.09)', width: 1 },
  ticks: { stroke: 'rgba(40, 52, 68, 0.25)', width: 1, size: 4 },
  font: '11px system-ui, sans-serif',
  labelFont: '11px system-ui, sans-serif',
};

/** Component colours: the page's own palette; the Coriolis load is the one that stands out. */
export const COMPONENT_COLOURS: Record<string, string> = {
  primary: '#2f5d8a',
  centrifugal: '#3f8f6b',
  angularAcceleration: '#b7791f',
  coriolis: '#d1345b',
  translational: '#7a5ea8',
  gravity: '#5d6b78',
  total: '#1d2530',
};

export const COMPONENT_NAMES: Record<string, string> = {
  primary: 'primary (beat inertia)',
  centrifugal: 'centrifugal',
  angularAcceleration: 'angular acceleration',
  coriolis: 'Coriolis (rate-induced)',
  translational: 'translational',
  gravity: 'gravity',
  total: 'total',
};

export const COMPONENT_ORDER = ['primary', 'centrifugal', 'angularAcceleration', 'coriolis', 'translational', 'gravity', 'total'];
