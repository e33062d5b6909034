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
 *   covariance (Hᵀ R⁻¹ H)⁻¹, condition number, per-axis minimum rate and confusions;
 *   `estimateRates(analysis, y)` turns one set of channel outputs y (e.g. one beat's
 *   in-phase outputs, in the order of the rows) into the estimated [roll, pitch, yaw] (rad/s);
 *   `estimatorGain(analysis)` gives the same estimator as a 3 × n matrix.
 * - `prepareSensing(scenario, model)` — every number behind a sensing answer, kept by the caller:
 *   `organs[o].channels` (rows in the detection.ts `CH` layout: organ axis b, order k, transfer
 *   T = [tr, ti] from load line to the channel's quantity, one-sided noise PSD, reference phase ψ,
 *   in-phase scale factors K for roll, pitch, yaw) and `pairRows` + `pair` (the pair analysis
 *   over those channels, in that order). To read a channel from a load series F(t) on organ axis b
 *   (quasi-static channel): demodulate F at order k with ψ_F = ψ − arg T and multiply by |T|; that
 *   is the channel's in-phase output y, and `estimateRates(pair, y)` the rate estimate.
 * - `rateSweep(prepared, rates)` — in-phase outputs of each organ's best channel per axis, their
 *   SNR, and the pair's estimate, for many constant rates (3 numbers per rate, rad/s) at once.
 */
export { demodulate, lockIn, lineOutputs, outputNoise, type Demodulated, type DemodulateOptions } from './lockin.js';
export { analysePair, estimateRates, estimatorGain, RATE_AXES, type Confusion, type PairAnalysis, type PairOptions, type PairRow, type RateAxis } from './pair.js';
export { sensing, sensingOf, sensingAnswer, prepareSensing, rateSweep, readPlan, CONVENTIONS, SENSING_UNITS, FRAME_AXES, type SensingAnswer, type SensingResult, type SensingPlan, type OrganSensing, type AxisSensing, type PairSensing, type StrainAnswer, type SenseModeAnswer, type RateSweep } from './sensing.js';
export { organLines, centrifugalForm, type OrganLines } from './lines.js';
export { CH, organChannels, type Quantity, type ReadPlan, type Bias } from './detection.js';
export { displacementTransfer, forceTransfer, senseAxisIndex, type SenseMode } from './senseMode.js';
export { section, leverArm, strainPerLoad, type Section } from './strain.js';
export { BOLTZMANN, thermalForcePsd, rateNoiseDensity, angleRandomWalkCoefficient, toDegreesPerRootHour } from './noise.js';
export { sensingCsv } from './table.js';
