/**
 * Limits on the work one request may ask for. Exceeding one is refused with its name
 * (HTTP 413 in the service, exit code 3 in the command line); see README "Limits".
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
  /** points × (2K+1)² of one trace fit (its QR costs about twice that in flops: about 0.5 s at the limit here). */
  fitWork: 100_000_000,
  /** Terms in a `harmonics` waveform. */
  waveformTerms: 256,
  /** Numbers in the series of one turn answer (series × kept samples); decimate to fit. */
  seriesValues: 2_097_152,
  /** Levels of arrays and objects in one document (a scenario needs at most 7, a sweep request 8). */
  nesting: 32,
} as const;

export type LimitName = keyof typeof LIMITS;

/**
 * True when `v` (at level `depth`) holds an array or object deeper than `max`: the common case,
 * without building paths. The recursion stops at level max + 1, so the stack stays shallow.
 */
function deeperThan(v: object, depth: number, max: number): boolean {
  if (depth > max) return true;
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      const x: unknown = v[i];
      if (x !== null && typeof x === 'object' && deeperThan(x, depth + 1, max)) return true;
    }
    return false;
  }
  for (const k in v) {
    const x = (v as Record<string, unknown>)[k];
    if (x !== null && typeof x === 'object' && deeperThan(x, depth + 1, max)) return true;
  }
  return false;
}

/**
 * The path to the first array or object nested deeper than `max` levels in a parsed JSON value
 * (the document itself is level 1), or undefined when none is. Iterative, so that a document of
 * any depth is measured without using the call stack; the walk stops at the first offender.
 */
export function nestedTooDeep(doc: unknown, max: number = LIMITS.nesting): (string | number)[] | undefined {
  if (doc === null || typeof doc !== 'object' || !deeperThan(doc, 1, max)) return undefined;
  // Containers still to visit, their depths and the index in `steps` of the key that led to each.
  const todo: object[] = [doc];
  const depths: number[] = [1];
  const via: number[] = [-1];
  const steps: { key: string | number; parent: number }[] = [];
  while (todo.length > 0) {
    const v = todo.pop() as object, depth = depths.pop() as number, at = via.pop() as number;
    if (depth > max) {
      const path: (string | number)[] = [];
      for (let i = at; i >= 0; ) {
        const s = steps[i] as { key: string | number; parent: number };
        path.push(s.key);
        i = s.parent;
      }
      return path.reverse();
    }
    const visit = (key: string | number, child: unknown): void => {
      if (child === null || typeof child !== 'object') return;
      steps.push({ key, parent: at });
      todo.push(child);
      depths.push(depth + 1);
      via.push(steps.length - 1);
    };
    if (Array.isArray(v)) for (let i = 0; i < v.length; i++) visit(i, v[i]);
    else for (const key of Object.keys(v)) visit(key, (v as Record<string, unknown>)[key]);
  }
  return undefined;
}
