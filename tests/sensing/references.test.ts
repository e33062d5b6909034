/**
 * Reference checks of the sensing physics against published formulas and independent numerical
 * derivations (each source named beside its value).
 */
import { describe, expect, it } from 'vitest';
import { demodulate } from '../../src/sensing/lockin.js';
import { BOLTZMANN, thermalForcePsd, toDegreesPerRootHour } from '../../src/sensing/noise.js';
import { damping, displacementTransfer, forceTransfer, stiffness } from '../../src/sensing/senseMode.js';
import { leverArm, section } from '../../src/sensing/strain.js';
import { forces } from '../../src/forces.js';
import { answerOf, compiled, DEG, example, withFields } from './helpers.js';

describe('thermal force noise 4 k_B T c', () => {
  it('uses k_B = 1.380649e-23 J/K exactly (SI 2019 redefinition)', () => {
    expect(BOLTZMANN).toBe(1.380649e-23); // BIPM SI Brochure, 9th edition (2019): exact
  });

  it('gives the Nyquist (1928) value: a 1 kΩ resistor at 300 K has √(4kTR) ≈ 4.07 nV/√Hz (the mechanical analogue with c in place of R)', () => {
    // Nyquist, Phys. Rev. 32, 110 (1928); 4.07 nV/√Hz for 1 kΩ at 300 K is the usual textbook figure (from memory).
    expect(Math.sqrt(thermalForcePsd(300, 1000))).toBeCloseTo(4.07e-9, 11);
    expect(thermalForcePsd(300, 1000)).toBe(4 * 1.380649e-23 * 300 * 1000);
  });

  it('sensing reports the sense mode force density √(4 k_B T m ω_s / Q)', () => {
    const a = answerOf(withFields(example('mems-sensing'), { output: { series: false, lines: true } }));
    const sm = a.organs[0]?.senseMode;
    const m = 4e-9, ws = 2 * Math.PI * 15.3e3, Q = 800, T = 300;
    expect(sm?.damping).toBeCloseTo((m * ws) / Q, 18);
    expect(sm?.thermalForceDensity).toBeCloseTo(Math.sqrt(4 * 1.380649e-23 * T * ((m * ws) / Q)), 22);
  });
});

