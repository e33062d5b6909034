/**
 * Noise under the lines (design §6), as one-sided power spectral densities (unit²/Hz):
 *
 * - thermo-mechanical force noise of the sense mode, S_F = 4 k_B T c with c = m ω_s / Q
 *   (Nyquist 1928; fluctuation–dissipation theorem), white, acting on the sense axis like the load;
 * - the readout's own noise, given as a density in the quantity it reads (force, strain or
 *   displacement) and taken as white.
 *
 * Rate noise from a channel with one-sided noise S at its line and in-phase scale factor K
 * (unit per rad/s): the lock-in output over T has σ = √(S/T), i.e. a rate spread σ_Ω = √(S/T)/|K|.
 * As a baseband rate signal this is white noise of one-sided density n = √(2S)/|K|
 * ((rad/s)/√Hz; a T-average of one-sided density n has variance n²/(2T)). The angle random walk
 * coefficient N of IEEE Std 952 (Allan variance σ²(τ) = N²/τ for white rate noise, its PSD level
 * N² taken two-sided) is N = n/√2 = √S/|K|, so σ_Ω(T) = N/√T.
 */

/** Boltzmann constant (J/K), exact since the 2019 SI redefinition. */
export const BOLTZMANN = 1.380649e-23;

/** S_F = 4 k_B T c (N²/Hz, one-sided). */
export const thermalForcePsd = (temperature: number, damping: number): number => 4 * BOLTZMANN * temperature * damping;

/** One-sided rate-noise density n = √(2S)/|K| ((rad/s)/√Hz). */
export const rateNoiseDensity = (psd: number, scaleFactor: number): number => Math.sqrt(2 * psd) / Math.abs(scaleFactor);

/** Angle random walk coefficient N = √S/|K| (rad/√s), IEEE Std 952 convention (see note). */
export const angleRandomWalkCoefficient = (psd: number, scaleFactor: number): number => Math.sqrt(psd) / Math.abs(scaleFactor);

/**
 * N in rad/√s to deg/√h: 1 rad/√s = (180/π) deg/√s and 1/√s = 60/√h, so N[deg/√h] =
 * 60 · N[deg/s/√Hz] (common practice: 0.01 deg/s/√Hz ↔ 0.6 deg/√h).
 */
export const toDegreesPerRootHour = (radPerRootSecond: number): number => radPerRootSecond * (180 / Math.PI) * 60;
