/**
 * Detection (design §6): which lines a sensor reads (its channels), in what quantity, under what
 * noise; the lock-in reference of each channel; the scale factor, SNR and smallest detectable rate
 * per body axis on the best single channel; and what else lands on that line (bias).
 *
 * A channel is an organ axis b and an order k ≥ 1. It reads a quantity q (load N, strain, or
 * sense-mode displacement m) whose line is T_b(kω) times the load line Z (Z = p − i q):
 *   quasi-static axis: T = 1 (load) or the strain per newton (strain);
 *   the sense axis with a sense mode: T = H(kω) (displacement), G(kω) (load passed on by the
 *   spring) or strain per newton × G(kω) (strain).
 * Its noise, one-sided at kω in the quantity: S = S_readout + S_F |T|² (S_F only on the sense axis
 * of a sense mode). With a sense mode only the sense axis is read (the other axes have no modelled
 * transducer); without one, all three organ axes are read with the same readout.
 *
 * The lock-in of a channel is phase-locked to its rate-induced line: the unit-rate lines
 * c_i = T Z(coriolis_i) (i = roll, pitch, yaw) are, for a sine stroke, all at one phase (up to
 * sign); in general the reference ψ is the phase that carries most of them: the principal
 * direction of the quasi-static lines g·Z(coriolis_i) (g the axis's real gain), kept in
 * (−π/2, π/2], plus, on a channel through the sense mode, that mode's phase lag arg H(kω) ∈ (−π, 0]
 * (a reference that follows the drive and compensates the lag, so the scale factor keeps its sign
 * and varies smoothly across mode matching; ψ is then wrapped to (−π, π]). The scale factor is the
 * in-phase output per unit rate K_i = Re(c_i e^{−iψ}) (signed), so the mirror organ's roll and yaw
 * outputs come with the opposite sign and pitch with the same.
 */
import type { OrganLines } from './lines.js';
import { axisAt, BLOCK, unitAt } from './lines.js';
import { displacementTransfer, forceTransfer, senseAxisIndex, type SenseMode } from './senseMode.js';

export type Quantity = 'load' | 'strain' | 'displacement';
export const QUANTITY_UNIT: Record<Quantity, string> = { load: 'N', strain: '1 (m/m)', displacement: 'm' };

export interface AxisPlan {
  read: boolean;
  quantity: Quantity;
  /** Quasi-static factor from load to quantity (1 for load, strain per newton for strain). */
  gain: number;
  /** The axis moves through the sense mode. */
  dynamic: boolean;
}

/** What is read and how noisy it is (all SI). */
export interface ReadPlan {
  axes: [AxisPlan, AxisPlan, AxisPlan];
  frequency: number;
  senseMode?: SenseMode;
  /** Thermal force PSD S_F on the sense axis (N²/Hz, one-sided); 0 without a sense mode. */
  thermalPsd: number;
  /** Readout PSD in the readout's quantity (unit²/Hz, one-sided); 0 without a readout. */
  readoutPsd: number;
  /** Integration time T (s). */
  integration: number;
  threshold: number;
  misalignment: number;
  phaseError: number;
}

/** T_b(kω) as [re, im]: from load line to the channel's quantity. */
export function channelTransfer(plan: ReadPlan, b: number, k: number): [number, number] {
  const a = plan.axes[b] as AxisPlan;
  if (!a.dynamic || !plan.senseMode) return [a.gain, 0];
  const w = 2 * Math.PI * plan.frequency * k;
  const [re, im] = a.quantity === 'displacement' ? displacementTransfer(plan.senseMode, w) : forceTransfer(plan.senseMode, w);
  return [a.gain * re, a.gain * im];
}

/** Channel record layout in a Float64Array (one row of CH numbers per channel). */
export const CH = { b: 0, k: 1, tr: 2, ti: 3, psd: 4, thermal: 5, psi: 6, K: 7, Kq: 10, size: 13 } as const;

