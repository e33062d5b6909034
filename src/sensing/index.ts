/**
 * Sensing (design §6): what a sensor at the organ's base sees, the noise under it, and the
 * smallest detectable turn, for one organ and for the mirrored pair read together.
 *
 * Reusable pieces (for turns, sweeps and scripts):
 *
 * - `demodulate(x, { order, pointsPerBeat, referencePhase, firstSample, start, beats })` — the
 *   lock-in: per-beat in-phase I_b and quadrature Q_b of a sampled series at harmonic k with the
 *   reference cos(kωt + ψ_ref), t = 0 at the waveform's origin (`firstSample` = index of the first
 *   sample counted from t = 0). A line A cos(kωt + ψ) gives I = A cos(ψ − ψ_ref),
 *   Q = A sin(ψ − ψ_ref). `lockIn` averages the beats; `outputNoise(S, T)` = √(S/T) is the
 *   spread of I or Q for one-sided white noise S.
 * - `analysePair(rows, { threshold })` — the pair sensitivity matrix: rows are channels
 *   `{ sensitivity: [roll, pitch, yaw] in-phase output per rad/s, sigma }`; returns the rate
 *   covariance (Hᵀ R⁻¹ H)⁻¹, condition number, per-axis minimum rate, confusions and the estimator
 *   gain; `estimateRates(analysis, y)` turns one set of channel outputs y (e.g. one beat's
 *   in-phase outputs, in the order of the rows) into the estimated [roll, pitch, yaw] (rad/s).
 */
export { demodulate, lockIn, lineOutputs, outputNoise, type Demodulated, type DemodulateOptions } from './lockin.js';
export { analysePair, estimateRates, RATE_AXES, type Confusion, type PairAnalysis, type PairOptions, type PairRow, type RateAxis } from './pair.js';
