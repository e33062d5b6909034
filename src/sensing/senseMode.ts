/**
 * The sense mode (design §6): the sense axis (organ `normal` for a rotary organ, `sense` for a
 * linear one) moves as a damped oscillator of effective mass m, natural frequency ω_s = 2π f_s and
 * quality factor Q, driven by the load along that axis:
 *
 *   m ẍ + c ẋ + k x = F,   k = m ω_s²,   c = m ω_s / Q,
 *   H(ω) = x̂ / F̂ = 1 / (m (ω_s² − ω² + i ω ω_s / Q))   (lines written as Re{Z e^{iωt}}).
 *
 * The force the mode passes on to its frame through the spring is k x = G(ω) F with
 * G(ω) = k H(ω) = 1 / (1 − r² + i r / Q), r = ω/ω_s: G → 1 well below resonance (quasi-static),
 * G = −iQ at resonance. Mode-matched and mode-split designs both follow from H.
 */
export interface SenseMode {
  frequency: number;
  quality: number;
  mass: number;
}

/** Index of the sense axis in the organ frame [radial|drive, tangential|sense, normal|cross]. */
export const senseAxisIndex = (drive: 'rotary' | 'linear'): number => (drive === 'rotary' ? 2 : 1);

export const stiffness = (s: SenseMode): number => s.mass * (2 * Math.PI * s.frequency) ** 2;
export const damping = (s: SenseMode): number => (s.mass * 2 * Math.PI * s.frequency) / s.quality;

/** H(ω) (m/N) as [re, im]. */
export function displacementTransfer(s: SenseMode, omega: number): [number, number] {
  const ws = 2 * Math.PI * s.frequency;
  const re = ws * ws - omega * omega, im = (omega * ws) / s.quality;
  const d = s.mass * (re * re + im * im);
  return [re / d, -im / d];
}

/** G(ω) = k H(ω) (dimensionless) as [re, im]. */
export function forceTransfer(s: SenseMode, omega: number): [number, number] {
  const r = omega / (2 * Math.PI * s.frequency);
  const re = 1 - r * r, im = r / s.quality;
  const d = re * re + im * im;
  return [re / d, -im / d];
}
