/**
 * Harmonic lines (design §5). One convention for the whole project:
 *   x(t) = A_0 + Σ_{k≥1} A_k cos(kωt + ψ_k),  A_k ≥ 0,  ψ_k ∈ (−π, π], t = 0 at the waveform origin.
 * Internally a line is the pair (p_k, q_k) of x = Σ p_k cos kωt + q_k sin kωt; then
 * A_k = √(p_k² + q_k²), ψ_k = atan2(−q_k, p_k). Order 0 carries the mean as amplitude |p_0|
 * with phase 0 (mean ≥ 0) or π (mean < 0).
 */
import { axesOf, COMPONENTS, N_AXES, N_COMPONENTS, TOTAL, type Axis, type Component } from './components.js';
import type { LoadSeries } from './loads.js';
import type { BeatTable } from './waveform.js';

/** p, q for component c, axis a, order k at [((c·6 + a)·(K+1) + k)·2 + {0,1}]. */
export interface HarmonicTable {
  orders: number; // K + 1
  pq: Float64Array;
}

export const allocHarmonics = (maxOrder: number): HarmonicTable => ({ orders: maxOrder + 1, pq: new Float64Array(N_COMPONENTS * N_AXES * (maxOrder + 1) * 2) });

/**
 * p_k, q_k of one beat (n samples from `start`, stride 1) for k = 0..K:
 * p_0 = (1/n) Σ x_j, p_k = (2/n) Σ x_j cos(2πkj/n), q_k = (2/n) Σ x_j sin(2πkj/n).
 */
export function fourier(x: Float64Array, start: number, n: number, table: BeatTable, maxOrder: number, out: Float64Array, outAt: number): void {
  const ct = table.cos, st = table.sin;
  let sum = 0;
  for (let j = 0; j < n; j++) sum += x[start + j] as number;
  out[outAt] = sum / n;
  out[outAt + 1] = 0;
  for (let k = 1; k <= maxOrder; k++) {
    let re = 0, im = 0, m = 0;
    for (let j = 0; j < n; j++) {
      const v = x[start + j] as number;
      re += v * (ct[m] as number);
      im += v * (st[m] as number);
      m += k;
      if (m >= n) m -= n;
    }
    out[outAt + 2 * k] = (2 * re) / n;
    out[outAt + 2 * k + 1] = (2 * im) / n;
  }
}

/**
 * Harmonics of every component and axis over the first beat of a load series (the steady state is
 * periodic, so one beat holds every line). The total is the sum of the components' lines (the DFT
 * is linear); a series that is identically zero is not transformed.
 */
export function loadHarmonics(series: LoadSeries, n: number, table: BeatTable, maxOrder: number, out: HarmonicTable): HarmonicTable {
  const K1 = maxOrder + 1;
  const pq = out.pq;
  pq.fill(0);
  for (let c = 0; c < TOTAL; c++) {
    for (let a = 0; a < N_AXES; a++) {
      const start = (c * N_AXES + a) * series.n;
      let nonzero = false;
      for (let j = 0; j < n; j++) if (series.data[start + j] !== 0) { nonzero = true; break; }
      if (!nonzero) continue;
      const at = (c * N_AXES + a) * K1 * 2;
      fourier(series.data, start, n, table, maxOrder, pq, at);
      const tot = (TOTAL * N_AXES + a) * K1 * 2;
      for (let i = 0; i < 2 * K1; i++) pq[tot + i] = (pq[tot + i] as number) + (pq[at + i] as number);
    }
  }
  return out;
}

export interface Line {
  component: Component;
  axis: Axis;
  order: number;
  /** Single-sided amplitude A_k ≥ 0 (N for loads). */
  amplitude: number;
  /** ψ_k in (−π, π] (rad), referred to t = 0. */
  phase: number;
}

/** Amplitude and phase of a (p, q) pair under the project's convention. */
export function amplitudePhase(p: number, q: number, order: number): { amplitude: number; phase: number } {
  if (order === 0) return { amplitude: Math.abs(p), phase: p < 0 ? Math.PI : 0 };
  const amplitude = Math.hypot(p, q);
  if (amplitude === 0) return { amplitude: 0, phase: 0 };
  let phase = Math.atan2(-q, p) + 0;
  if (phase <= -Math.PI) phase = Math.PI;
  return { amplitude, phase };
}

/** Flatten a table into lines, component by component, axis by axis, order by order. */
export function toLines(t: HarmonicTable, drive: 'rotary' | 'linear'): Line[] {
  const axes = axesOf(drive);
  const lines: Line[] = [];
  for (let c = 0; c < N_COMPONENTS; c++) {
    for (let a = 0; a < N_AXES; a++) {
      for (let k = 0; k < t.orders; k++) {
        const at = ((c * N_AXES + a) * t.orders + k) * 2;
        const { amplitude, phase } = amplitudePhase(t.pq[at] as number, t.pq[at + 1] as number, k);
        lines.push({ component: COMPONENTS[c] as Component, axis: axes[a] as Axis, order: k, amplitude, phase });
      }
    }
  }
  return lines;
}

/** Index of (component, axis, order) in a table's pq (the p value; q follows). */
export const lineIndex = (t: HarmonicTable, c: number, a: number, k: number): number => ((c * N_AXES + a) * t.orders + k) * 2;
