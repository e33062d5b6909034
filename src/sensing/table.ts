/** The sensing answer as a CSV table: one row per organ and body axis, then the pair's rows. */
import { toCsv, type Cell } from '../csv.js';
import { RATE_AXES } from './pair.js';
import type { SensingAnswer } from './sensing.js';

/** The unit of a channel quantity as CSV headers write it. */
export const UNIT_TAG = { load: 'N', strain: 'strain', displacement: 'm' } as const;

/** Header names carry units; the channel quantity's unit is named once (N, strain or m). */
export function sensingCsv(a: SensingAnswer): string {
  const q = UNIT_TAG[a.organs[0]?.read.quantity ?? 'load'];
  const header = [
    'side', 'role', 'axis', 'channel_axis', 'order', 'frequency_Hz', 'reference_phase_rad',
    `scale_factor_${q}_per_rad_s`, 'rate_rad_s', `signal_${q}`, `noise_density_${q}_per_Hz^0.5`, `sigma_${q}`, 'limited_by',
    'snr', 'minimum_rate_rad_s', 'detectable', 'rate_noise_density_rad_s_per_Hz^0.5', 'angle_random_walk_deg_per_h^0.5',
    'bias_worst_case_rad_s', 'bias_quadrature_rad_s', 'bias_phase_error_rad_s', 'bias_misalignment_rad_s', 'bias_centrifugal_rad_s', 'bias_gravity_rad_s',
    'bias_per_angular_acceleration_s',
  ];
  const rows: Cell[][] = [];
  for (const o of a.organs) {
    for (const axis of RATE_AXES) {
      const x = o.axes[axis];
      const b = x.bias;
      rows.push([
        o.side, o.role, axis, x.channel?.axis, x.channel?.order, x.channel?.frequency, x.channel?.referencePhase,
        x.scaleFactor, x.rate, x.signal, x.noise?.density, x.noise?.sigma, x.noise?.limitedBy,
        x.snr, x.minimumRate, x.detectable, x.rateNoiseDensity, x.angleRandomWalk,
        b?.worstCase, b?.quadrature, b?.phaseError, b?.misalignment, b?.centrifugal, b?.gravity, b?.perAngularAcceleration.inPhase,
      ]);
    }
  }
  for (const axis of RATE_AXES) {
    const row: Cell[] = new Array<Cell>(header.length).fill(undefined);
    row[0] = 'pair';
    row[1] = a.organs.length > 1 ? 'both' : 'specified'; // without a mirror: every line of the one organ read together
    row[2] = axis;
    row[14] = a.pair[axis].minimumRate;
    row[15] = a.pair[axis].detectable;
    rows.push(row);
  }
  return toCsv(header, rows);
}
