/**
 * The pair read together (design §6): the sensitivity matrix H of the lock-in channels
 * (rows: organ × axis × harmonic; columns: roll, pitch, yaw rate), the channel noise covariance
 * R = diag(σ²) (independent channels, see docs/sensing.md), the least-squares rate estimate
 *
 *   Ω̂ = (Hᵀ R⁻¹ H)⁻¹ Hᵀ R⁻¹ y,   Cov(Ω̂) = (Hᵀ R⁻¹ H)⁻¹,
 *
 * its condition number (of the whitened matrix R^{-1/2} H, by SVD) and the rate combinations the
 * channels cannot tell apart (near-null right singular vectors). The whitened matrix is first
 * reduced to a 3 × 3 triangle by Householder QR, which has the same singular values and right
 * singular vectors V; those come from a one-sided Jacobi SVD (Hestenes 1958; accurate for small
 * singular values, and free of allocation, where a general SVD cost ~10 µs and ~20 kB a call);
 * tests hold it to ml-matrix's SVD. (Hᵀ R⁻¹ H)⁺ = V S⁻² Vᵀ without the null directions.
 */

export const RATE_AXES = ['roll', 'pitch', 'yaw'] as const;
export type RateAxis = (typeof RATE_AXES)[number];

export interface PairRow {
  /** In-phase output per unit rate (channel unit per rad/s) for roll, pitch, yaw. */
  sensitivity: readonly [number, number, number];
  /** Spread of the in-phase output over the integration (channel unit); 0 when no noise model. */
  sigma: number;
}

export interface PairOptions {
  /** SNR at which a rate counts as detected (default 1). */
  threshold?: number;
  /** Singular values below this fraction of the largest name a confusion (default 1e-6). */
  confusionTolerance?: number;
  /** Singular values below this fraction of the largest are treated as zero (default 1e-12). */
  nullTolerance?: number;
}

export interface Confusion {
  /** `unobserved`: no channel responds to the axis; `confused`: only a combination is seen. */
  kind: 'unobserved' | 'confused';
  axes: RateAxis[];
  /** Unit rate direction (roll, pitch, yaw) that gives (almost) no output on any channel. */
  direction: Record<RateAxis, number>;
  /** Singular value along the direction over the largest (0 for an exact null). */
  ratio: number;
  message: string;
}

export interface PairAnalysis {
  channels: number;
  /** True when every row carries a noise spread (σ > 0); otherwise H is used unweighted. */
  weighted: boolean;
  /** Singular values of R^{-1/2} H (of H when unweighted), largest first. */
  singularValues: [number, number, number];
  /** Largest over smallest singular value; null when the smallest is zero (singular). */
  conditionNumber: number | null;
  /** Cov(Ω̂) in (rad/s)², rows and columns roll, pitch, yaw; null where infinite or unweighted. */
  covariance: (number | null)[][];
  /** threshold · √Cov_ii (rad/s); null where the axis is not observable or without noise. */
  minimumRate: Record<RateAxis, number | null>;
  observable: Record<RateAxis, boolean>;
  confusions: Confusion[];
  /** (Hᵀ R⁻¹ H)⁺ (3 × 3, row-major; pseudo-inverse without the null directions), for the estimator. */
  pinvGram: number[];
  /** The rows analysed and their weights 1/σ² (1 when unweighted), for the estimator. */
  rows: readonly PairRow[];
  weights: number[];
}

/** Buffers reused across calls (the core is synchronous); grown when a larger pair comes. */
let ws = { cap: 0, A: new Float64Array(0), V: new Float64Array(0), R: new Float64Array(9), beta: new Float64Array(3) };
function workspace(n: number) {
  if (ws.cap < n) {
    const cap = Math.max(n, 2 * ws.cap, 64);
    ws = { cap, A: new Float64Array(3 * cap), V: new Float64Array(3 * cap), R: ws.R, beta: ws.beta };
  }
  return ws;
}

