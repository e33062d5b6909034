/**
 * Harmonic lines (design §5) against the npm fft.js FFT and a plain DFT, Parseval's theorem, the
 * phase convention, and the least-squares fit of measured traces (recovery within the noise,
 * residual RMS, refused traces).
 */
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { COMPONENTS } from '../../src/components.js';
import { allocHarmonics, amplitudePhase, lineIndex, loadHarmonics } from '../../src/harmonics.js';
import { compile, forces, parseScenario, type ForcesAnswer } from '../../src/index.js';
import { allocLoads } from '../../src/loads.js';
import { Matrix, SVD } from 'ml-matrix';
import { beatTable, fitTrace } from '../../src/waveform.js';
import { gaussian, prng } from './independent.js';

const require = createRequire(import.meta.url);
interface FFTInstance { createComplexArray(): number[]; realTransform(out: number[], input: ArrayLike<number>): void; completeSpectrum(out: number[]): void }
const FFT = require('fft.js') as new (size: number) => FFTInstance;

const run = (doc: unknown): ForcesAnswer => {
  const r = forces(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.answer;
};

/** (p_k, q_k) of x = Σ p_k cos kωt + q_k sin kωt from fft.js: X_k = Σ x_j e^{−2πikj/N}. */
function fftLines(x: ArrayLike<number>, K: number): [number, number][] {
  const f = new FFT(x.length);
  const out = f.createComplexArray();
  f.realTransform(out, x);
  f.completeSpectrum(out);
  const N = x.length;
  return Array.from({ length: K + 1 }, (_, k) => (k === 0 ? [(out[0] as number) / N, 0] : [(2 * (out[2 * k] as number)) / N, (-2 * (out[2 * k + 1] as number)) / N]));
}

/** A plain DFT with Math.cos/Math.sin per term (any N). */
function plainLines(x: ArrayLike<number>, K: number): [number, number][] {
  const N = x.length;
  return Array.from({ length: K + 1 }, (_, k) => {
    let re = 0, im = 0;
    for (let j = 0; j < N; j++) {
      re += (x[j] as number) * Math.cos((2 * Math.PI * k * j) / N);
      im += (x[j] as number) * Math.sin((2 * Math.PI * k * j) / N);
    }
    return k === 0 ? [re / N, 0] : [(2 * re) / N, (2 * im) / N];
  });
}

const pq = (l: { amplitude: number; phase: number }): [number, number] => [l.amplitude * Math.cos(l.phase), -l.amplitude * Math.sin(l.phase)];

describe('harmonic lines of the sampled path', () => {
  it('agree with the fft.js FFT on every component and axis of a forces answer (N = 256, orders 0..40)', () => {
    const K = 40;
    const a = run({
      organ: { mass: '6 ug', arm: '0.85 mm', frequency: '180 Hz', amplitude: '85 deg', mean: '10 deg', waveform: { triangle: { rounding: 0.4 } }, rest: [0, 1, 0], normal: [0.906, 0, 0.423], hinge: ['0.3 mm', '0.45 mm', '-0.2 mm'], deviation: { harmonics: [{ order: 2, sin: '6 deg' }] } },
      body: { rate: { roll: '100 deg/s', yaw: '300 deg/s' }, gravity: true, acceleration: ['2 m/s^2', 0, 0] },
      sampling: { pointsPerBeat: 256, harmonics: K },
      output: { path: 'sampled' },
    });
    for (const organ of a.organs) {
      const series = organ.series!.loads as Record<string, Record<string, number[]>>;
      for (const c of COMPONENTS) {
        for (const [axis, x] of Object.entries(series[c]!)) {
          const ref = fftLines(x, K);
          const scale = Math.max(...x.map(Math.abs));
          if (scale === 0) continue;
          for (let k = 0; k <= K; k++) {
            const line = organ.harmonics.find((l) => l.component === c && l.axis === axis && l.order === k)!;
            const [p, q] = pq(line);
            expect(Math.abs(p - (ref[k]![0])) / scale, `${organ.role} ${c} ${axis} k=${k}`).toBeLessThan(1e-13);
            expect(Math.abs(q - (ref[k]![1])) / scale, `${organ.role} ${c} ${axis} k=${k}`).toBeLessThan(1e-13);
          }
        }
      }
    }
  });

  it('loadHarmonics agrees with fft.js (N = 64, 128) and a plain DFT (N = 63, 66, 100, 8) on random series, every order up to N/2 − 1', () => {
    const rnd = prng(11);
    for (const n of [64, 128, 63, 66, 100, 8]) {
      const K = Math.floor(n / 2) - 1;
      const beat = allocLoads(n);
      for (let c = 0; c < 6; c++) for (let a = 0; a < 6; a++) for (let j = 0; j < n; j++) {
        const v = rnd() - 0.5;
        beat.data[(c * 6 + a) * n + j] = v;
        beat.data[(6 * 6 + a) * n + j] = (beat.data[(6 * 6 + a) * n + j] as number) + v; // the total is the sum
      }
      const t = loadHarmonics(beat, n, beatTable(n), K, allocHarmonics(K));
      for (let c = 0; c < 7; c++) {
        for (let a = 0; a < 6; a++) {
          const x = beat.data.subarray((c * 6 + a) * n, (c * 6 + a + 1) * n);
          const ref = (n & (n - 1)) === 0 ? fftLines(x, K) : plainLines(x, K);
          for (let k = 0; k <= K; k++) {
            const i = lineIndex(t, c, a, k);
            expect(Math.abs((t.pq[i] as number) - ref[k]![0]), `n=${n} c=${c} a=${a} k=${k}`).toBeLessThan(1e-14);
            expect(Math.abs((t.pq[i + 1] as number) - ref[k]![1]), `n=${n} c=${c} a=${a} k=${k}`).toBeLessThan(1e-14);
          }
        }
      }
    }
  });

  it('hold Parseval: mean square = A0² + Σ A_k²/2 when every order up to N/2 − 1 is requested', () => {
    const a = run({
      organ: { mass: '6 ug', arm: '0.85 mm', frequency: '180 Hz', amplitude: '30 deg', rest: [0, 1, 0], normal: [0.906, 0, 0.423], hinge: ['0.3 mm', '0.45 mm', '-0.2 mm'] },
      body: { rate: { pitch: '800 deg/s', yaw: '300 deg/s' }, gravity: true },
      sampling: { pointsPerBeat: 64, harmonics: 31 },
      output: { path: 'sampled' },
    });
    let checked = 0;
    for (const organ of a.organs) {
      const all = Object.values(organ.series!.loads).flatMap((byAxis) => Object.values(byAxis as Record<string, number[]>));
      const largest = Math.max(...all.map((x) => x.reduce((s, v) => s + v * v, 0) / x.length));
      for (const [c, byAxis] of Object.entries(organ.series!.loads)) {
        for (const [axis, x] of Object.entries(byAxis as Record<string, number[]>)) {
          const meanSquare = x.reduce((s, v) => s + v * v, 0) / x.length;
          // Series that are zero up to rounding (e.g. primary·normal, 1e-20 N) carry white rounding
          // noise up to the Nyquist bin, which no line below N/2 holds: leave them out.
          if (meanSquare < 1e-18 * largest) continue;
          const lines = organ.harmonics.filter((l) => l.component === c && l.axis === axis);
          const energy = lines.reduce((s, l) => s + (l.order === 0 ? l.amplitude ** 2 : l.amplitude ** 2 / 2), 0);
          expect(Math.abs(energy - meanSquare) / meanSquare, `${c} ${axis}`).toBeLessThan(1e-12);
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(20);
  });

  it('follow the phase convention x = A cos(kωt + ψ): p = A cos ψ, q = −A sin ψ, ψ ∈ (−π, π]', () => {
    expect(amplitudePhase(0, -2, 1)).toEqual({ amplitude: 2, phase: Math.PI / 2 }); // −2 sin → 2 cos(u + π/2)
    expect(amplitudePhase(-3, 0, 2)).toEqual({ amplitude: 3, phase: Math.PI }); // never −π
    expect(amplitudePhase(-3, 0, 0)).toEqual({ amplitude: 3, phase: Math.PI }); // a negative mean
    expect(amplitudePhase(0, 0, 4)).toEqual({ amplitude: 0, phase: 0 });
    // A linear organ driven x = X sin ωt: primary·drive = −m ẍ = m X ω² sin ωt = m X ω² cos(ωt − π/2).
    const a = run({ organ: { drive: 'linear', mass: 1e-9, frequency: 1000, amplitude: 1e-6, driveAxis: [0, 1, 0], senseAxis: [1, 0, 0] }, output: { path: 'sampled' } });
    const l = a.organs[0]!.harmonics.find((x) => x.component === 'primary' && x.axis === 'drive' && x.order === 1)!;
    expect(l.amplitude / (1e-9 * 1e-6 * (2 * Math.PI * 1000) ** 2)).toBeCloseTo(1, 12);
    expect(l.phase).toBeCloseTo(-Math.PI / 2, 12);
  });

  it('warns when the sampling is too coarse for the waveform (aliasing)', () => {
    const a = run({ organ: { mass: 6e-9, arm: 8.5e-4, frequency: 180, amplitude: 1.4, waveform: { triangle: { rounding: 0.1 } }, rest: [0, 1, 0], normal: [1, 0, 0] }, sampling: { pointsPerBeat: 16, harmonics: 4 } });
    expect(a.warnings.some((w) => /alias/.test(w))).toBe(true);
    const fine = run({ organ: { mass: 6e-9, arm: 8.5e-4, frequency: 180, amplitude: 0.2, rest: [0, 1, 0], normal: [1, 0, 0] }, sampling: { pointsPerBeat: 256, harmonics: 8 } });
    expect(fine.warnings).toEqual([]);
  });
});

describe('fit of a measured trace (waveform samples)', () => {
  const f = 150;
  const truth = { mean: 0.1, terms: [{ order: 1, cos: 0.2, sin: 1.2 }, { order: 2, cos: -0.1, sin: 0.04 }, { order: 3, cos: 0, sin: 0.15 }] };
  const clean = (t: number) => truth.terms.reduce((s, h) => s + h.cos * Math.cos(2 * Math.PI * h.order * f * t) + h.sin * Math.sin(2 * Math.PI * h.order * f * t), truth.mean);
  const trace = (points: number, beats: number, sigma: number, seed: number) => {
    const g = gaussian(prng(seed));
    const time = Array.from({ length: points }, (_, i) => (i * beats) / f / points + 1.3e-4);
    return { time, angle: time.map((t) => clean(t) + sigma * g()) };
  };
  const organ = { mass: 6e-9, arm: 8.5e-4, frequency: f, rest: [0, 1, 0], normal: [1, 0, 0] };

  it('recovers known coefficients from a noisy trace within the noise, and reports residual RMS ≈ σ', () => {
    const sigma = 0.02, points = 600, K = 4;
    const doc = { organ: { ...organ, waveform: { samples: trace(points, 1.7, sigma, 5), harmonics: K } } };
    const p = parseScenario(doc);
    if (!p.ok) throw new Error(JSON.stringify(p.issues));
    const c = compile(p.scenario);
    if (!c.ok) throw new Error(JSON.stringify(c.issues));
    const w = c.model.geometry.stroke;
    if (w.kind !== 'series') throw new Error('expected a series');
    // Standard error of a coefficient ≈ σ √(2/n) for points spread over the beat; allow 4 of them.
    const se = sigma * Math.sqrt(2 / points);
    expect(Math.abs(w.mean - truth.mean)).toBeLessThan(4 * sigma / Math.sqrt(points));
    for (let k = 1; k <= K; k++) {
      const want = truth.terms.find((h) => h.order === k) ?? { cos: 0, sin: 0 };
      expect(Math.abs((w.cos[k - 1] as number) - want.cos), `a_${k}`).toBeLessThan(4 * se);
      expect(Math.abs((w.sin[k - 1] as number) - want.sin), `b_${k}`).toBeLessThan(4 * se);
    }
    // RMS of the residual: σ √(1 − (2K+1)/n) in expectation, with a relative spread of about 1/√(2n).
    const fit = c.model.fit!;
    expect(fit.residualRms / (sigma * Math.sqrt(1 - (2 * K + 1) / points))).toBeGreaterThan(1 - 4 / Math.sqrt(2 * points));
    expect(fit.residualRms / (sigma * Math.sqrt(1 - (2 * K + 1) / points))).toBeLessThan(1 + 4 / Math.sqrt(2 * points));
    expect(fit.points).toBe(points);
    expect(fit.spanBeats).toBeCloseTo(1.7 * (points - 1) / points, 10);
    // forces reports the same fit
    expect(run(doc).fit).toEqual(fit);
  });

  it('when the scenario\'s frequency misses the trace\'s beat, the warning names the beat its mean crossings give and the residual there', () => {
    // A trace beating at f = 150 Hz over 6 beats, given to a scenario that says 156 Hz (4 % off).
    const sigma = 0.02, points = 900, K = 4;
    const samples = trace(points, 6, sigma, 7);
    const wrong = run({ organ: { ...organ, frequency: 156, waveform: { samples, harmonics: K } }, output: { series: false } });
    const hint = wrong.warnings.find((w) => w.startsWith("the fit's residual RMS"));
    expect(hint).toBeDefined();
    const m = /mean give ([\d.]+) Hz, where the residual RMS is ([\d.e-]+):/.exec(hint ?? '');
    expect(m, hint).not.toBeNull();
    // The crossing estimate averages 5 periods: within 0.5 % of the true beat here.
    expect(Number(m?.[1]) / f).toBeCloseTo(1, 2);
    // At that frequency the residual is back near the noise σ √(1 − (2K+1)/n) (within 10 %: the estimate is not exact);
    // E[RSS] = (n − p) σ² for a least-squares fit with p parameters (Gauss–Markov, any regression text).
    expect(Number(m?.[2]) / (sigma * Math.sqrt(1 - (2 * K + 1) / points))).toBeLessThan(1.1);
    // At the right frequency there is no such warning.
    expect(run({ organ: { ...organ, waveform: { samples, harmonics: K } }, output: { series: false } }).warnings.filter((w) => w.includes('residual RMS'))).toEqual([]);
  });

  it('solves the least-squares problem as an SVD solve does (ml-matrix), to its condition number times rounding, and refuses the same traces', () => {
    // Reference: ml-matrix's SVD of the whole n × (2K+1) design matrix, built with Math.cos/sin per
    // entry; the core uses Householder QR and the angle-addition recurrence. Random traces, from
    // well covered (5 beats) to a few percent of a beat (condition numbers up to ~1e8 and far beyond).
    const rnd = prng(23);
    let compared = 0, refused = 0;
    for (let trial = 0; trial < 60; trial++) {
      const K = 1 + Math.floor(rnd() * 10), n = 2 * K + 1 + Math.floor(rnd() * 300), fr = 50 + rnd() * 300;
      const span = trial % 6 === 0 ? 0.02 + 0.05 * rnd() : 0.15 + 5 * rnd(); // every sixth: a few percent of a beat
      const t0 = 0.003 * rnd();
      const time = Array.from({ length: n }, (_, i) => t0 + (i / (n - 1)) * (span / fr));
      const values = time.map((t) => 1.2 * Math.sin(2 * Math.PI * fr * t) + 0.3 * Math.cos(4 * Math.PI * fr * t) + 0.05 * (rnd() - 0.5));
      const a = new Matrix(n, 2 * K + 1);
      time.forEach((t, i) => {
        a.set(i, 0, 1);
        for (let k = 1; k <= K; k++) {
          a.set(i, 2 * k - 1, Math.cos(2 * Math.PI * fr * k * t));
          a.set(i, 2 * k, Math.sin(2 * Math.PI * fr * k * t));
        }
      });
      const svd = new SVD(a, { autoTranspose: true });
      const ours = fitTrace(time, values, fr, K);
      if (!(svd.condition < 1e8)) {
        // at the threshold both may land either side of it; far beyond, both refuse
        if (svd.condition > 1e9) expect(ours.error, `cond ${svd.condition}`).toBeDefined();
        refused++;
        continue;
      }
      if (svd.condition < 1e7) expect(ours.error).toBeUndefined();
      if (ours.error) continue;
      const x = svd.solve(Matrix.columnVector(values)).to1DArray();
      const w = ours.wave;
      if (w.kind !== 'series') throw new Error('expected a series');
      const got = [w.mean, ...Array.from({ length: K }, (_, k) => [w.cos[k] as number, w.sin[k] as number]).flat()];
      const scale = Math.max(...x.map(Math.abs));
      const diff = Math.max(...got.map((v, i) => Math.abs(v - (x[i] as number))));
      expect(diff / scale, `n ${n}, K ${K}, ${span.toFixed(2)} beats, cond ${svd.condition.toPrecision(3)}`).toBeLessThan(1e-13 * Math.max(1, svd.condition));
      expect(ours.fit?.conditionNumber as number / svd.condition).toBeCloseTo(1, 6);
      compared++;
    }
    expect(compared).toBeGreaterThan(40);
    expect(refused).toBeGreaterThan(0);
  });

  it('recovers the coefficients exactly (to rounding) from a clean trace', () => {
    const p = parseScenario({ organ: { ...organ, waveform: { samples: trace(200, 1.2, 0, 1), harmonics: 3 } } });
    if (!p.ok) throw new Error(JSON.stringify(p.issues));
    const c = compile(p.scenario);
    if (!c.ok) throw new Error(JSON.stringify(c.issues));
    const w = c.model.geometry.stroke;
    if (w.kind !== 'series') throw new Error('expected a series');
    for (const h of truth.terms) {
      expect(w.cos[h.order - 1]).toBeCloseTo(h.cos, 12);
      expect(w.sin[h.order - 1]).toBeCloseTo(h.sin, 12);
    }
    expect(c.model.fit!.residualRms).toBeLessThan(1e-13);
  });

  it('refuses traces that cannot support K harmonics, with the field named', () => {
    const t = trace(40, 1, 0.01, 2);
    const with_ = (samples: unknown, harmonics = 3) => forces({ organ: { ...organ, waveform: { samples, harmonics } } });
    const issues = (r: ReturnType<typeof forces>) => (r.ok ? [] : r.issues);
    expect(issues(with_({ time: t.time.slice(0, 6), angle: t.angle.slice(0, 6) }))).toEqual([
      { path: 'organ.waveform.samples.time', message: '6 points cannot support 3 harmonics; expected at least 2K+1 = 7 points' },
    ]);
    const back = [...t.time];
    back[5] = back[4] as number;
    expect(issues(with_({ time: back, angle: t.angle }))).toEqual([
      { path: 'organ.waveform.samples.time[5]', message: `${back[5]} does not come after ${back[4]}; expected times strictly increasing` },
    ]);
    expect(issues(with_({ time: t.time, angle: t.angle.map((x, i) => (i === 2 ? Number.NaN : x)) }))).toEqual([
      { path: 'organ.waveform.samples.angle[2]', message: 'NaN is not a finite number' },
    ]);
    expect(issues(with_({ time: t.time, angle: t.angle.map((x, i) => (i === 4 ? 'a' : x)) }))).toEqual([
      { path: 'organ.waveform.samples.angle[4]', message: "'a' is not a finite number" },
    ]);
    expect(issues(with_({ time: t.time, angle: t.angle.slice(1) }))).toEqual([
      { path: 'organ.waveform.samples.angle', message: 'has 39 points but time has 40; expected one angle per time' },
    ]);
    // 5% of a beat cannot carry 8 harmonics: the design matrix is singular.
    const short = Array.from({ length: 200 }, (_, i) => (i / 200) * (0.05 / f));
    const ill = issues(with_({ time: short, angle: short.map((x) => Math.sin(2 * Math.PI * f * x)) }, 8));
    expect(ill.map((i) => i.path)).toEqual(['organ.waveform.samples']);
    expect(ill[0]?.message).toMatch(/^the trace \(200 points over 0\.0498 beats\) cannot support 8 harmonics at 150 Hz: the fit is singular \(condition number [0-9.e+]+\); use fewer harmonics or a trace that covers a whole beat$/);
    expect(issues(with_({ time: t.time, angle: t.angle, timeUnit: 'kg' }))).toEqual([
      { path: 'organ.waveform.samples.timeUnit', message: "'kg' is not a unit of time; expected e.g. 'ms'" },
    ]);
  });

  it('takes units for the trace (ms and deg)', () => {
    const t = trace(120, 1.5, 0, 3);
    const inUnits = { time: t.time.map((x) => x * 1000), angle: t.angle.map((x) => (x * 180) / Math.PI), timeUnit: 'ms', angleUnit: 'deg' };
    const a = run({ organ: { ...organ, waveform: { samples: inUnits, harmonics: 3 } } });
    const b = run({ organ: { ...organ, waveform: { samples: t, harmonics: 3 } } });
    const la = a.organs[0]!.harmonics, lb = b.organs[0]!.harmonics;
    const scale = Math.max(...lb.map((l) => l.amplitude));
    la.forEach((l, i) => expect(Math.abs(l.amplitude - lb[i]!.amplitude)).toBeLessThanOrEqual(1e-10 * scale));
    expect(a.fit!.residualRms).toBeLessThan(1e-6); // the trace in degrees was rounded by nothing: a clean fit
  });
});
