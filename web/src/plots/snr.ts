/**
 * Detection: signal-to-noise against body rate (log–log), one panel per body axis. The curves are
 * the service's sweep of the sensing answer's SNR over the body rate (each organ's best channel);
 * the marks are the sensing answer's smallest detectable rates, for one organ and for the pair
 * read together, and the detection threshold. Nothing is computed here beyond unit conversion.
 */
import type uPlot from 'uplot';
import { h } from '../dom.js';
import { eng, num, RAD_TO_DEG } from '../format.js';
import type { Doc } from '../types.js';
import { AXIS_STYLE, logAxis, dropPlots, plot, setMarks } from './base.js';

export const BODY_AXES = ['roll', 'pitch', 'yaw'] as const;
export type BodyAxis = (typeof BODY_AXES)[number];

export interface AxisSensing {
  channel: { axis: string; order: number; quantity?: string } | null;
  scaleFactor?: number;
  rate?: number;
  snr: number | null;
  minimumRate: number | null;
  detectable?: boolean | null;
  rateNoiseDensity?: number | null;
  angleRandomWalk?: number | null;
  noise?: { density: number; limitedBy: string } | null;
}

export interface SensingAnswer {
  version?: string;
  scenario?: { sensor?: { threshold?: number } };
  warnings?: string[];
  integration?: { time: number; beats: number };
  organs: { side: string; role: string; read?: { quantity: string; unit: string }; axes: Record<BodyAxis, AxisSensing> }[];
  pair?: Record<BodyAxis, { minimumRate: number | null; observable?: boolean; detectable?: boolean | null }> & { conditionNumber?: number | null };
}

export interface SweepAnswer {
  version?: string;
  columns: { name: string; unit: string; kind: string }[];
  rows: (number | null)[][];
  warnings?: string[];
}

/** Grid points per axis: SNR is close to a straight line on log–log axes, so a dozen points draw it. */
const STEPS = 13;

/** The rate span of an axis: from a thirtieth of the smallest detectable rate over five decades. */
function span(s: SensingAnswer, ax: BodyAxis): [number, number] | undefined {
  const mins = [s.pair?.[ax]?.minimumRate, ...s.organs.map((o) => o.axes[ax]?.minimumRate)].filter((v): v is number => typeof v === 'number' && v > 0 && Number.isFinite(v));
  if (!mins.length) return undefined;
  const lo = Math.min(...mins) / 30;
  return [lo, lo * 1e5];
}

/** One sweep request per body axis: that axis's rate over a log grid, each organ's SNR out. */
export function sweepRequests(doc: Doc, s: SensingAnswer): Partial<Record<BodyAxis, unknown>> {
  const out: Partial<Record<BodyAxis, unknown>> = {};
  for (const ax of BODY_AXES) {
    const range = span(s, ax);
    if (!range) continue;
    out[ax] = {
      scenario: doc,
      vary: [{ field: `body.rate.${ax}`, from: range[0], to: range[1], steps: STEPS, spacing: 'log' }],
      outputs: s.organs.map((o, i) => ({ sensing: `organs[${i}].axes.${ax}.snr`, name: `${o.role}_snr` })),
    };
  }
  return out;
}

const COLOURS = { specified: '#2f5d8a', mirror: '#6f9bc4', pair: '#d1345b', threshold: '#8a6d1f', scenario: '#1d2530' };

const rateText = (r: number | null | undefined): string => (typeof r === 'number' && Number.isFinite(r) ? eng(r * RAD_TO_DEG, 'deg/s') : 'not detectable');

