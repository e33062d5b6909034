/**
 * Stalk strain at the base (design §6): an Euler–Bernoulli cantilever of elastic modulus E with a
 * hollow elliptical section (a tube when the semi-axes are equal). Semi-axes are given along the
 * stroke-plane normal (a_n, b_n) and in the stroke plane (a_p, b_p), outer a and inner b:
 *
 *   I_n = π (a_n³ a_p − b_n³ b_p) / 4   bending under a normal load (neutral axis in the plane)
 *   I_p = π (a_p³ a_n − b_p³ b_n) / 4   bending under a tangential load
 *   A   = π (a_n a_p − b_n b_p)
 *
 * (hollow ellipse, Roark's Formulas for Stress and Strain, Table A.1; a tube gives
 * I = π (r_o⁴ − r_i⁴)/4). The base moment of an organ-frame load F is M = F ℓ, and the strain at
 * the outer fibre ε = −M c / (E I) (Roark Table 8.1, end-loaded cantilever: M = W l at the fixed
 * end, σ = M c / I), taken on the fibre at +normal (+tangential): a load along +normal bends the
 * stalk that way and compresses that fibre. Axial strain ε = F_r / (E A), tension positive.
 *
 * Lever arm ℓ = J / μ with J = m L² + m_s L_s²/3 (∫ s² dm) and μ = m L + m_s L_s/2 (∫ s dm): exact
 * for the loads proportional to the distance along the arm (primary, Coriolis, and the arm terms of
 * the centrifugal and angular-acceleration loads), whose base moment is ∫ s dF = F J/μ. Loads that
 * are uniform along the arm (gravity, translational, hinge-offset terms) have ℓ = μ / (m + m_s)
 * instead; the two agree when the stalk is massless (ℓ = L). docs/sensing.md says so.
 */
import type { RotaryOrgan } from '../scenario.js';

export interface Section {
  /** Outer semi-axes [normal, in-plane] (m). */
  outer: [number, number];
  /** Inner semi-axes [normal, in-plane] (m); [0, 0] for a solid stalk. */
  inner: [number, number];
  /** I_n (m⁴): bending under a load along the stroke-plane normal. */
  secondMomentNormal: number;
  /** I_p (m⁴): bending under a load along the tangential axis. */
  secondMomentInPlane: number;
  /** A (m²). */
  area: number;
}

type Stalk = NonNullable<RotaryOrgan['stalk']>;

/** The section of a stalk (outer/inner radius or semi-axes; the schema has checked them). */
export function section(stalk: Stalk): Section {
  const outer: [number, number] = stalk.outerSemiAxes ?? [stalk.outerRadius ?? 0, stalk.outerRadius ?? 0];
  const inner: [number, number] = stalk.innerSemiAxes ?? [stalk.innerRadius ?? 0, stalk.innerRadius ?? 0];
  const [an, ap] = outer, [bn, bp] = inner;
  return {
    outer,
    inner,
    secondMomentNormal: (Math.PI * (an ** 3 * ap - bn ** 3 * bp)) / 4,
    secondMomentInPlane: (Math.PI * (ap ** 3 * an - bp ** 3 * bn)) / 4,
    area: Math.PI * (an * ap - bn * bp),
  };
}

/** ℓ = J / μ (m): the lever arm of the loads that grow along the arm (see the module note). */
export function leverArm(organ: RotaryOrgan): number {
  const ms = organ.stalk?.mass ?? 0, ls = organ.stalk?.length ?? 0;
  const J = organ.mass * organ.arm ** 2 + (ms * ls ** 2) / 3;
  const mu = organ.mass * organ.arm + (ms * ls) / 2;
  return J / mu;
}

/**
 * Strain at the base per newton of load on each organ axis [radial, tangential, normal]:
 * axial 1/(E A), in-plane −ℓ a_p/(E I_p), out-of-plane −ℓ a_n/(E I_n) (1/N).
 */
export function strainPerLoad(stalk: Stalk, s: Section, lever: number): [number, number, number] {
  const E = stalk.modulus;
  return [1 / (E * s.area), (-lever * s.outer[1]) / (E * s.secondMomentInPlane), (-lever * s.outer[0]) / (E * s.secondMomentNormal)];
}

/** Names of the strains on the organ axes [radial, tangential, normal]. */
export const STRAIN_AXES = ['axial', 'inPlane', 'outOfPlane'] as const;
export type StrainAxis = (typeof STRAIN_AXES)[number];