describe('sense mode: damped oscillator H(ω) = 1 / (m (ω_s² − ω² + i ω ω_s / Q))', () => {
  const sm = { frequency: 1000, quality: 20, mass: 2e-9 };
  const ws = 2 * Math.PI * sm.frequency;

  // Textbook steady state of m ẍ + c ẋ + k x = F₀ cos ωt: x = X cos(ωt − φ),
  // X = F₀ / √((k − mω²)² + (cω)²), tan φ = cω / (k − mω²) (e.g. Thomson, Theory of Vibration, §3.1).
  const textbook = (w: number) => {
    const k = sm.mass * ws * ws, c = (sm.mass * ws) / sm.quality;
    return { X: 1 / Math.hypot(k - sm.mass * w * w, c * w), phi: Math.atan2(c * w, k - sm.mass * w * w) };
  };

  it.each([['matched', 1.0], ['split below', 0.8], ['split above', 1.3], ['quasi-static', 0.01]])('matches the textbook amplitude and phase lag (%s, ω/ω_s = %f)', (_name, ratio) => {
    const w = ratio * ws;
    const [re, im] = displacementTransfer(sm, w);
    const t = textbook(w);
    expect(Math.hypot(re, im)).toBeCloseTo(t.X, 12);
    expect(Math.atan2(im, re)).toBeCloseTo(-t.phi, 12);
    const [gr, gi] = forceTransfer(sm, w);
    expect(gr * gr + gi * gi).toBeCloseTo((stiffness(sm) * t.X) ** 2, 10);
  });

  it('at resonance gives Q/k and a 90° lag; far below, 1/k (quasi-static)', () => {
    const [re, im] = displacementTransfer(sm, ws);
    expect(Math.abs(re)).toBeLessThan(1e-12 * Math.abs(im));
    expect(-im).toBeCloseTo(sm.quality / stiffness(sm), 10);
    expect(displacementTransfer(sm, 1e-6 * ws)[0]).toBeCloseTo(1 / stiffness(sm), 8);
  });

  it.each([['matched', 1.0], ['split', 0.9]])('agrees with a direct RK4 integration of the equation of motion read by the lock-in (%s)', (_name, ratio) => {
    // Independent numerical derivation: integrate m ẍ + c ẋ + k x = cos(ωt) to steady state.
    const w = ratio * ws, m = sm.mass, c = damping(sm), k = stiffness(sm);
    const n = 200, period = (2 * Math.PI) / w, h = period / n;
    const settle = Math.ceil((10 * 2 * sm.quality) / (2 * Math.PI * ratio)) + 5; // ≥ 10 time constants 2Q/ω_s
    let x = 0, v = 0, t = 0;
    const f = (tt: number, xx: number, vv: number) => (Math.cos(w * tt) - c * vv - k * xx) / m;
    const out = new Float64Array(4 * n);
    for (let step = 0; step < (settle + 4) * n; step++) {
      if (step >= settle * n) out[step - settle * n] = x;
      const k1x = v, k1v = f(t, x, v);
      const k2x = v + (h / 2) * k1v, k2v = f(t + h / 2, x + (h / 2) * k1x, v + (h / 2) * k1v);
      const k3x = v + (h / 2) * k2v, k3v = f(t + h / 2, x + (h / 2) * k2x, v + (h / 2) * k2v);
      const k4x = v + h * k3v, k4v = f(t + h, x + h * k3x, v + h * k3v);
      x += (h / 6) * (k1x + 2 * k2x + 2 * k3x + k4x);
      v += (h / 6) * (k1v + 2 * k2v + 2 * k3v + k4v);
      t += h;
    }
    const d = demodulate(out, { order: 1, pointsPerBeat: n, firstSample: 0 }); // t = settle·period ≡ 0 mod period
    const [re, im] = displacementTransfer(sm, w);
    // RK4 with 200 steps a period: relative error of order (ωh)⁴ ≈ 1e-6; the transient has decayed to ~e⁻¹⁰.
    for (let b = 0; b < 4; b++) {
      expect(Math.abs((d.inPhase[b] as number) - re)).toBeLessThan(2e-5 * Math.hypot(re, im));
      expect(Math.abs((d.quadrature[b] as number) - im)).toBeLessThan(2e-5 * Math.hypot(re, im));
    }
  });
});

describe('sensing(mems): the sense-mode block', () => {
  it('reports |H|, |G| and the displacement per unit yaw rate |H(ω)| · 2 m x ω of the Coriolis force (textbook forced oscillator)', () => {
    const a = answerOf(withFields(example('mems-sensing'), { output: { series: false, lines: true } }));
    const sm = a.organs[0]?.senseMode;
    const m = 4e-9, x = 4e-6, w = 2 * Math.PI * 15e3, ws = 2 * Math.PI * 15.3e3, Q = 800;
    const H = 1 / (m * Math.hypot(ws * ws - w * w, (w * ws) / Q));
    expect(sm?.transfer?.[0]?.magnitude).toBeCloseTo(H, 12);
    expect(sm?.transfer?.[0]?.phase).toBeCloseTo(-Math.atan2((w * ws) / Q, ws * ws - w * w), 12);
    expect(sm?.transfer?.[0]?.forceGain).toBeCloseTo(m * ws * ws * H, 10);
    expect((sm?.perUnitRate?.yaw[0]?.amplitude as number) / (H * 2 * m * x * w)).toBeCloseTo(1, 12);
    expect(sm?.perUnitRate?.roll[0]?.amplitude).toBe(0);
    // The displacement at the scenario's 10 deg/s yaw is that line times the rate (no other load on the sense axis).
    expect((sm?.displacement?.[1]?.amplitude as number) / (H * 2 * m * x * w * 10 * DEG)).toBeCloseTo(1, 12);
  });
});

