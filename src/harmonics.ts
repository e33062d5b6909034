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

/**
 * Tables are carved out of shared 64 kB blocks (as Node's Buffer pool does): a fresh ArrayBuffer
 * per table made the engine run a full collection every few thousand evaluations, which cost more
 * than the closed form itself (about 10 µs a table amortised, against 0.5 µs from a block). A table
 * is a view (`pq.byteOffset` need not be 0) and keeps its block alive: to hold one for long, copy
 * it (`pq.slice()`). Larger tables (over 16 kB, i.e. more than 23 harmonics) get a buffer of their own.
 */
const BLOCK = 1 << 16;
let block = new ArrayBuffer(0);
let blockAt = 0;
function zeroedDoubles(n: number): Float64Array {
  const bytes = n * 8;
  if (bytes > BLOCK / 4) return new Float64Array(n);
  if (blockAt + bytes > block.byteLength) {
    block = new ArrayBuffer(BLOCK); // zero-filled; every byte is handed out once
    blockAt = 0;
  }
  const view = new Float64Array(block, blockAt, n);
  blockAt += bytes;
  return view;
}

export const allocHarmonics = (maxOrder: number): HarmonicTable => ({ orders: maxOrder + 1, pq: zeroedDoubles(N_COMPONENTS * N_AXES * (maxOrder + 1) * 2) });

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
 * cos and sin of 2πkj/n laid out order by order (k = 1..K, j = 0..n−1), copied from the beat table
 * so that every value is the table's own; cached per (n, K).
 */
interface OrderTable { n: number; K: number; cos: Float64Array; sin: Float64Array }
let orderTable: OrderTable | undefined;
function ordersOf(table: BeatTable, n: number, K: number): OrderTable {
  if (!orderTable || orderTable.n !== n || orderTable.K !== K || table.n !== n) {
    const cos = new Float64Array(K * n), sin = new Float64Array(K * n);
    for (let k = 1; k <= K; k++) {
      let m = 0;
      for (let j = 0; j < n; j++) {
        cos[(k - 1) * n + j] = table.cos[m] as number;
        sin[(k - 1) * n + j] = table.sin[m] as number;
        m += k;
        if (m >= n) m -= n * Math.floor(m / n);
      }
    }
    orderTable = { n, K, cos, sin };
  }
  return orderTable;
}

/** Work arrays of the folded transform (the core is synchronous; grown on demand). */
let fold = new Float64Array(0);
const edges = new Float64Array(18);

/**
 * The lines of `fourier`, with the symmetries of cos and sin folded in first. Pairing j with n − j
 * (S_j = x_j + x_{n−j}, D_j = x_j − x_{n−j}) leaves half the terms:
 *   p_k = (2/n) [x_0 + (−1)^k x_{n/2} + Σ_{0<j<n/2} S_j cos(2πkj/n)],  q_k = (2/n) Σ_{0<j<n/2} D_j sin(2πkj/n)
 * (x_{n/2} only for even n); for n = 4Q, pairing j with 2Q − j (cos → (−1)^k cos, sin → −(−1)^k sin)
 * leaves a quarter: S_j ± S_{2Q−j}, D_j ∓ D_{2Q−j} for 0 < j < Q, plus S_Q cos(πk/2) and D_Q sin(πk/2).
 * Same lines as the direct sums to rounding (fewer terms, so no less accurate).
 */
