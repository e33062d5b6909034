/**
 * Limits of the service itself; the core's limits on work per request are in src/limits.ts and
 * the sweep's in src/sweep.ts (SWEEP_LIMITS). Each refusal names its limit (HTTP 413).
 */
export const SERVICE_LIMITS = {
  /** Request body size (bytes). */
  bodyBytes: 2 * 1024 * 1024,
  /** Samples per organ when an answer carries series (pointsPerBeat × beats, output.series on). */
  seriesSamples: 8_192,
  /** Compute-time budget of one sweep (ms), checked between grid points. */
  sweepTimeMs: 5_000,
  /** Time to receive a whole request (ms). */
  requestTimeoutMs: 30_000,
  /** The answer store (server/answers.ts): all kept answers together (bytes); BEATFORCE_ANSWER_CACHE_MB. */
  answerCacheBytes: 32 * 1024 * 1024,
  /** The largest single answer kept (bytes). */
  answerCacheEntryBytes: 1024 * 1024,
} as const;