describe('scale factor across mode matching', () => {
  // A lock-in whose reference follows the drive and compensates the sense mode's lag reads
  // |H(ω)| times the Coriolis force per unit rate: K = ±2 m x ω · |H(ω)|, with
  // |H(ω)| = 1 / (m_s √((ω_s² − ω²)² + (ω ω_s / Q)²)) for the driven damped oscillator (any vibrations
  // text, e.g. Thomson, Theory of Vibration with Applications, ch. 3; from memory) and the Coriolis
  // force −2 m Ω × v on the proof mass. Its sign must not depend on which side of the drive the
  // sense mode sits, nor flip at exact matching.
  const m = 4e-9, x = 4e-6, w = 2 * Math.PI * 15e3, Q = 800;
  const at = (fs: number) => {
    const doc = withFields(example('mems-sensing'), { organ: { ...(example('mems-sensing').organ as object), senseMode: { frequency: fs, quality: Q, mass: '4 ug' } } });
    return answerOf(doc);
  };
  const splits = [-600, -150, -10, 0, 10, 150, 600]; // sense mode minus drive (Hz)

  it('K = ±2 m x ω |H(ω)| with one sign on each organ for every split, exact matching included', () => {
    const signs = new Set<number>();
    for (const d of splits) {
      const ws = 2 * Math.PI * (15e3 + d);
      const H = 1 / (m * Math.hypot(ws * ws - w * w, (w * ws) / Q));
      const a = at(15e3 + d);
      const right = a.organs[0]?.axes.yaw.scaleFactor as number, left = a.organs[1]?.axes.yaw.scaleFactor as number;
      expect(Math.abs(right) / (2 * m * x * w * H), `split ${d} Hz`).toBeCloseTo(1, 10);
      expect(left, `split ${d} Hz: the mirror organ reads the opposite sign`).toBeCloseTo(-right, 22);
      signs.add(Math.sign(right));
    }
    expect([...signs]).toHaveLength(1);
  });

  it('the reference phase is the quasi-static one plus the lag arg H(ω) = −atan2(ω ω_s/Q, ω_s² − ω²), wrapped to (−π, π]', () => {
    const base = (d: number) => {
      const ws = 2 * Math.PI * (15e3 + d);
      const psi = at(15e3 + d).organs[0]?.axes.yaw.channel?.referencePhase as number;
      expect(psi).toBeGreaterThan(-Math.PI);
      expect(psi).toBeLessThanOrEqual(Math.PI);
      return Math.atan2(Math.sin(psi + Math.atan2((w * ws) / Q, ws * ws - w * w)), Math.cos(psi + Math.atan2((w * ws) / Q, ws * ws - w * w)));
    };
    const psi0 = base(splits[0] as number);
    for (const d of splits) expect(Math.cos(base(d) - psi0), `split ${d} Hz`).toBeCloseTo(1, 12);
  });
});

