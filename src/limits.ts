/**
 * Limits on the work one request may ask for. Exceeding one is refused with its name
 * (HTTP 413 in the service, exit code 2 in the command line); see README "Limits".
 */
export const LIMITS = {
  /** pointsPerBeat × beats for one organ in `forces`/`sensing`. */
  samplesPerRequest: 65_536,
  /** Points per beat. */
  pointsPerBeat: 8_192,
  /** Highest harmonic order reported. */
  harmonics: 64,
  /** Points in a measured stroke trace or a sampled rate profile. */
  tracePoints: 100_000,
  /** Harmonics fitted to a measured trace. */
  fitHarmonics: 64,
  /** Terms in a `harmonics` waveform. */
  waveformTerms: 256,
  /** Numbers in the series of one turn answer (series × kept samples); decimate to fit. */
  seriesValues: 2_097_152,
} as const;

export type LimitName = keyof typeof LIMITS;
