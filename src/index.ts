/** The library API: the same documents and answers as the command line and the service. */
export { forces, forcesOf, organNumbers, sampleOrgan, UNITS, type ForcesAnswer, type ForcesResult, type OrganAnswer, type Path } from './forces.js';
export { parseScenario, ScenarioSchema, type Issue, type Scenario, type ScenarioInput } from './scenario.js';
export { compile, type Model, type Geometry, type Motion } from './model.js';
export { COMPONENTS, ROTARY_AXES, LINEAR_AXES, type Component, type Axis } from './components.js';
export { amplitudePhase, type Line } from './harmonics.js';
export { besselJ } from './bessel.js';
export { toSI, DIMENSIONS } from './units.js';
export { LIMITS } from './limits.js';
export { harmonicsCsv, seriesCsv } from './tables.js';
export { toCsv } from './csv.js';
export { sweep, sweepCsv, SweepRequestSchema, SWEEP_FIELDS, SWEEP_LIMITS, type SweepAnswer, type SweepRequestInput, type SweepResult } from './sweep.js';
export { turn, turnOf, beatsCsv, turnSeriesCsv, ManeuverSchema, DecimateSchema, type TurnAnswer, type TurnResult, type Maneuver } from './turn/index.js';
export { VERSION } from './version.js';
export { sensing, sensingOf, prepareSensing, rateSweep, demodulate, lockIn, analysePair, estimateRates, type SensingAnswer, type SensingResult, type SensingPlan, type RateSweep } from './sensing/index.js';