/** Householder QR of the n × 3 matrix A (row-major, overwritten): R (3 × 3) and reflectors. */
function householder(A: Float64Array, n: number, R: Float64Array, V: Float64Array, beta: Float64Array): void {
  R.fill(0);
  for (let j = 0; j < 3; j++) {
    beta[j] = 0;
    if (j >= n) continue;
    let norm2 = 0;
    for (let i = j; i < n; i++) norm2 += (A[i * 3 + j] as number) ** 2;
    const norm = Math.sqrt(norm2);
    const a0 = A[j * 3 + j] as number;
    const alpha = a0 >= 0 ? -norm : norm;
    for (let i = 0; i < n; i++) V[i * 3 + j] = i < j ? 0 : (A[i * 3 + j] as number);
    V[j * 3 + j] = a0 - alpha;
    let vv = 0;
    for (let i = j; i < n; i++) vv += (V[i * 3 + j] as number) ** 2;
    if (vv > 0) {
      beta[j] = 2 / vv;
      for (let c = j; c < 3; c++) {
        let d = 0;
        for (let i = j; i < n; i++) d += (V[i * 3 + j] as number) * (A[i * 3 + c] as number);
        d *= beta[j] as number;
        for (let i = j; i < n; i++) A[i * 3 + c] = (A[i * 3 + c] as number) - d * (V[i * 3 + j] as number);
      }
    }
  }
  for (let i = 0; i < Math.min(3, n); i++) for (let c = i; c < 3; c++) R[i * 3 + c] = A[i * 3 + c] as number;
}

/**
 * One-sided Jacobi SVD of a 3 × 3 matrix (row-major, overwritten): rotates column pairs of A until
 * they are orthogonal, accumulating the rotations in V (row-major, 3 × 3). On return the column
 * norms of A are the singular values s (unsorted) and V's columns the right singular vectors.
 */
export function jacobiSvd3(A: Float64Array | number[], V: Float64Array | number[], s: Float64Array | number[]): void {
  for (let i = 0; i < 9; i++) V[i] = i % 4 === 0 ? 1 : 0;
  for (let sweep = 0; sweep < 60; sweep++) {
    let rotated = false;
    for (let i = 0; i < 2; i++) {
      for (let j = i + 1; j < 3; j++) {
        let al = 0, be = 0, ga = 0;
        for (let r = 0; r < 3; r++) {
          const x = A[r * 3 + i] as number, y = A[r * 3 + j] as number;
          al += x * x;
          be += y * y;
          ga += x * y;
        }
        if (ga === 0 || Math.abs(ga) <= 1e-15 * Math.sqrt(al * be)) continue;
        rotated = true;
        const zeta = (be - al) / (2 * ga);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t), sn = c * t;
        for (let r = 0; r < 3; r++) {
          const x = A[r * 3 + i] as number, y = A[r * 3 + j] as number;
          A[r * 3 + i] = c * x - sn * y;
          A[r * 3 + j] = sn * x + c * y;
          const vx = V[r * 3 + i] as number, vy = V[r * 3 + j] as number;
          V[r * 3 + i] = c * vx - sn * vy;
          V[r * 3 + j] = sn * vx + c * vy;
        }
      }
    }
    if (!rotated) break;
  }
  for (let j = 0; j < 3; j++) s[j] = Math.sqrt((A[j] as number) ** 2 + (A[3 + j] as number) ** 2 + (A[6 + j] as number) ** 2);
}

const dir = <T>(v: readonly T[]): Record<RateAxis, T> => ({ roll: v[0] as T, pitch: v[1] as T, yaw: v[2] as T });