describe('Brownian noise-equivalent rate of a driven proof mass', () => {
  // Standard expression for the mechanical-thermal (Brownian) noise floor of a vibratory gyroscope
  // (Leland 2005, IEEE Sensors J. 5(3), 493–500; the form below from memory): the thermal force
  // √(4 k_B T c) over the Coriolis force per rate 2 m x_d ω_d,
  //   Ω_n = √(4 k_B T m_s ω_s / Q) / (2 m x_d ω_d) = √(k_B T ω_s / (m Q)) / (x_d ω_d)  (m_s = m),
  // in rad/√s. Convention here: Ω_n is the angle random walk coefficient N (σ_Ω(T) = N/√T),
  // i.e. the √ of the two-sided rate PSD; the one-sided rate-noise density is √2·N.
  const mems = (fs: string, senseMass = '4 ug') => {
    const doc = withFields(example('mems-sensing'), { organ: { ...(example('mems-sensing').organ as object), senseMode: { frequency: fs, quality: 800, mass: senseMass } } });
    doc.sensor = { temperature: '300 K', integration: '10 ms' }; // no readout noise
    return doc;
  };

  it.each([['matched', '15 kHz', '4 ug'], ['split', '15.3 kHz', '4 ug'], ['split, lighter sense mass', '15.3 kHz', '3 ug']])('sensing matches it without readout noise (%s)', (_name, fs, ms) => {
    const a = answerOf(mems(fs, ms));
    const yaw = a.organs[0]?.axes.yaw;
    const m = 4e-9, msense = Number.parseFloat(ms) * 1e-9, x = 4e-6, w = 2 * Math.PI * 15e3, ws = 2 * Math.PI * Number.parseFloat(fs) * 1e3, Q = 800, T = 300;
    const N = Math.sqrt((4 * 1.380649e-23 * T * msense * ws) / Q) / (2 * m * x * w);
    const arwRad = (yaw?.angleRandomWalk as number) / ((180 / Math.PI) * 60);
    expect(arwRad / N).toBeCloseTo(1, 10);
    expect((yaw?.rateNoiseDensity as number) / (Math.SQRT2 * N)).toBeCloseTo(1, 10);
    expect((yaw?.minimumRate as number) / (N / Math.sqrt(0.01))).toBeCloseTo(1, 10);
    expect(yaw?.noise?.limitedBy).toBe('thermal');
  });
});

describe('stalk section and base strain', () => {
  it('tube second moment I = π(r_o⁴ − r_i⁴)/4 and area π(r_o² − r_i²) (Roark, Table A.1)', () => {
    const s = section({ length: 1e-3, outerRadius: 40e-6, innerRadius: 30e-6, modulus: 5e9, mass: 0 });
    expect(s.secondMomentNormal).toBeCloseTo((Math.PI * (40e-6 ** 4 - 30e-6 ** 4)) / 4, 30);
    expect(s.secondMomentInPlane).toBe(s.secondMomentNormal);
    expect(s.area).toBeCloseTo(Math.PI * (40e-6 ** 2 - 30e-6 ** 2), 20);
  });

  it('hollow ellipse second moments equal a direct numerical integration of ∫ y² dA over the section', () => {
    const [an, ap, bn, bp] = [50e-6, 30e-6, 35e-6, 20e-6];
    const s = section({ length: 1e-3, outerSemiAxes: [an, ap], innerSemiAxes: [bn, bp], modulus: 5e9, mass: 0 });
    // Midpoint rule on a grid over the bounding box (independent of the closed form).
    const G = 1500;
    let In = 0, Ip = 0, A = 0;
    const dy = (2 * an) / G, dx = (2 * ap) / G;
    for (let i = 0; i < G; i++) {
      const yn = -an + (i + 0.5) * dy;
      for (let j = 0; j < G; j++) {
        const xp = -ap + (j + 0.5) * dx;
        const inside = (yn / an) ** 2 + (xp / ap) ** 2 <= 1 && (yn / bn) ** 2 + (xp / bp) ** 2 > 1;
        if (!inside) continue;
        In += yn * yn * dx * dy;
        Ip += xp * xp * dx * dy;
        A += dx * dy;
      }
    }
    expect(In / s.secondMomentNormal).toBeCloseTo(1, 2);
    expect(Ip / s.secondMomentInPlane).toBeCloseTo(1, 2);
    expect(A / s.area).toBeCloseTo(1, 2);
  });

  it('lever arm J/μ equals ∫s² dm / ∫s dm summed over a finely divided stalk plus the knob', () => {
    const organ = { mass: 6e-9, arm: 0.85e-3, stalk: { length: 0.8e-3, mass: 1e-9 } };
    let J = organ.mass * organ.arm ** 2, mu = organ.mass * organ.arm;
    const n = 100000;
    for (let i = 0; i < n; i++) {
      const sx = ((i + 0.5) / n) * organ.stalk.length, dm = organ.stalk.mass / n;
      J += sx * sx * dm;
      mu += sx * dm;
    }
    const c = compiled(withFields(example('fly-sensing'), {}));
    const o = c.scenario.organ as Parameters<typeof leverArm>[0];
    expect(leverArm(o)).toBeCloseTo(J / mu, 12);
  });

  it('base strain of a massless stalk is −F L c/(E I) of the core\'s normal load line (Roark Table 8.1, end-loaded cantilever: M = W l, σ = M c / I)', () => {
    const doc = withFields(example('fly-sensing'), {
      organ: { ...(example('fly-sensing').organ as object), stalk: { length: '0.85 mm', outerRadius: '40 um', innerRadius: '30 um', modulus: '5 GPa', mass: 0 } },
      body: { rate: { roll: '50 deg/s', pitch: '-30 deg/s', yaw: '200 deg/s' }, gravity: true },
      output: { series: false, lines: true },
    });
    const a = answerOf(doc);
    const f = forces(doc);
    if (!f.ok) throw new Error('forces');
    const E = 5e9, L = 0.85e-3, c = 40e-6, I = (Math.PI * (40e-6 ** 4 - 30e-6 ** 4)) / 4, A = Math.PI * (40e-6 ** 2 - 30e-6 ** 2);
    for (const [oi, organ] of a.organs.entries()) {
      const lines = f.answer.organs[oi]?.harmonics ?? [];
      for (const [axis, strainAxis, perN] of [['normal', 'outOfPlane', -(L * c) / (E * I)], ['tangential', 'inPlane', -(L * c) / (E * I)], ['radial', 'axial', 1 / (E * A)]] as const) {
        for (let k = 0; k <= 8; k++) {
          const F = lines.find((l) => l.component === 'total' && l.axis === axis && l.order === k);
          const e = organ.strain?.harmonics?.find((l) => l.axis === strainAxis && l.order === k);
          expect(e?.amplitude).toBeCloseTo(Math.abs(perN) * (F?.amplitude ?? NaN), 14);
          if ((F?.amplitude ?? 0) > 1e-12) {
            const expected = perN < 0 ? (F?.phase ?? 0) + Math.PI : (F?.phase ?? 0);
            expect(Math.cos((e?.phase ?? 0) - expected)).toBeCloseTo(1, 9);
          }
        }
      }
    }
  });
});

