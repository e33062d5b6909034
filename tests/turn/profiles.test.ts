import { describe, expect, it } from 'vitest';
import { axisAt, rateProfile, sampleAxis, spline, type Term } from '../../src/turn/profiles.js';

/** Central difference with one Richardson step: error O(h⁴) (Abramowitz & Stegun 25.3.6 family). */
const derivative = (f: (t: number) => number, t: number, h: number): number => {
  const d = (k: number) => (f(t + k) - f(t - k)) / (2 * k);
  return (4 * d(h / 2) - d(h)) / 3;
};

const pulse = (peak: number, duration: number, start: number): Term => ({ kind: 'pulse', peak, duration, start });
const sine = (amplitude: number, frequency: number, phase: number): Term => ({ kind: 'sine', amplitude, frequency, phase });

describe('pulse profile', () => {
  const p = pulse(26.18, 0.06, 0.04);
  const rate = (t: number) => axisAt([p], t).rate;

  it('axisAt(pulse) peaks at the middle, is zero outside and has area peak·duration/2', () => {
    expect(rate(0.07)).toBeCloseTo(26.18, 12); // hand-derived: (P/2)(1 − cos π) = P
    expect(rate(0.0399)).toBe(0);
    expect(rate(0.1001)).toBe(0);
    // area of a raised-cosine bell = P D / 2 (hand-derived), by the trapezoid rule on 6001 points
    const n = 6000, h = 0.06 / n;
    let area = 0;
    for (let i = 0; i <= n; i++) area += (i === 0 || i === n ? 0.5 : 1) * rate(0.04 + i * h);
    expect(area * h).toBeCloseTo((26.18 * 0.06) / 2, 10);
  });

  it('axisAt(pulse) gives the angular acceleration of the analytic derivative', () => {
    for (const t of [0.041, 0.05, 0.055, 0.07, 0.085, 0.0999]) {
      expect(axisAt([p], t).acceleration).toBeCloseTo(derivative(rate, t, 1e-4), 4);
    }
    // hand-derived maximum: πP/D at a quarter of the pulse
    expect(axisAt([p], 0.055).acceleration).toBeCloseTo((Math.PI * 26.18) / 0.06, 8);
  });

  it('axisAt(pulse) is continuous with its derivative at both ends (raised cosine)', () => {
    for (const edge of [0.04, 0.1]) {
      for (const eps of [-1e-12, 1e-12]) {
        expect(Math.abs(rate(edge + eps))).toBeLessThan(1e-12);
        expect(Math.abs(axisAt([p], edge + eps).acceleration)).toBeLessThan(1e-6); // Ω̈ ≈ 1.4e5 rad/s³ there
      }
    }
  });
});

describe('sine profile', () => {
  const s = sine(3.49, 12, 0.3);
  const rate = (t: number) => axisAt([s], t).rate;
  it('axisAt(sine) matches A sin(2πft + φ) and its analytic derivative', () => {
    for (const t of [0, 0.013, 0.05, 0.11, 0.19]) {
      expect(rate(t)).toBeCloseTo(3.49 * Math.sin(2 * Math.PI * 12 * t + 0.3), 13);
      expect(axisAt([s], t).acceleration).toBeCloseTo(derivative(rate, t, 1e-4), 6);
    }
    expect(axisAt([sine(1, 5, 0)], 0).acceleration).toBeCloseTo(2 * Math.PI * 5, 12); // hand-derived
  });
});