/** Sensitivity, covariance, condition number, confusions and estimator gain of a set of channels. */
export function analysePair(rows: readonly PairRow[], options: PairOptions = {}): PairAnalysis {
  const { threshold = 1, confusionTolerance = 1e-6, nullTolerance = 1e-12 } = options;
  const n = rows.length;
  let weighted = n > 0;
  for (let i = 0; i < n; i++) if (!((rows[i] as PairRow).sigma > 0)) weighted = false;
  const { A, V, R, beta } = workspace(n);
  const weights = new Array<number>(n);
  for (let i = 0; i < n; i++) {
    const r = rows[i] as PairRow;
    const w = weighted ? 1 / r.sigma : 1;
    weights[i] = w * w;
    for (let c = 0; c < 3; c++) A[i * 3 + c] = (r.sensitivity[c] as number) * w;
  }
  householder(A, n, R, V, beta);
  const Vr = [0, 0, 0, 0, 0, 0, 0, 0, 0], s = [0, 0, 0];
  jacobiSvd3(R, Vr, s);
  const order = [0, 1, 2].sort((a, b) => (s[b] as number) - (s[a] as number));
  const sv = order.map((i) => s[i] as number) as [number, number, number];
  const smax = sv[0];
  const conditionNumber = smax > 0 && sv[2] > 0 ? smax / sv[2] : null;
  const isNull = (x: number) => !(smax > 0) || x <= nullTolerance * smax;
  const col = (M: number[], j: number): number[] => [M[j] as number, M[3 + j] as number, M[6 + j] as number];

  // Null projector P0 (rate space) and the pseudo-inverse of the Gram matrix, V S⁻² Vᵀ.
  const P0 = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  const pinvGram = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  for (const j of order) {
    const sj = s[j] as number;
    const v = col(Vr, j);
    for (let a = 0; a < 3; a++) {
      for (let b = 0; b < 3; b++) {
        const vv = (v[a] as number) * (v[b] as number);
        if (isNull(sj)) P0[a * 3 + b] = (P0[a * 3 + b] as number) + vv;
        else pinvGram[a * 3 + b] = (pinvGram[a * 3 + b] as number) + vv / (sj * sj);
      }
    }
  }
  const cov = pinvGram;
  const observable = dir([0, 1, 2].map((i) => (P0[i * 4] as number) < 1e-9));
  const covariance = [0, 1, 2].map((a) => [0, 1, 2].map((b) => (weighted && observable[RATE_AXES[a] as RateAxis] && observable[RATE_AXES[b] as RateAxis] ? (cov[a * 3 + b] as number) : null)));
  const minimumRate = dir([0, 1, 2].map((i) => {
    const c = covariance[i]?.[i];
    return c === null || c === undefined ? null : threshold * Math.sqrt(c);
  }));

  const confusions = smax > 0 && sv[2] > confusionTolerance * smax ? [] : confusionsOf(order.map((j) => ({ s: s[j] as number, v: col(Vr, j) })), smax, confusionTolerance);
  return { channels: n, weighted, singularValues: sv, conditionNumber, covariance, minimumRate, observable, confusions, pinvGram, rows, weights };
}

const fmt = (x: number): string => (Math.abs(x) < 5e-3 ? '0' : x.toFixed(2));

