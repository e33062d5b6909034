/**
 * The lock-in channels a turn is read through (design §6, §7): every organ-frame axis of the total
 * load of each organ at every harmonic order k = 1..K, phase-locked to the rate-induced (Coriolis)
 * line. For channel c the per-unit-rate Coriolis lines Z_ci = p − iq (harmonics.ts) for the body
 * axes i = roll, pitch, yaw come from the core at unit rates (closed form where it applies); the
 * reference phase ψ_c is the phase of the largest of them, and the in-phase sensitivity is
 * H_ci = Re(Z_ci e^{−iψ_c}) (lockin.ts `lineOutputs`). A channel that no rate reaches is dropped.
 *
 * The read-out is calibrated on the body at rest in its initial attitude: the baseline y0_c is the
 * in-phase output of the total load at zero rate (primary, gravity, translation), so that what is
 * left is the rate-induced line plus what the turn adds besides it (centrifugal load, the change of
 * gravity with attitude, angular acceleration leaking out of quadrature within a beat).
 */
import { axesOf, COMPONENTS, TOTAL, type Axis } from '../components.js';
import { organNumbers, type Path } from '../forces.js';
import { amplitudePhase, lineIndex, type HarmonicTable } from '../harmonics.js';
import type { Model, Motion } from '../model.js';
import { lineOutputs } from '../sensing/index.js';

export interface Channel {
  /** 0: the organ as specified, 1: its mirror. */
  organ: 0 | 1;
  /** Organ-frame axis index 0..2 (radial, tangential, normal; or drive, sense, cross). */
  axis: number;
  axisName: Axis;
  order: number;
  /** ψ_ref (rad), referred to t = 0. */
  referencePhase: number;
  /** In-phase output per unit rate (N per rad/s) for roll, pitch, yaw. */
  sensitivity: [number, number, number];
  /** In-phase output at rest (N). */
  baseline: number;
}

const CORIOLIS = COMPONENTS.indexOf('coriolis');
const ZERO: [number, number, number] = [0, 0, 0];

/** The channels of a model, orders 1..K, for both organs when it has a mirror. */
export function channelsOf(model: Model, path: Path, pointsPerBeat: number, K: number, relative = 1e-9): Channel[] {
  const organs: (0 | 1)[] = model.mirror ? [0, 1] : [0];
  const tables = (mirror: boolean) => {
    const at = (motion: Motion): HarmonicTable => organNumbers({ ...model, motion }, { mirror, path, pointsPerBeat, harmonics: K, series: false }).table;
    const unit = [0, 1, 2].map((i) => at({ omega: [i === 0 ? 1 : 0, i === 1 ? 1 : 0, i === 2 ? 1 : 0], omegaDot: ZERO, accel: [0, 0, 0], gravity: [0, 0, 0] }));
    const rest = at({ omega: [0, 0, 0], omegaDot: ZERO, accel: model.motion.accel, gravity: model.motion.gravity });
    return { unit, rest };
  };
  const all: Channel[] = [];
  const names = axesOf(model.geometry.drive);
  for (const organ of organs) {
    const { unit, rest } = tables(organ === 1);
    for (let b = 0; b < 3; b++) {
      for (let k = 1; k <= K; k++) {
        let best = 0, psi = 0;
        for (const t of unit) {
          const at = lineIndex(t, CORIOLIS, 3 + b, k);
          const { amplitude, phase } = amplitudePhase(t.pq[at] as number, t.pq[at + 1] as number, k);
          if (amplitude > best) {
            best = amplitude;
            psi = phase;
          }
        }
        const sensitivity = unit.map((t) => {
          const at = lineIndex(t, CORIOLIS, 3 + b, k);
          return lineOutputs(t.pq[at] as number, t.pq[at + 1] as number, psi).inPhase;
        }) as [number, number, number];
        const r = lineIndex(rest, TOTAL, 3 + b, k);
        all.push({ organ, axis: b, axisName: names[3 + b] as Axis, order: k, referencePhase: psi, sensitivity, baseline: lineOutputs(rest.pq[r] as number, rest.pq[r + 1] as number, psi).inPhase });
      }
    }
  }
  const top = Math.max(0, ...all.map((c) => Math.max(...c.sensitivity.map(Math.abs))));
  return all.filter((c) => Math.max(...c.sensitivity.map(Math.abs)) > relative * top);
}
