import FFT from 'fft.js';
import { describe, expect, it } from 'vitest';
import { demodulate, lockIn, outputNoise } from '../../src/sensing/lockin.js';
import { mean, normalSource, std } from './random.js';

describe('demodulate(x, {order, referencePhase})', () => {
  it('gives I = A cos(ψ − ψ_ref), Q = A sin(ψ − ψ_ref) for a line and rejects the other harmonics', () => {
    const n = 64, beats = 3, k = 3, A = 0.7, psi = 1.1, ref = -0.4;
    const x = new Float64Array(n * beats);
    for (let j = 0; j < x.length; j++) {
      const u = (2 * Math.PI * j) / n;
      x[j] = 5 + A * Math.cos(k * u + psi) + 2 * Math.cos(u) - 3 * Math.sin(2 * u + 0.3) + 0.5 * Math.cos(7 * u);
    }
    const d = demodulate(x, { order: k, pointsPerBeat: n, referencePhase: ref });
    expect(d.inPhase.length).toBe(beats);
    for (let b = 0; b < beats; b++) {
      expect(d.inPhase[b]).toBeCloseTo(A * Math.cos(psi - ref), 12);
      expect(d.quadrature[b]).toBeCloseTo(A * Math.sin(psi - ref), 12);
    }
  });

  it('agrees with an independent FFT (fft.js): I + iQ = (2/N) X_k e^{−iψ_ref}, with the phase kept referred to t = 0 when the series starts later', () => {
    const n = 128, k = 5, ref = 0.9, first = 37;
    const rnd = normalSource(7);
    const beat = Array.from({ length: n }, () => rnd());
    // The series starts at sample `first` of a periodic signal.
    const x = Float64Array.from({ length: 2 * n }, (_, j) => beat[(first + j) % n] as number);
    const fft = new FFT(n);
    const out = fft.createComplexArray();
    fft.realTransform(out, beat);
    fft.completeSpectrum(out);
    const re = (2 / n) * (out[2 * k] as number), im = (2 / n) * (out[2 * k + 1] as number);
    // X_k = Σ x e^{−i2πkj/N} = (N/2)(p − i q) = (N/2) Z.
    const I = re * Math.cos(ref) + im * Math.sin(ref), Q = im * Math.cos(ref) - re * Math.sin(ref);
    const d = demodulate(x, { order: k, pointsPerBeat: n, referencePhase: ref, firstSample: first });
    for (let b = 0; b < 2; b++) {
      expect(d.inPhase[b]).toBeCloseTo(I, 12);
      expect(d.quadrature[b]).toBeCloseTo(Q, 12);
    }
  });

  it('reads series packed in one array through start and beats', () => {
    const n = 32;
    const x = new Float64Array(3 * n);
    for (let j = 0; j < n; j++) x[n + j] = Math.cos((4 * Math.PI * j) / n);
    const d = demodulate(x, { order: 2, pointsPerBeat: n, start: n, beats: 1 });
    expect(d.inPhase[0]).toBeCloseTo(1, 14);
    expect(d.quadrature[0]).toBeCloseTo(0, 14);
  });
});

describe('lockIn(noise) Monte Carlo', () => {
  // White noise of one-sided PSD S sampled at fs has variance S·fs/2 per sample (its band is fs/2).
  // The formula under test: σ_I = σ_Q = √(S/T) over T = beats/f (derived in docs/sensing.md).
  it('gives the amplitude spread √(S/T) for one-sided white S, within the statistical error', () => {
    const f = 200, n = 32, beats = 25, trials = 3000, S = 4e-6;
    const fs = n * f, T = beats / f;
    const sd = Math.sqrt((S * fs) / 2);
    const rnd = normalSource(20240611);
    const x = new Float64Array(n * beats);
    const I = new Float64Array(trials), Q = new Float64Array(trials);
    for (let t = 0; t < trials; t++) {
      for (let j = 0; j < x.length; j++) x[j] = sd * rnd();
      const r = lockIn(x, { order: 3, pointsPerBeat: n, referencePhase: 0.3 });
      I[t] = r.inPhase;
      Q[t] = r.quadrature;
    }
    const expected = outputNoise(S, T);
    const rel = 1 / Math.sqrt(2 * (trials - 1)); // standard error of a sample standard deviation
    expect(Math.abs(std(I) / expected - 1)).toBeLessThan(4 * rel);
    expect(Math.abs(std(Q) / expected - 1)).toBeLessThan(4 * rel);
    expect(Math.abs(mean(I))).toBeLessThan((4 * expected) / Math.sqrt(trials));
    // I and Q are uncorrelated: their correlation coefficient is within 4/√trials of zero.
    let c = 0;
    for (let t = 0; t < trials; t++) c += (I[t] as number) * (Q[t] as number);
    expect(Math.abs(c / trials / (std(I) * std(Q)))).toBeLessThan(4 / Math.sqrt(trials));
  });
});