function fourierFolded(x: Float64Array, start: number, n: number, ot: OrderTable, maxOrder: number, out: Float64Array, outAt: number): void {
  let sum = 0;
  for (let j = 0; j < n; j++) sum += x[start + j] as number;
  out[outAt] = sum / n;
  out[outAt + 1] = 0;
  if (maxOrder === 0) return;
  const x0 = x[start] as number;
  const even = n % 2 === 0;
  const xh = even ? (x[start + n / 2] as number) : 0;
  const H = even ? n / 2 - 1 : (n - 1) / 2; // pairs (j, n − j), 0 < j ≤ H
  if (fold.length < 4 * (H + 1)) fold = new Float64Array(4 * (H + 1));
  const f = fold;
  const ct = ot.cos, st = ot.sin;
  if (n % 4 === 0) {
    const Q = n / 4;
    // f[j] = S_j + S_{2Q−j}, f[Q + j] = S_j − S_{2Q−j}, f[2Q + j] = D_j + D_{2Q−j}, f[3Q + j] = D_j − D_{2Q−j}
    for (let j = 1; j < Q; j++) {
      const a = x[start + j] as number, b = x[start + n - j] as number;
      const c = x[start + 2 * Q - j] as number, d = x[start + 2 * Q + j] as number; // x_{2Q−j}, x_{n−(2Q−j)}
      const Sj = a + b, Dj = a - b, Sm = c + d, Dm = c - d;
      f[j] = Sj + Sm; f[Q + j] = Sj - Sm; f[2 * Q + j] = Dj + Dm; f[3 * Q + j] = Dj - Dm;
    }
    const SQ = (x[start + Q] as number) + (x[start + 3 * Q] as number), DQ = (x[start + Q] as number) - (x[start + 3 * Q] as number);
    for (let k = 1; k <= maxOrder; k++) {
      const base = (k - 1) * n;
      const odd = (k & 1) === 1;
      const pa = odd ? Q : 0, qa = odd ? 2 * Q : 3 * Q; // odd k: S−, D+; even k: S+, D−
      let re = 0, im = 0;
      for (let j = 1; j < Q; j++) {
        re += (f[pa + j] as number) * (ct[base + j] as number);
        im += (f[qa + j] as number) * (st[base + j] as number);
      }
      const r4 = k & 3; // cos(πk/2), sin(πk/2) exactly
      re += x0 + (odd ? -xh : xh) + (r4 === 0 ? SQ : r4 === 2 ? -SQ : 0);
      im += r4 === 1 ? DQ : r4 === 3 ? -DQ : 0;
      out[outAt + 2 * k] = (2 * re) / n;
      out[outAt + 2 * k + 1] = (2 * im) / n;
    }
    return;
  }
  for (let j = 1; j <= H; j++) {
    const a = x[start + j] as number, b = x[start + n - j] as number;
    f[j] = a + b;
    f[H + 1 + j] = a - b;
  }
  for (let k = 1; k <= maxOrder; k++) {
    const base = (k - 1) * n;
    let re = 0, im = 0;
    for (let j = 1; j <= H; j++) {
      re += (f[j] as number) * (ct[base + j] as number);
      im += (f[H + 1 + j] as number) * (st[base + j] as number);
    }
    re += x0 + (even ? ((k & 1) === 1 ? -xh : xh) : 0);
    out[outAt + 2 * k] = (2 * re) / n;
    out[outAt + 2 * k + 1] = (2 * im) / n;
  }
}

/**
 * `fourierFolded` of three series (x at start + i·stride, i = 0, 1, 2) sharing every table load,
 * for n = 4Q; the same sums in the same order, so the same lines to the last bit.
 */