describe('angle random walk conventions', () => {
  it('0.01 deg/s/√Hz corresponds to 0.6 deg/√h (common practice; IEEE Std 952 unit conversion, clause not checked)', () => {
    expect(toDegreesPerRootHour(0.01 * DEG)).toBeCloseTo(0.6, 12);
  });

  it('white rate noise of one-sided density n has Allan variance N²/τ with N = n/√2 (IEEE Std 952 Annex C definition of N), Monte Carlo', async () => {
    const { normalSource } = await import('./random.js');
    const rnd = normalSource(952);
    const n = 0.01, fs = 100, samples = 400_000;
    const sd = n * Math.sqrt(fs / 2); // one-sided density n over the band fs/2
    const y = new Float64Array(samples);
    for (let i = 0; i < samples; i++) y[i] = sd * rnd();
    for (const m of [10, 100]) {
      const tau = m / fs, clusters = Math.floor(samples / m);
      const means = new Float64Array(clusters);
      for (let c = 0; c < clusters; c++) {
        let s = 0;
        for (let i = 0; i < m; i++) s += y[c * m + i] as number;
        means[c] = s / m;
      }
      let avar = 0;
      for (let c = 0; c + 1 < clusters; c++) avar += ((means[c + 1] as number) - (means[c] as number)) ** 2;
      avar /= 2 * (clusters - 1);
      const N = n / Math.SQRT2;
      const rel = Math.sqrt(2 / (clusters - 1)); // standard error of a variance estimate (approximately)
      expect(Math.abs(avar / (N * N / tau) - 1)).toBeLessThan(4 * rel);
    }
  });
});
