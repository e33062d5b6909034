/**
 * Quantity fields of the scenario schemas (zod): a number in SI or a unit string, converted to an
 * SI number with its dimension checked. One module so that every schema (scenario, maneuver)
 * words its refusals alike.
 */
import { z } from 'zod';
import { type DimensionName, DIMENSIONS, toSI } from './units.js';

/** A value as quoted in a message: strings in quotes, long JSON cut short. */
export const show = (v: unknown): string => {
  if (typeof v === 'string') return `'${v}'`;
  if (v === undefined) return 'nothing';
  if (typeof v === 'number') return String(v);
  // Documents reach the schemas only after the nesting check (nestingIssues), so v is finite and shallow.
  const s = JSON.stringify(v);
  return s === undefined ? String(v) : s.length > 40 ? `${s.slice(0, 37)}...` : s;
};

export type Rule = 'positive' | 'nonNegative' | 'any';

const hintFor = (accepted: readonly DimensionName[]): string => {
  const first = DIMENSIONS[accepted[0] ?? 'dimensionless'];
  return `expected ${accepted.map((n) => DIMENSIONS[n].name).join(' or ')}: a number in ${first.si} or a string such as '${first.example}'`;
};

const ruleMessage = (rule: Rule, v: unknown, why: string): string =>
  (rule === 'positive' ? `${show(v)} must be greater than zero` : `${show(v)} must not be negative`) + (why ? `; ${why}` : '');

const breaks = (rule: Rule, x: number): boolean => (rule === 'positive' ? !(x > 0) : rule === 'nonNegative' ? x < 0 : false);

/** The zod base of every quantity: a number (SI) or a unit string. */
const numberOrString = (hint: string) =>
  z.union([z.number(), z.string()], { error: (iss) => (iss.input === undefined ? `is required; ${hint}` : `${show(iss.input)} is not a quantity; ${hint}`) });

/** Convert a number or unit string to SI, checking dimension and sign; undefined after an issue. */
function convert<D extends DimensionName>(v: number | string, ctx: z.RefinementCtx, dims: readonly D[], rule: Rule, why: string): { value: number; dimension: D } | undefined {
  const r = toSI(v, dims);
  if (!r.ok) {
    ctx.addIssue({ code: 'custom', message: r.message });
    return undefined;
  }
  if (breaks(rule, r.value)) {
    ctx.addIssue({ code: 'custom', message: ruleMessage(rule, v, why) });
    return undefined;
  }
  return { value: r.value, dimension: r.dimension as D };
}

/** A quantity that may come in one of several dimensions; the answer keeps which one it was. */
export function quantityOneOf<D extends DimensionName>(dims: readonly D[], rule: Rule = 'any', why = '') {
  return numberOrString(hintFor(dims)).transform((v, ctx) => convert(v, ctx, dims, rule, why) ?? z.NEVER);
}

/**
 * A dimensional quantity: number (SI) or unit string, converted to an SI number. One transform
 * (not quantityOneOf's followed by a second that keeps the value): parsing a scenario runs this
 * for every quantity field.
 */
export const quantity = (dim: DimensionName, rule: Rule = 'any', why = '') => {
  const dims = [dim] as const;
  return numberOrString(hintFor(dims)).transform((v, ctx) => convert(v, ctx, dims, rule, why)?.value ?? z.NEVER);
};