/** (p, q) at `at` times T, as W = T·(p − i q): [re, im]. */
export function through(d: Float64Array, at: number, tr: number, ti: number): [number, number] {
  const p = d[at] as number, q = d[at + 1] as number;
  return [tr * p + ti * q, ti * p - tr * q];
}

/** W = T·(p − i q) for a line (p, q): [re, im]. */
export const throughPQ = (p: number, q: number, tr: number, ti: number): [number, number] => [tr * p + ti * q, ti * p - tr * q];

const HALF_PI = Math.PI / 2;

/** Read channels of one organ: transfer, noise, reference phase and scale factors. */
export function organChannels(plan: ReadPlan, L: OrganLines, out?: Float64Array): Float64Array {
  const K1 = L.orders, d = L.data;
  let n = 0;
  for (const a of plan.axes) if (a.read) n += K1 - 1;
  const ch = out && out.length === n * CH.size ? out : new Float64Array(n * CH.size);
  let r = 0;
  for (let b = 0; b < 3; b++) {
    const axis = plan.axes[b] as AxisPlan;
    if (!axis.read) continue;
    const thermalHere = plan.senseMode !== undefined && axis.dynamic;
    for (let k = 1; k < K1; k++, r++) {
      const at = r * CH.size;
      const [tr, ti] = channelTransfer(plan, b, k);
      const thermal = thermalHere ? plan.thermalPsd * (tr * tr + ti * ti) : 0;
      ch[at + CH.b] = b;
      ch[at + CH.k] = k;
      ch[at + CH.tr] = tr;
      ch[at + CH.ti] = ti;
      ch[at + CH.thermal] = thermal;
      ch[at + CH.psd] = thermal + plan.readoutPsd;
      // Unit-rate lines c_i = T·Z(coriolis_i), kept in the K and Kq slots until ψ is known. The
      // reference is the principal phase of the quasi-static lines g·Z (folded), plus the sense
      // mode's lag on a channel through it: continuous across mode matching.
      const g = axis.gain;
      let uu = 0, vv = 0, uv = 0;
      for (let i = 0; i < 3; i++) {
        const z = unitAt(L, BLOCK.coriolis, i, b, k);
        const p = d[z] as number, q = d[z + 1] as number;
        ch[at + CH.K + i] = tr * p + ti * q;
        ch[at + CH.Kq + i] = ti * p - tr * q;
        const u = g * p, v = -g * q;
        uu += u * u;
        vv += v * v;
        uv += u * v;
      }
      let psi = 0.5 * Math.atan2(2 * uv, uu - vv);
      if (psi < -HALF_PI + 1e-9 || psi > HALF_PI - 1e-9) psi = HALF_PI;
      if (thermalHere) {
        const sg = g < 0 ? -1 : 1;
        psi += Math.atan2(sg * ti, sg * tr); // arg of the sense-mode transfer, in (−π, 0]
        if (psi <= -Math.PI) psi += 2 * Math.PI;
      }
      ch[at + CH.psi] = psi;
      const cp = Math.cos(psi), sp = Math.sin(psi);
      for (let i = 0; i < 3; i++) {
        const u = ch[at + CH.K + i] as number, v = ch[at + CH.Kq + i] as number;
        ch[at + CH.K + i] = u * cp + v * sp;
        ch[at + CH.Kq + i] = v * cp - u * sp;
      }
    }
  }
  return ch;
}

/**
 * Row of the channel that detects body axis i best (largest |K_i|/√S, or |K_i| without noise); −1
 * if none. A scale factor below 1e-12 of the organ's largest counts as zero (rounding, not signal).
 */
export function bestChannel(ch: Float64Array, i: number): number {
  const n = ch.length / CH.size;
  let top = 0;
  for (let r = 0; r < n; r++) for (let j = 0; j < 3; j++) top = Math.max(top, Math.abs(ch[r * CH.size + CH.K + j] as number));
  let best = -1, merit = 0;
  for (let r = 0; r < n; r++) {
    const at = r * CH.size;
    const K = Math.abs(ch[at + CH.K + i] as number), S = ch[at + CH.psd] as number;
    if (!(K > 1e-12 * top)) continue;
    const m = S > 0 ? K / Math.sqrt(S) : K;
    if (m > merit * (1 + 1e-12)) {
      merit = m;
      best = r;
    }
  }
  return best;
}