function fourierFolded3(x: Float64Array, start: number, stride: number, n: number, ot: OrderTable, maxOrder: number, out: Float64Array, outAt: number, outStride: number): void {
  const Q = n / 4;
  if (fold.length < 12 * Q) fold = new Float64Array(12 * Q);
  const f = fold;
  const ct = ot.cos, st = ot.sin;
  const e = edges; // per series i: x_0, x_{n/2}, S_Q, D_Q at 4i..4i+3; sums r, i at 12 + 2i
  for (let i = 0; i < 3; i++) {
    const s0 = start + i * stride, F = 4 * Q * i;
    let sum = 0;
    for (let j = 0; j < n; j++) sum += x[s0 + j] as number;
    out[outAt + i * outStride] = sum / n;
    out[outAt + i * outStride + 1] = 0;
    e[4 * i] = x[s0] as number;
    e[4 * i + 1] = x[s0 + n / 2] as number;
    for (let j = 1; j < Q; j++) {
      const a = x[s0 + j] as number, b = x[s0 + n - j] as number;
      const c = x[s0 + 2 * Q - j] as number, d = x[s0 + 2 * Q + j] as number;
      const Sj = a + b, Dj = a - b, Sm = c + d, Dm = c - d;
      f[F + j] = Sj + Sm; f[F + Q + j] = Sj - Sm; f[F + 2 * Q + j] = Dj + Dm; f[F + 3 * Q + j] = Dj - Dm;
    }
    e[4 * i + 2] = (x[s0 + Q] as number) + (x[s0 + 3 * Q] as number);
    e[4 * i + 3] = (x[s0 + Q] as number) - (x[s0 + 3 * Q] as number);
  }
  const F1 = 4 * Q, F2 = 8 * Q;
  for (let k = 1; k <= maxOrder; k++) {
    const base = (k - 1) * n;
    const odd = (k & 1) === 1;
    const pa = odd ? Q : 0, qa = odd ? 2 * Q : 3 * Q;
    let r0 = 0, i0 = 0, r1 = 0, i1 = 0, r2 = 0, i2 = 0;
    for (let j = 1; j < Q; j++) {
      const co = ct[base + j] as number, si = st[base + j] as number;
      r0 += (f[pa + j] as number) * co; i0 += (f[qa + j] as number) * si;
      r1 += (f[F1 + pa + j] as number) * co; i1 += (f[F1 + qa + j] as number) * si;
      r2 += (f[F2 + pa + j] as number) * co; i2 += (f[F2 + qa + j] as number) * si;
    }
    const r4 = k & 3;
    e[12] = r0; e[13] = i0; e[14] = r1; e[15] = i1; e[16] = r2; e[17] = i2;
    for (let i = 0; i < 3; i++) {
      const x0 = e[4 * i] as number, xh = e[4 * i + 1] as number, SQ = e[4 * i + 2] as number, DQ = e[4 * i + 3] as number;
      let re = e[12 + 2 * i] as number, im = e[13 + 2 * i] as number;
      re += x0 + (odd ? -xh : xh) + (r4 === 0 ? SQ : r4 === 2 ? -SQ : 0);
      im += r4 === 1 ? DQ : r4 === 3 ? -DQ : 0;
      const o = outAt + i * outStride + 2 * k;
      out[o] = (2 * re) / n;
      out[o + 1] = (2 * im) / n;
    }
  }
}

const allZero = (x: Float64Array, start: number, len: number): boolean => {
  for (let j = start; j < start + len; j++) if (x[j] !== 0) return false;
  return true;
};

/**
 * Harmonics of every component and axis over the first beat of a load series (the steady state is
 * periodic, so one beat holds every line). The total is the sum of the components' lines (the DFT
 * is linear); a series that is identically zero is not transformed.
 */
export function loadHarmonics(series: LoadSeries, n: number, table: BeatTable, maxOrder: number, out: HarmonicTable): HarmonicTable {
  const K1 = maxOrder + 1;
  const pq = out.pq;
  pq.fill(0);
  const ot = ordersOf(table, n, maxOrder);
  const N = series.n;
  const data = series.data;
  const byThree = n % 4 === 0 && maxOrder > 0;
  for (let c = 0; c < TOTAL; c++) {
    for (let a = 0; a < N_AXES; a += 3) {
      const start = (c * N_AXES + a) * N;
      const zero = [allZero(data, start, n), allZero(data, start + N, n), allZero(data, start + 2 * N, n)];
      if (zero[0] && zero[1] && zero[2]) continue;
      const at = (c * N_AXES + a) * K1 * 2;
      if (byThree) fourierFolded3(data, start, N, n, ot, maxOrder, pq, at, 2 * K1);
      else for (let i = 0; i < 3; i++) if (!zero[i]) fourierFolded(data, start + i * N, n, ot, maxOrder, pq, at + i * 2 * K1);
      const tot = (TOTAL * N_AXES + a) * K1 * 2;
      for (let i = 0; i < 6 * K1; i++) pq[tot + i] = (pq[tot + i] as number) + (pq[at + i] as number);
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