/** Name the near-null rate directions: single axes that nothing sees, then mixed combinations. */
function confusionsOf(sing: { s: number; v: number[] }[], smax: number, tol: number): Confusion[] {
  const near = sing.filter((x) => !(smax > 0) || x.s <= tol * smax);
  if (near.length === 0) return [];
  const ratioOf = (x: { s: number }) => (smax > 0 ? x.s / smax : 0);
  const weight = [0, 1, 2].map((i) => near.reduce((acc, x) => acc + (x.v[i] as number) ** 2, 0));
  const unseen = [0, 1, 2].filter((i) => (weight[i] as number) > 1 - 1e-6);
  const out: Confusion[] = unseen.map((i) => {
    const axis = RATE_AXES[i] as RateAxis;
    const d = [0, 0, 0];
    d[i] = 1;
    const ratio = Math.max(...near.map((x) => ((x.v[i] as number) ** 2 > 0.5 ? ratioOf(x) : 0)));
    return { kind: 'unobserved', axes: [axis], direction: dir(d), ratio, message: `the channels do not respond to ${axis}: no read line carries it` };
  });
  // Directions of the near-null space orthogonal to the unseen axes.
  const rest = near.map((x) => {
    const v = x.v.map((c, i) => (unseen.includes(i) ? 0 : c));
    return { v, s: x.s, len: Math.hypot(...v) };
  });
  const basis: { v: number[]; s: number }[] = [];
  for (const r of rest.sort((a, b) => b.len - a.len)) {
    const v = [...r.v];
    for (const b of basis) {
      const d = v.reduce((acc, c, i) => acc + c * (b.v[i] as number), 0);
      for (let i = 0; i < 3; i++) v[i] = (v[i] as number) - d * (b.v[i] as number);
    }
    const len = Math.hypot(...v);
    if (len > 1e-6) basis.push({ v: v.map((c) => c / len), s: r.s });
  }
  for (const b of basis) {
    const big = b.v.reduce((m, c, i) => (Math.abs(c) > Math.abs(b.v[m] as number) ? i : m), 0);
    const v = (b.v[big] as number) < 0 ? b.v.map((c) => -c) : b.v;
    const axes = [0, 1, 2].filter((i) => Math.abs(v[i] as number) >= 5e-3).map((i) => RATE_AXES[i] as RateAxis);
    const combo = axes.map((a, k) => {
      const c = v[RATE_AXES.indexOf(a)] as number;
      return `${k === 0 ? (c < 0 ? '−' : '') : c < 0 ? ' − ' : ' + '}${fmt(Math.abs(c))} ${a}`;
    }).join('');
    const ratio = ratioOf(b);
    out.push({
      kind: 'confused',
      axes,
      direction: dir(v),
      ratio,
      message: `the channels cannot tell ${axes.join(', ').replace(/, ([^,]*)$/, ' and $1')} apart: a rate along ${combo} gives ${ratio === 0 ? 'no' : `${ratio.toPrecision(2)} of the best`} in-phase output`,
    });
  }
  return out;
}

/**
 * Ω̂ = (Hᵀ R⁻¹ H)⁺ Hᵀ R⁻¹ y for one set of channel outputs y (rows in the order of the analysis);
 * along null directions the estimate is the minimum-norm one (zero).
 */
export function estimateRates(analysis: Pick<PairAnalysis, 'pinvGram' | 'rows' | 'weights'>, y: ArrayLike<number>, out: Float64Array = new Float64Array(3)): Float64Array {
  const { pinvGram: P, rows, weights } = analysis;
  let z0 = 0, z1 = 0, z2 = 0;
  for (let i = 0; i < rows.length; i++) {
    const h = (rows[i] as PairRow).sensitivity, wy = (weights[i] as number) * (y[i] as number);
    z0 += h[0] * wy;
    z1 += h[1] * wy;
    z2 += h[2] * wy;
  }
  for (let r = 0; r < 3; r++) out[r] = (P[r * 3] as number) * z0 + (P[r * 3 + 1] as number) * z1 + (P[r * 3 + 2] as number) * z2;
  return out;
}

/** The estimator as a gain matrix G (3 × channels, row-major): Ω̂ = G y. */
export function estimatorGain(analysis: Pick<PairAnalysis, 'pinvGram' | 'rows' | 'weights'>): Float64Array {
  const { pinvGram: P, rows, weights } = analysis;
  const n = rows.length, G = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    const h = (rows[i] as PairRow).sensitivity, w = weights[i] as number;
    for (let r = 0; r < 3; r++) G[r * n + i] = w * ((P[r * 3] as number) * h[0] + (P[r * 3 + 1] as number) * h[1] + (P[r * 3 + 2] as number) * h[2]);
  }
  return G;
}