export interface Bias {
  /** In-phase part of the primary load on the channel's own axis, as a rate (rad/s). */
  primary: number;
  /** Worst case over the tilt direction of the primary load leaking in through misalignment δ (rad/s). */
  misalignment: number;
  /** The quadrature (out-of-phase) primary line on the channel, aligned part plus worst-case leak, as a rate (rad/s). */
  quadrature: number;
  /** quadrature × |sin ε|: what a reference phase error ε turns into an in-phase bias (rad/s). */
  phaseError: number;
  /** Centrifugal line at the scenario's rates (quadratic in Ω: a scale-factor nonlinearity), in-phase, as a rate (rad/s). */
  centrifugal: number;
  gravity: number;
  translational: number;
  /** Angular acceleration at constant rate: zero (rad/s). */
  angularAcceleration: number;
  /** In-phase and quadrature output per unit angular acceleration about the same axis, as a rate (s = (rad/s)/(rad/s²)). */
  perAngularAcceleration: { inPhase: number; quadrature: number };
  /** |primary| + misalignment + phaseError + |centrifugal| + |gravity| + |translational| (rad/s). */
  worstCase: number;
}

/** Bias terms of channel row r for body axis i (scale factor K_i ≠ 0). */
export function biasOf(plan: ReadPlan, L: OrganLines, ch: Float64Array, r: number, i: number): Bias {
  const at = r * CH.size, d = L.data;
  const b = ch[at + CH.b] as number, k = ch[at + CH.k] as number;
  const tr = ch[at + CH.tr] as number, ti = ch[at + CH.ti] as number, psi = ch[at + CH.psi] as number;
  const K = ch[at + CH.K + i] as number;
  const c = Math.cos(psi), s = Math.sin(psi);
  /** In-phase (I) and quadrature (Q) output of the line at `z` through T. */
  let I = 0, Q = 0;
  const read = (z: number): void => {
    const p = d[z] as number, q = d[z + 1] as number;
    const wr = tr * p + ti * q, wi = ti * p - tr * q;
    I = wr * c + wi * s;
    Q = wi * c - wr * s;
  };
  read(axisAt(L, BLOCK.primary, b, k));
  const ownI = I, ownQ = Q;
  let leakI = 0, leakQ = 0;
  for (let x = 0; x < 3; x++) {
    if (x === b) continue;
    read(axisAt(L, BLOCK.primary, x, k));
    leakI += I * I;
    leakQ += Q * Q;
  }
  const sd = Math.abs(Math.sin(plan.misalignment));
  const primary = ownI / K;
  const misalignment = (sd * Math.sqrt(leakI)) / Math.abs(K);
  const quadrature = (Math.abs(ownQ) + sd * Math.sqrt(leakQ)) / Math.abs(K);
  const phaseError = quadrature * Math.abs(Math.sin(plan.phaseError));
  read(axisAt(L, BLOCK.centrifugal, b, k));
  const centrifugal = I / K;
  read(axisAt(L, BLOCK.gravity, b, k));
  const gravity = I / K;
  read(axisAt(L, BLOCK.translational, b, k));
  const translational = I / K;
  read(unitAt(L, BLOCK.angularAcceleration, i, b, k));
  return {
    primary, misalignment, quadrature, phaseError, centrifugal, gravity, translational,
    angularAcceleration: 0,
    perAngularAcceleration: { inPhase: I / K, quadrature: Q / K },
    worstCase: Math.abs(primary) + misalignment + phaseError + Math.abs(centrifugal) + Math.abs(gravity) + Math.abs(translational),
  };
}

/** The sense axis of a drive, re-exported for the plan. */
export { senseAxisIndex };
