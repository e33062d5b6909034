/** Number formatting for labels and ticks: SI prefixes, a few significant digits. */
const PREFIXES: [number, string][] = [
  [1e9, 'G'], [1e6, 'M'], [1e3, 'k'], [1, ''], [1e-3, 'm'], [1e-6, 'µ'], [1e-9, 'n'], [1e-12, 'p'], [1e-15, 'f'], [1e-18, 'a'],
];

/** 4.2e-8, 'N' → "42 nN"; plain numbers outside the prefix range fall back to e-notation. */
export function eng(x: number | null | undefined, unit = '', digits = 3): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  if (x === 0) return `0${unit ? ` ${unit}` : ''}`;
  const a = Math.abs(x);
  const found = PREFIXES.find(([f]) => a >= f * 0.9995);
  if (!found || a >= 1e12) return `${x.toExponential(digits - 1)}${unit ? ` ${unit}` : ''}`;
  const [f, p] = found;
  const v = Number((x / f).toPrecision(digits));
  return `${v} ${p}${unit}`.trim();
}

/** A plain number with `digits` significant figures, e-notation when very large or small. */
export function num(x: number | null | undefined, digits = 3): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1e5 || a < 1e-3 ? x.toExponential(digits - 1) : String(Number(x.toPrecision(digits)));
}

export const RAD_TO_DEG = 180 / Math.PI;
