/**
 * Beat-by-beat read-out of a maneuver (design §7): per-beat averages of the true body rates, the
 * causal moving average of per-beat lock-in outputs over the integration window, and the lag and
 * error of the estimated rates against the true ones.
 *
 * Timing: beat b spans [b/f, (b+1)/f) and is stamped at its centre (b + ½)/f. The estimate at beat
 * b uses the w beats b−w+1..b (fewer at the start of the run), so for a slowly varying rate it
 * trails the beat average by (w − 1)/2 beats: about half the integration window.
 */

/** Mean of x over each beat: out[b] = (1/n) Σ_{j ∈ beat b} x_j. */
export function beatMeans(x: Float64Array, n: number, beats: number, out: Float64Array, start = 0): Float64Array {
  for (let b = 0; b < beats; b++) {
    let s = 0;
    const at = start + b * n;
    for (let j = at; j < at + n; j++) s += x[j] as number;
    out[b] = s / n;
  }
  return out;
}

/** Causal moving average over the last `window` beats (fewer at the start): out[b] = mean(x[max(0, b−w+1)..b]). */
export function trailingMean(x: Float64Array, window: number, beats: number, out: Float64Array): Float64Array {
  let s = 0;
  for (let b = 0; b < beats; b++) {
    s += x[b] as number;
    if (b >= window) s -= x[b - window] as number;
    out[b] = s / Math.min(b + 1, window);
  }
  return out;
}

/** Linear interpolation of per-beat values at fractional beat u (held at the ends). */
function at(x: Float64Array, u: number, beats: number): number {
  if (u <= 0) return x[0] as number;
  if (u >= beats - 1) return x[beats - 1] as number;
  const i = Math.floor(u);
  const r = u - i;
  return (1 - r) * (x[i] as number) + r * (x[i + 1] as number);
}

/**
 * The delay τ (s) that best aligns the estimate with the true rate: the minimum over shifts s
 * (beats) of Σ_b (est_b − true(b − s))² / (count), the true rate interpolated linearly between
 * beat centres, searched on a grid of ¼ beat over [−window, 2·window] and refined by a parabola.
 * Null when the true rate does not vary (nothing to align) or the run is too short.
 */
export function lagOf(truth: Float64Array, est: Float64Array, beats: number, window: number, frequency: number): number | null {
  let lo = Infinity, hi = -Infinity;
  for (let b = 0; b < beats; b++) {
    lo = Math.min(lo, truth[b] as number);
    hi = Math.max(hi, truth[b] as number);
  }
  if (!(hi - lo > 0) || beats < 3) return null;
  const cost = (s: number): number => {
    let e = 0, count = 0;
    for (let b = 0; b < beats; b++) {
      const u = b - s;
      if (u < 0 || u > beats - 1) continue;
      const d = (est[b] as number) - at(truth, u, beats);
      e += d * d;
      count++;
    }
    return count > 0 ? e / count : Infinity;
  };
  const step = 0.25;
  const smin = -Math.min(window, beats - 2), smax = Math.min(2 * window, beats - 2);
  let best = 0, bestCost = Infinity;
  for (let s = smin; s <= smax + 1e-9; s += step) {
    const c = cost(s);
    if (c < bestCost) {
      bestCost = c;
      best = s;
    }
  }
  const cm = cost(best - step), cp = cost(best + step);
  const curv = cm - 2 * bestCost + cp;
  const shift = Number.isFinite(cm) && Number.isFinite(cp) && curv > 0 ? best + (step * (cm - cp)) / (2 * curv) : best;
  return shift / frequency;
}

export interface ErrorStats {
  /** Root-mean-square of estimated − true over the beats (rad/s). */
  rms: number;
  /** Largest |estimated − true| (rad/s). */
  max: number;
}

export function errorOf(truth: Float64Array, est: Float64Array, beats: number): ErrorStats {
  let ss = 0, max = 0;
  for (let b = 0; b < beats; b++) {
    const d = (est[b] as number) - (truth[b] as number);
    ss += d * d;
    max = Math.max(max, Math.abs(d));
  }
  return { rms: Math.sqrt(ss / Math.max(1, beats)), max };
}
