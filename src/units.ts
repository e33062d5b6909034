/**
 * Quantities: a number in SI base units, or a string with units parsed by mathjs.
 * One module owns every dimension the scenario uses and the wording of dimension errors.
 */
import { unit as mathUnit } from 'mathjs';

/** mathjs dimension order: mass, length, time, current, temperature, luminous, amount, angle, bit. */
type Dims = [number, number, number, number, number, number, number, number, number];

export interface Dimension {
  readonly name: string; // "a mass"
  readonly si: string; // "kg"
  readonly example: string; // "12 ug"
  readonly dims: Dims;
}

const d = (name: string, si: string, example: string, dims: Partial<Record<'M' | 'L' | 'T' | 'K' | 'A', number>>): Dimension => ({
  name,
  si,
  example,
  dims: [dims.M ?? 0, dims.L ?? 0, dims.T ?? 0, 0, dims.K ?? 0, 0, 0, dims.A ?? 0, 0],
});

export const DIMENSIONS = {
  mass: d('a mass', 'kg', '7 ug', { M: 1 }),
  length: d('a length', 'm', '0.9 mm', { L: 1 }),
  time: d('a time', 's', '20 ms', { T: 1 }),
  frequency: d('a frequency', 'Hz', '170 Hz', { T: -1 }),
  angle: d('an angle', 'rad', '80 deg', { A: 1 }),
  angularRate: d('an angular rate', 'rad/s', '200 deg/s', { A: 1, T: -1 }),
  angularAcceleration: d('an angular acceleration', 'rad/s^2', '5000 deg/s^2', { A: 1, T: -2 }),
  acceleration: d('an acceleration', 'm/s^2', '9.81 m/s^2', { L: 1, T: -2 }),
  temperature: d('a temperature', 'K', '300 K', { K: 1 }),
  pressure: d('a pressure (elastic modulus)', 'Pa', '5 GPa', { M: 1, L: -1, T: -2 }),
  forceDensity: d('a force noise density', 'N/Hz^0.5', '2e-10 N / Hz^0.5', { M: 1, L: 1, T: -1.5 }),
  strainDensity: d('a strain noise density', '1/Hz^0.5', '1e-7 / Hz^0.5', { T: 0.5 }),
  displacementDensity: d('a displacement noise density', 'm/Hz^0.5', '1e-12 m / Hz^0.5', { L: 1, T: 0.5 }),
  dimensionless: d('a plain number', '1', '15', {}),
} as const satisfies Record<string, Dimension>;

export type DimensionName = keyof typeof DIMENSIONS;

export type Parsed = { ok: true; value: number; dimension: DimensionName } | { ok: false; message: string };

const MAX_STRING = 80;

/** Round away the binary noise that SI prefixes leave ('12 ug' → 1.2e-8, not 1.2000000000000002e-8). */
export const clean = (x: number): number => (x === 0 ? 0 : Number(x.toPrecision(15)));

const show = (v: unknown): string => (typeof v === 'string' ? `'${v}'` : String(v));

const sameDims = (a: readonly number[], b: readonly number[]): boolean =>
  a.length === b.length && a.every((x, i) => Math.abs(x - (b[i] ?? 0)) < 1e-12);

/** Parse a unit string into SI; the dimension decides whether it fits one of `accepted`. */
function parseString(text: string, accepted: readonly DimensionName[]): Parsed {
  const src = text.trim().replace(/[µμ]/g, 'u').replace(/sqrt\(\s*([A-Za-z]+)\s*\)/g, '$1^0.5');
  if (src.length === 0 || text.length > MAX_STRING) return { ok: false, message: 'is empty or too long' };
  if (/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(src)) {
    return { ok: true, value: Number(src), dimension: accepted[0] ?? 'dimensionless' };
  }
  let parsed;
  try {
    parsed = mathUnit(src);
  } catch {
    return { ok: false, message: 'is not a quantity with known units' };
  }
  if (parsed.value === null || parsed.value === undefined) return { ok: false, message: 'has units but no number' };
  const dims = parsed.dimensions;
  const match = accepted.find((name) => sameDims(dims, DIMENSIONS[name].dims));
  if (!match) return { ok: false, message: 'wrong dimension' };
  const si = parsed.toSI().toNumber();
  return { ok: true, value: clean(si), dimension: match };
}

/**
 * A quantity in SI: `value` is a finite number (taken as SI) or a unit string whose dimension is
 * one of `accepted`. On failure, `message` names the value and what was expected.
 */
export function toSI(value: unknown, accepted: readonly DimensionName[]): Parsed {
  if (typeof value === 'number' && Number.isFinite(value)) return { ok: true, value, dimension: accepted[0] ?? 'dimensionless' };
  const key = typeof value === 'string' ? `${accepted.join(',')}|${value}` : '';
  const hit = stringCache.get(key);
  if (hit !== undefined) return hit;
  const first = DIMENSIONS[accepted[0] ?? 'dimensionless'];
  const expected = accepted.map((n) => DIMENSIONS[n].name).join(' or ');
  const hint = `expected ${expected}: a number in ${first.si} or a string such as '${first.example}'`;
  if (typeof value === 'number') return { ok: false, message: `${show(value)} is not a finite number; ${hint}` };
  if (typeof value !== 'string') return { ok: false, message: `${show(JSON.stringify(value) ?? value)} is not a quantity; ${hint}` };
  const out = stringToSI(value, accepted, expected, hint);
  if (stringCache.size >= STRING_CACHE_SIZE) stringCache.delete(stringCache.keys().next().value as string);
  stringCache.set(key, out);
  return out;
}

/**
 * mathjs takes about 5–15 µs per unit string and a service sees the same few strings again and
 * again, so answers for strings (values or messages; they depend on the string and the accepted
 * dimensions alone) are kept in a bounded map, oldest dropped first.
 */
const STRING_CACHE_SIZE = 4096;
const stringCache = new Map<string, Parsed>();

function stringToSI(value: string, accepted: readonly DimensionName[], expected: string, hint: string): Parsed {
  const r = parseString(value, accepted);
  if (r.ok) {
    if (!Number.isFinite(r.value)) return { ok: false, message: `${show(value)} is not finite; ${hint}` };
    return r;
  }
  if (r.message === 'wrong dimension') return { ok: false, message: `${show(value)} is not ${expected}; ${hint}` };
  return { ok: false, message: `${show(value)} ${r.message}; ${hint}` };
}
