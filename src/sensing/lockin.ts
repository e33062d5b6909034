/**
 * The lock-in demodulator (design §6). A series x sampled at N points per beat (t_j = j/(N f),
 * t = 0 at the waveform's origin) is multiplied by the reference cos(kωt + ψ_ref) and by its
 * quadrature and averaged over each whole beat:
 *
 *   I_b =  (2/N) Σ_{j ∈ beat b} x_j cos(kωt_j + ψ_ref),
 *   Q_b = −(2/N) Σ_{j ∈ beat b} x_j sin(kωt_j + ψ_ref),
 *
 * so that a line A cos(kωt + ψ) gives I = A cos(ψ − ψ_ref) and Q = A sin(ψ − ψ_ref) exactly, and
 * every other harmonic of the beat gives nothing. With the line written as Z = A e^{iψ} (the
 * harmonics.ts pair (p, q) is Z = p − i q), I + iQ = Z e^{−iψ_ref}.
 *
 * Averaging n beats integrates over T = n/f. For white noise of one-sided power spectral density
 * S (unit²/Hz) the spread of I (and of Q) is σ = √(S / T) (derivation in docs/sensing.md).
 */
import { beatTable } from '../waveform.js';

export interface DemodulateOptions {
  /** Harmonic order k ≥ 1 of the reference. */
  order: number;
  /** Samples per beat N. */
  pointsPerBeat: number;
  /** ψ_ref (rad); the default 0 locks to cos kωt. */
  referencePhase?: number;
  /** Index of x[start] counted from t = 0, so that ψ_ref stays referred to t = 0 (default 0). */
  firstSample?: number;
  /** Offset of the first sample in x (default 0), for series packed in one array. */
  start?: number;
  /** Whole beats to demodulate (default: as many as x holds from `start`). */
  beats?: number;
}

export interface Demodulated {
  /** I_b per beat. */
  inPhase: Float64Array;
  /** Q_b per beat. */
  quadrature: Float64Array;
}

/** Per-beat in-phase and quadrature outputs of x at harmonic `order` (see the module note). */
export function demodulate(x: ArrayLike<number>, options: DemodulateOptions, out?: Demodulated): Demodulated {
  const { order: k, pointsPerBeat: n, referencePhase = 0, firstSample = 0, start = 0 } = options;
  const beats = options.beats ?? Math.floor((x.length - start) / n);
  const res = out ?? { inPhase: new Float64Array(beats), quadrature: new Float64Array(beats) };
  const { cos: ct, sin: st } = beatTable(n);
  const cr = Math.cos(referencePhase), sr = Math.sin(referencePhase);
  const step = k % n;
  let m = (((k % n) * (firstSample % n)) % n + n) % n;
  for (let b = 0; b < beats; b++) {
    let c = 0, s = 0;
    const at = start + b * n;
    for (let j = 0; j < n; j++) {
      const v = x[at + j] as number;
      c += v * (ct[m] as number);
      s += v * (st[m] as number);
      m += step;
      if (m >= n) m -= n;
    }
    res.inPhase[b] = (2 / n) * (c * cr - s * sr);
    res.quadrature[b] = (-2 / n) * (s * cr + c * sr);
  }
  return res;
}

/** The lock-in output over all whole beats of x: the mean of the per-beat outputs. */
export function lockIn(x: ArrayLike<number>, options: DemodulateOptions): { inPhase: number; quadrature: number } {
  const d = demodulate(x, options);
  let i = 0, q = 0;
  for (let b = 0; b < d.inPhase.length; b++) {
    i += d.inPhase[b] as number;
    q += d.quadrature[b] as number;
  }
  const nb = Math.max(1, d.inPhase.length);
  return { inPhase: i / nb, quadrature: q / nb };
}

/**
 * Spread of one lock-in output (I or Q) for white noise of one-sided PSD `psd` integrated over
 * `time` seconds: σ = √(S / T).
 */
export const outputNoise = (psd: number, time: number): number => Math.sqrt(psd / time);

/** In-phase and quadrature outputs of a line (p, q) (harmonics.ts convention) for reference ψ_ref. */
export function lineOutputs(p: number, q: number, referencePhase: number): { inPhase: number; quadrature: number } {
  const c = Math.cos(referencePhase), s = Math.sin(referencePhase);
  return { inPhase: p * c - q * s, quadrature: -q * c - p * s };
}