export function drawDetection(host: HTMLElement, note: HTMLElement, sensing: SensingAnswer | undefined, sweeps: Partial<Record<BodyAxis, SweepAnswer>>, problems: string[], addNoise?: () => void): void {
  dropPlots('snr-');
  host.replaceChildren();
  if (!sensing) {
    note.textContent = problems.length ? `No sensing answer: ${problems.join('; ')}` : 'No sensing answer.';
    return;
  }
  const noisy = sensing.organs.some((o) => BODY_AXES.some((ax) => (o.axes[ax]?.noise?.density ?? 0) > 0));
  if (!noisy) {
    const button = h('button', { type: 'button', class: 'small', id: 'add-noise' }, 'Set a readout noise');
    if (addNoise) button.addEventListener('click', addNoise);
    note.replaceChildren('This scenario has no noise model (no sensor.readoutNoise and no organ.senseMode), so there is no signal-to-noise ratio to draw. ', button);
    return;
  }
  const threshold = sensing.scenario?.sensor?.threshold ?? 1;
  const spec = sensing.organs.find((o) => o.role === 'specified') ?? sensing.organs[0];
  for (const ax of BODY_AXES) {
    const one = spec?.axes[ax];
    const pairMin = sensing.pair?.[ax]?.minimumRate ?? null;
    const channel = one?.channel ? `${one.channel.axis} k = ${one.channel.order}` : 'no channel';
    const box = h('div', { class: 'plot-host' });
    host.append(h('figure', { class: `panel snr-${ax}` },
      h('figcaption', {}, `${ax}`, h('span', { class: 'peak' }, ` best line ${channel} · smallest rate: organ ${rateText(one?.minimumRate)}, pair ${rateText(pairMin)}`)),
      box));
    const sw = sweeps[ax];
    if (!sw) {
      box.append(h('p', { class: 'note' }, 'No curve: this axis has no detectable rate in this scenario.'));
      continue;
    }
    const rate = sw.rows.map((r) => (r[0] ?? NaN) * RAD_TO_DEG);
    const series: uPlot.Series[] = [{ label: `${ax} rate (deg/s)` }];
    const data: (number | null)[][] = [rate];
    sw.columns.forEach((c, i) => {
      if (i === 0) return;
      const role = c.name.replace(/_snr$/, '');
      const organ = sensing.organs.find((o) => o.role === role);
      series.push({ label: `${organ?.side ?? role} organ SNR`, stroke: role === 'mirror' ? COLOURS.mirror : COLOURS.specified, width: role === 'mirror' ? 1.2 : 1.8, dash: role === 'mirror' ? [4, 3] : undefined, points: { show: false } } as uPlot.Series);
      data.push(sw.rows.map((r) => { const v = r[i]; return typeof v === 'number' && v > 0 ? v : null; }));
    });
    series.push({ label: `threshold (SNR ${num(threshold)})`, stroke: COLOURS.threshold, width: 1, dash: [2, 3], points: { show: false } });
    data.push(rate.map(() => threshold));
    const marks = { organ: one?.minimumRate ?? null, pair: pairMin, scenario: one?.rate ? Math.abs(one.rate) : null };
    const id = `snr-${ax}`;
    plot(id, `SNR vs ${ax} rate`, box, {
      height: 180,
      scales: { x: { time: false, distr: 3, log: 10 }, y: { distr: 3, log: 10 } },
      legend: { show: false },
      series,
      hooks: { draw: [(u: uPlot) => drawMarks(u, marks)] },
      axes: [
        { ...AXIS_STYLE, label: `${ax} rate (deg/s)`, size: 34, labelSize: 14, ...logAxis('') },
        { ...AXIS_STYLE, ...logAxis(''), size: 46, label: 'SNR', labelSize: 14 },
      ],
    }, data as uPlot.AlignedData);
    setMarks(id, { organMinimumRate: marks.organ, pairMinimumRate: marks.pair, threshold });
  }
  const cond = sensing.pair?.conditionNumber;
  note.replaceChildren();
  note.textContent = [
    'Curves: each organ’s SNR on its best line as the rate about one axis varies (the service’s sweep). Vertical marks: the smallest detectable rate of one organ (blue) and of the pair read together (crimson); the dotted line marked “now” is this scenario’s rate.',
    typeof cond === 'number' ? `Pair condition number ${num(cond)}.` : '',
    ...problems,
  ].filter(Boolean).join(' ');
}

/** Vertical marks at the smallest detectable rates and the scenario's rate (rad/s → deg/s). */
function drawMarks(u: uPlot, marks: { organ: number | null; pair: number | null; scenario: number | null }): void {
  const ctx = u.ctx;
  const { top, height } = u.bbox;
  const px = devicePixelRatio || 1;
  const mark = (v: number | null, colour: string, label: string, dash: number[], row: number) => {
    if (!(typeof v === 'number' && v > 0)) return;
    const x = u.valToPos(v * RAD_TO_DEG, 'x', true);
    if (x < u.bbox.left || x > u.bbox.left + u.bbox.width) return;
    ctx.save();
    ctx.strokeStyle = colour;
    ctx.fillStyle = colour;
    ctx.lineWidth = 1.5 * px;
    ctx.setLineDash(dash.map((d) => d * px));
    ctx.beginPath();
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + height);
    ctx.stroke();
    ctx.font = `${10 * px}px system-ui, sans-serif`;
    ctx.fillText(label, x + 3 * px, top + (11 + 11 * row) * px);
    ctx.restore();
  };
  mark(marks.organ, COLOURS.specified, 'organ', [5, 3], 0);
  mark(marks.pair, COLOURS.pair, 'pair', [], 1);
  mark(marks.scenario, COLOURS.scenario, 'now', [1, 2], 2);
}