describe('samples profile (not-a-knot cubic spline)', () => {
  const f = (t: number) => Math.sin(2 * Math.PI * 3 * t) * Math.exp(-t);
  const df = (t: number) => Math.exp(-t) * (2 * Math.PI * 3 * Math.cos(2 * Math.PI * 3 * t) - Math.sin(2 * Math.PI * 3 * t));
  const errors = (points: number): [number, number] => {
    const time = Array.from({ length: points }, (_, i) => (0.2 * i) / (points - 1));
    const sp = spline(time, time.map(f));
    let e0 = 0, e1 = 0;
    for (let i = 0; i <= 1000; i++) {
      const t = (0.2 * i) / 1000;
      const r = axisAt([sp], t);
      e0 = Math.max(e0, Math.abs(r.rate - f(t)));
      e1 = Math.max(e1, Math.abs(r.acceleration - df(t)));
    }
    return [e0, e1];
  };

  it('spline(trace) reproduces a smooth profile and its derivative, fourth/third order in the spacing', () => {
    const [a0, a1] = errors(41);
    const [b0, b1] = errors(81);
    expect(a0).toBeLessThan(1e-5);
    expect(a1).toBeLessThan(2e-3);
    // halving the spacing divides the error by about 2⁴ (values) and 2³ (derivative): de Boor ch. IV
    expect(a0 / b0).toBeGreaterThan(12);
    expect(a1 / b1).toBeGreaterThan(6.5);
  });

  it('spline(trace) reproduces any cubic exactly (not-a-knot end conditions), on uneven knots', () => {
    const c = (t: number) => 0.3 - 2 * t + 5 * t * t - 7 * t * t * t;
    const dc = (t: number) => -2 + 10 * t - 21 * t * t;
    const time = [0, 0.013, 0.05, 0.06, 0.11, 0.13, 0.2];
    const sp = spline(time, time.map(c));
    for (const t of [0, 0.007, 0.031, 0.09, 0.155, 0.2 - 1e-12]) {
      const r = axisAt([sp], t);
      expect(r.rate).toBeCloseTo(c(t), 12);
      expect(r.acceleration).toBeCloseTo(dc(t), 10);
    }
  });

  it('spline(two points) is the line, spline(three points) the parabola through them', () => {
    const line = spline([0, 0.1], [1, 3]);
    expect(axisAt([line], 0.025).rate).toBeCloseTo(1.5, 14);
    expect(axisAt([line], 0.025).acceleration).toBeCloseTo(20, 12);
    const para = spline([0, 0.1, 0.3], [0, 0.01, 0.09]); // y = t²
    expect(axisAt([para], 0.2).rate).toBeCloseTo(0.04, 14);
    expect(axisAt([para], 0.2).acceleration).toBeCloseTo(0.4, 12);
  });

  it('spline(trace) has a continuous angular acceleration across every knot', () => {
    const time = [0, 0.02, 0.05, 0.07, 0.12, 0.2];
    const sp = spline(time, [0, 1, -0.5, 2, 0.3, 0]);
    for (const k of time.slice(1, -1)) {
      const left = axisAt([sp], k - 1e-12).acceleration;
      const right = axisAt([sp], k + 1e-12).acceleration;
      expect(Math.abs(left - right)).toBeLessThan(1e-6);
    }
  });

  it('spline(trace) holds the end rates outside the trace, with zero angular acceleration', () => {
    const sp = spline([0.01, 0.05, 0.09], [1, 2, 0.5]);
    expect(axisAt([sp], 0).rate).toBe(1);
    expect(axisAt([sp], 0).acceleration).toBe(0);
    expect(axisAt([sp], 0.5).rate).toBe(0.5);
  });
});

describe('sampleAxis(terms)', () => {
  it('equals axisAt on the grid, with terms that add', () => {
    const terms: Term[] = [{ kind: 'constant', rate: 0.5 }, pulse(2, 0.03, 0.01), sine(0.2, 20, 1), spline([0, 0.02, 0.03, 0.05], [0, 1, 0.5, 0.2])];
    const n = 301, dt = 0.06 / (n - 1);
    const r = new Float64Array(n), a = new Float64Array(n);
    sampleAxis(terms, dt, n, r, a);
    for (let j = 0; j < n; j += 7) {
      const p = axisAt(terms, j * dt);
      expect(r[j]).toBeCloseTo(p.rate, 13);
      expect(a[j]).toBeCloseTo(p.acceleration, 10);
    }
  });

  it('rateProfile(maneuver) puts roll, pitch and yaw in body-axis order and fits splines once', () => {
    const p = rateProfile({ yaw: [{ kind: 'constant', rate: 3 }], roll: [{ kind: 'samples', time: [0, 1], rate: [0, 1] }] });
    expect(p.axes[0][0]?.kind).toBe('spline');
    expect(p.axes[1]).toEqual([]);
    expect(axisAt(p.axes[2], 0.3).rate).toBe(3);
  });
});
