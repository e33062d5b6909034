/**
 * The lock-in channels a turn is read through (design §6, §7): exactly the channels, reference
 * phases, noise and pair estimator of the sensing answer for the same scenario (sensing
 * `prepareSensing`). Channel c reads organ axis b at harmonic k through the transfer T from load
 * line to the channel's quantity (1 for a load, strain per newton for strain, the sense mode's
 * H(kω) or G(kω) on its axis), locked to the reference ψ of its rate-induced line. Its in-phase
 * output over a beat is read from the total load on axis b as
 *
 *   y = |T| · I_k(F; ψ − arg T)      (lock-in of F at order k, reference ψ − arg T)
 *
 * which equals Re(T Z e^{−iψ}) for a load line Z (sensing/index.ts). A sense mode is taken as
 * quasi-steady: each beat's line passes through the steady-state transfer (its ring-up is not
 * simulated; the answer warns).
 *
 * The read-out is calibrated on the body at rest in its initial attitude: the baseline y0_c is the
 * in-phase output of the total load at zero rate (primary, gravity, translation), so that what is
 * left is the rate-induced line plus what the turn adds besides it (centrifugal load, the change of
 * gravity with attitude, angular acceleration leaking out of quadrature within a beat).
 */
import { axesOf, TOTAL, type Axis } from '../components.js';
import { organNumbers } from '../forces.js';
import { lineIndex } from '../harmonics.js';
import type { Model, Motion } from '../model.js';
import type { Issue, Scenario } from '../scenario.js';
import { CH, prepareSensing, type PairAnalysis, type Quantity, type SensingPlan } from '../sensing/index.js';

export interface Channel {
  /** 0: the organ as specified, 1: its mirror. */
  organ: 0 | 1;
  /** Organ-frame axis index 0..2 (radial, tangential, normal; or drive, sense, cross). */
  axis: number;
  axisName: Axis;
  order: number;
  quantity: Quantity;
  /** ψ (rad), referred to t = 0: the reference of the channel's rate-induced line. */
  referencePhase: number;
  /** |T| and ψ − arg T: how the channel is read from the load series. */
  gain: number;
  loadPhase: number;
  /** In-phase output per unit rate (channel unit per rad/s) for roll, pitch, yaw. */
  sensitivity: [number, number, number];
  /** In-phase output of the body at rest in its initial attitude (channel unit). */
  baseline: number;
}

export interface TurnChannels {
  channels: Channel[];
  /** The pair analysis over the channels, in their order (sensing). */
  pair: PairAnalysis;
  /** Integration time of the sensor (s). */
  integration: number;
  sensing: SensingPlan;
}

const ZERO: [number, number, number] = [0, 0, 0];

/** The channels of a scenario, or the issues that the sensing layer raises for it. */
export function channelsOf(s: Scenario, model: Model): { ok: true; value: TurnChannels } | { ok: false; issues: Issue[] } {
  const prep = prepareSensing(s, model);
  if (!prep.ok) return prep;
  const sp = prep.prepared;
  const names = axesOf(model.geometry.drive);
  const rest = [false, true].map((mirror) => {
    const motion: Motion = { omega: ZERO, omegaDot: ZERO, accel: model.motion.accel, gravity: model.motion.gravity };
    return model.mirror || !mirror ? organNumbers({ ...model, motion }, { mirror, path: sp.path, pointsPerBeat: s.sampling.pointsPerBeat, harmonics: s.sampling.harmonics, series: false }).table : undefined;
  });
  const channels = sp.pairRows.map(({ organ, row }): Channel => {
    const ch = sp.organs[organ]?.channels as Float64Array;
    const at = row * CH.size;
    const b = ch[at + CH.b] as number, k = ch[at + CH.k] as number;
    const tr = ch[at + CH.tr] as number, ti = ch[at + CH.ti] as number, psi = ch[at + CH.psi] as number;
    const table = rest[organ];
    let baseline = 0;
    if (table) {
      const z = lineIndex(table, TOTAL, 3 + b, k);
      const p = table.pq[z] as number, q = table.pq[z + 1] as number;
      // W = T (p − i q); in-phase output Re(W e^{−iψ})
      baseline = (tr * p + ti * q) * Math.cos(psi) + (ti * p - tr * q) * Math.sin(psi);
    }
    return {
      organ: organ === 1 ? 1 : 0,
      axis: b,
      axisName: names[3 + b] as Axis,
      order: k,
      quantity: sp.plan.axes[b]?.quantity ?? 'load',
      referencePhase: psi,
      gain: Math.hypot(tr, ti),
      loadPhase: psi - Math.atan2(ti, tr),
      sensitivity: [ch[at + CH.K] as number, ch[at + CH.K + 1] as number, ch[at + CH.K + 2] as number],
      baseline,
    };
  });
  return { ok: true, value: { channels, pair: sp.pair, integration: sp.plan.integration, sensing: sp } };
}
