/** Turns (design §7): what the sensor sees during a body maneuver, beat by beat. */
export { turn, turnOf, turnNumbers, planOf, CACHED_SAMPLES, TURN_UNITS, type TurnAnswer, type TurnResult, type TurnSeries, type BeatRow, type Readout, type ChannelAnswer, type PeakStrain, type TurnNumbers } from './turn.js';
export { ManeuverSchema, DecimateSchema, MAX_TERMS, type Maneuver, type Decimate, type ProfileTerm } from './schema.js';
export { rateProfile, axisAt, sampleAxis, spline, type RateProfile, type Term, type Spline } from './profiles.js';
export { fromEuler, toEuler, integrateAttitude, gravitySeries, type Quaternion, type QuaternionSeries } from './attitude.js';
export { allocTurn, runTurn, turnPlan, type TurnPlan, type TurnRun, type TurnWorkspace, type TurnInput } from './run.js';
export { channelsOf, type Channel } from './channels.js';
export { beatsCsv, turnSeriesCsv } from './tables.js';
export type { Leaf } from './series.js';
