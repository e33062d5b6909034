import { describe, expect, it } from 'vitest';
import { forces } from '../../src/forces.js';
import { amplitudePhase } from '../../src/harmonics.js';
import { CH } from '../../src/sensing/detection.js';
import { demodulate, lineOutputs } from '../../src/sensing/lockin.js';
import { estimateRates } from '../../src/sensing/pair.js';
import { lineOf, prepareSensing, rateSweep, sensing, sensingOf } from '../../src/sensing/sensing.js';
import { sensingCsv } from '../../src/sensing/table.js';
import { answerOf, compiled, DEG, example, withFields } from './helpers.js';
import { mean, normalSource, std } from './random.js';

const RATES = ['roll', 'pitch', 'yaw'] as const;

describe('sensing(example)', () => {
  it.each(['fly-sensing', 'mems-sensing'])('answers %s with the contract fields (design §9)', (name) => {
    const a = answerOf(example(name));
    expect(a.version).toMatch(/^\d+\.\d+\.\d+/);
    expect(a.units.rate).toBe('rad/s');
    expect(a.conventions.angleRandomWalk).toMatch(/IEEE Std 952/);
    expect(a.organs.map((o) => o.role)).toEqual(['specified', 'mirror']);
    for (const o of a.organs) {
      for (const axis of RATES) {
        expect(Object.keys(o.axes[axis])).toEqual(expect.arrayContaining(['channel', 'scaleFactor', 'snr', 'minimumRate', 'rateNoiseDensity', 'angleRandomWalk', 'bias']));
      }
    }
    for (const axis of RATES) expect(a.pair[axis]).toHaveProperty('minimumRate');
    expect(a.pair).toHaveProperty('conditionNumber');
    expect(a.pair.matrix.length).toBe(a.pair.channels);
  });

  it('fly example: quasi-static strain, readout-limited; MEMS example: sense-mode displacement, thermally limited', () => {
    const fly = answerOf(example('fly-sensing'));
    expect(fly.organs[0]?.read.quantity).toBe('strain');
    expect(fly.organs[0]?.strain?.dynamic).toBeNull();
    expect(fly.organs[0]?.axes.yaw.noise?.limitedBy).toBe('readout');
    const mems = answerOf(example('mems-sensing'));
    expect(mems.organs[0]?.read).toEqual({ axes: ['sense'], quantity: 'displacement', unit: 'm' });
    expect(mems.organs[0]?.axes.yaw.noise?.limitedBy).toBe('thermal');
    // A z-axis tuning fork sees yaw only; the pair says so.
    expect(mems.pair.confusions.map((c) => [c.kind, c.axes])).toEqual([['unobserved', ['roll']], ['unobserved', ['pitch']]]);
  });

  it('is the same with no sensor block as with an empty one (the defaults agree with the schema)', () => {
    const doc = example('fly-sensing');
    delete doc.sensor;
    const a = answerOf(doc), b = answerOf(withFields(doc, { sensor: {} }));
    expect(b.organs).toEqual(a.organs);
    expect(b.pair).toEqual(a.pair);
    expect(a.warnings.join(' ')).toMatch(/no sensor block/);
  });

  it('says whether the scenario\'s rate is detected: |signal|/σ ≥ threshold per organ, |Ω| ≥ the pair\'s minimum rate; null at zero rate or without noise', () => {
    const base = example('fly-sensing');
    // fly-sensing: 200 deg/s yaw, no roll or pitch; SNR 18.4 on the yaw channel (docs/sensing.md table).
    for (const [threshold, yawSeen] of [[1, true], [18, true], [19, false], [100, false]] as const) {
      const a = answerOf(withFields(base, { sensor: { ...(base.sensor as object), threshold } }));
      for (const o of a.organs) {
        const yaw = o.axes.yaw;
        expect(Math.abs(yaw.signal) / (yaw.noise?.sigma as number) >= threshold).toBe(yawSeen);
        expect(yaw.detectable).toBe(yawSeen);
        expect(o.axes.roll.detectable).toBeNull();
        expect(o.axes.pitch.detectable).toBeNull();
      }
      const pairMin = a.pair.yaw.minimumRate as number;
      expect(a.pair.yaw.detectable).toBe(Math.abs(200 * DEG) >= pairMin);
      expect(a.pair.roll.detectable).toBeNull();
    }
    const quiet = example('fly-sensing');
    quiet.sensor = { integration: { beats: 10 } }; // no readout noise and no sense mode: no noise model
    const none = answerOf(quiet);
    expect(none.organs[0]?.axes.yaw.detectable).toBeNull();
    expect(none.pair.yaw.detectable).toBeNull();
    const csv = sensingCsv(answerOf(base)).split('\r\n');
    const col = (csv[0] as string).split(',').indexOf('detectable');
    expect(col).toBeGreaterThan(0);
    expect(csv.slice(1, 4).map((r) => r.split(',')[col])).toEqual(['', '', 'true']);
  });

  it.each(['fly-sensing', 'mems-sensing'])('%s: output.lines adds the strain and sense-mode line tables and changes nothing else', (name) => {
    const lean = answerOf(example(name));
    const full = answerOf(withFields(example(name), { output: { series: false, lines: true } }));
    const K = full.scenario.sampling.harmonics;
    for (const [i, o] of lean.organs.entries()) {
      const f = full.organs[i];
      expect(f?.axes).toEqual(o.axes);
      expect(o.strain?.harmonics).toBeUndefined();
      expect(o.senseMode?.transfer).toBeUndefined();
      if (o.strain) {
        // 3 strain axes × orders 0..K, for the total and for its rate-induced part.
        expect(f?.strain?.harmonics).toHaveLength(3 * (K + 1));
        expect(f?.strain?.rateInduced).toHaveLength(3 * (K + 1));
        expect({ ...f?.strain, harmonics: undefined, rateInduced: undefined }).toEqual({ ...o.strain, harmonics: undefined, rateInduced: undefined });
      }
      if (o.senseMode) {
        expect(f?.senseMode?.transfer).toHaveLength(K);
        expect(f?.senseMode?.perUnitRate?.yaw).toHaveLength(K);
        expect(f?.senseMode?.displacement).toHaveLength(K + 1);
        expect({ ...f?.senseMode, transfer: undefined, perUnitRate: undefined, displacement: undefined }).toEqual({ ...o.senseMode, transfer: undefined, perUnitRate: undefined, displacement: undefined });
      }
    }
    expect(lean.organs.some((o) => o.strain || o.senseMode)).toBe(true);
    expect(full.pair).toEqual(lean.pair);
  });
});

describe('sensing: the mirror pair (design §2)', () => {
  it.each(['fly-sensing', 'mems-sensing'])('%s: pitch outputs identical on both organs, roll and yaw opposite', (name) => {
    const a = answerOf(withFields(example(name), { body: { rate: { roll: '40 deg/s', pitch: '30 deg/s', yaw: '100 deg/s' } } }));
    const [r, l] = a.organs;
    for (const axis of RATES) {
      const s = axis === 'pitch' ? 1 : -1;
      expect((l?.axes[axis].scaleFactor as number) - s * (r?.axes[axis].scaleFactor as number)).toBe(0);
      expect(l?.axes[axis].channel).toEqual(r?.axes[axis].channel);
      expect(l?.axes[axis].minimumRate).toBe(r?.axes[axis].minimumRate);
    }
    const rows = a.pair.matrix;
    for (const row of rows.filter((x) => x.role === 'specified')) {
      const m = rows.find((x) => x.role === 'mirror' && x.axis === row.axis && x.order === row.order);
      expect(m).toBeDefined();
      expect(m?.referencePhase).toBe(row.referencePhase);
      expect((m?.pitch as number) - row.pitch).toBe(0);
      expect((m?.roll as number) + row.roll).toBe(0);
      expect((m?.yaw as number) + row.yaw).toBe(0);
    }
  });
});

describe('sensing: scale factor K = ∂I/∂Ω against the core loads', () => {
  it('the in-phase lock-in output of the core\'s total load line, differenced at ±δ, equals K for each axis and each channel', () => {
    const base = example('fly-sensing');
    const a = answerOf(base);
    const { scenario } = compiled(base);
    const delta = 1e-3;
    const strainPerN = a.organs[0]?.strain?.perLoad as Record<string, number>;
    const strainOf = { radial: 'axial', tangential: 'inPlane', normal: 'outOfPlane' } as const;
    for (const [i, axis] of RATES.entries()) {
      const at = (sign: number) => {
        const rate = { roll: 0, pitch: 0, yaw: 0, [axis]: sign * delta };
        const f = forces(withFields(base, { body: { rate, gravity: true } }));
        if (!f.ok) throw new Error('forces');
        return f.answer;
      };
      const plus = at(1), minus = at(-1);
      for (const row of a.pair.matrix) {
        const oi = row.role === 'specified' ? 0 : 1;
        const line = (f: typeof plus) => f.organs[oi]?.harmonics.find((l) => l.component === 'total' && l.axis === row.axis && l.order === row.order);
        const out = (f: typeof plus) => {
          const l = line(f);
          const g = strainPerN[strainOf[row.axis as keyof typeof strainOf]] as number;
          // line A cos(kωt + ψ) → p = A cos ψ, q = −A sin ψ; read as strain (g per newton).
          return lineOutputs(g * (l?.amplitude ?? 0) * Math.cos(l?.phase ?? 0), -g * (l?.amplitude ?? 0) * Math.sin(l?.phase ?? 0), row.referencePhase).inPhase;
        };
        const K = (out(plus) - out(minus)) / (2 * delta);
        const expected = [row.roll, row.pitch, row.yaw][i] as number;
        expect(Math.abs(K - expected)).toBeLessThan(1e-7 * Math.max(Math.abs(row.roll), Math.abs(row.pitch), Math.abs(row.yaw)));
      }
    }
    expect(scenario.sensor?.threshold).toBe(1);
  });

  it('closed-form and sampled paths give the same answer', () => {
    for (const name of ['fly-sensing', 'mems-sensing']) {
      const doc = withFields(example(name), { body: { rate: { roll: '40 deg/s', pitch: '-30 deg/s', yaw: '100 deg/s' }, acceleration: [1, 2, -3], gravity: true } });
      const c = answerOf(withFields(doc, { output: { path: 'closed-form', series: false } }));
      const s = answerOf(withFields(doc, { output: { path: 'sampled', series: false } }));
      expect(c.path).toBe('closed-form');
      expect(s.path).toBe('sampled');
      // Numbers agree to 1e-9 of the largest number beside them (a quadrature of 1e-24 is a zero).
      const close = (x: unknown, y: unknown, path: string, scale = 0): void => {
        if (typeof x === 'number' && typeof y === 'number') {
          expect(Math.abs(x - y), path).toBeLessThanOrEqual(1e-9 * Math.max(Math.abs(x), Math.abs(y), scale) + 1e-300);
        } else if (x && typeof x === 'object') {
          const top = Math.max(scale, ...Object.values(x).map((v) => (typeof v === 'number' ? Math.abs(v) : 0)));
          for (const [k, v] of Object.entries(x)) close(v, (y as Record<string, unknown>)[k], `${path}.${k}`, k === 'channel' ? 0 : top);
        } else expect(y, path).toEqual(x);
      };
      close(c.organs.map((o) => o.axes), s.organs.map((o) => o.axes), name);
      const pairOf = (x: typeof c) => ({ roll: x.pair.roll, pitch: x.pair.pitch, yaw: x.pair.yaw, channels: x.pair.channels, singularValues: x.pair.singularValues });
      close(pairOf(c), pairOf(s), `${name}.pair`);
    }
  });
});

describe('sensing: Monte Carlo of the smallest detectable rate', () => {
  it('the core\'s strain series at the scenario rate plus readout noise, through the demodulator, gives rate estimates spread by minimumRate/threshold around the rate plus bias', () => {
    const doc = withFields(example('fly-sensing'), { output: { series: true }, sensor: { threshold: 2 } });
    const a = answerOf(doc);
    const f = forces(doc);
    if (!f.ok) throw new Error('forces');
    const yaw = a.organs[0]?.axes.yaw;
    const ch = yaw?.channel;
    if (!ch || !yaw?.bias || !yaw.noise) throw new Error('no channel');
    const g = a.organs[0]?.strain?.perLoad.outOfPlane as number;
    const beat = f.answer.organs[0]?.series?.loads.total.normal as number[];
    const n = beat.length, beats = 10, S = 2e-9 ** 2, fs = n * 180;
    const sd = Math.sqrt((S * fs) / 2);
    const rnd = normalSource(2718);
    const x = new Float64Array(n * beats);
    const est = new Float64Array(1500);
    for (let t = 0; t < est.length; t++) {
      for (let j = 0; j < x.length; j++) x[j] = g * (beat[j % n] as number) + sd * rnd();
      const d = demodulate(x, { order: ch.order, pointsPerBeat: n, referencePhase: ch.referencePhase });
      est[t] = mean(d.inPhase) / yaw.scaleFactor;
    }
    const expectedMean = yaw.rate + yaw.bias.primary + yaw.bias.centrifugal + yaw.bias.gravity + yaw.bias.translational;
    const spread = (yaw.minimumRate as number) / 2;
    expect(Math.abs(std(est) / spread - 1)).toBeLessThan(4 / Math.sqrt(2 * est.length));
    expect(Math.abs(mean(est) - expectedMean)).toBeLessThan((4 * spread) / Math.sqrt(est.length));
    expect(spread).toBeCloseTo(yaw.noise.sigma / Math.abs(yaw.scaleFactor), 15);
  });
});

describe('sensing: what the pair cannot tell apart', () => {
  it('a rotary organ read only on its normal (a sense mode) cannot tell roll from yaw: rotation about the stroke-plane normal gives no line', () => {
    const n = [0.906, 0, 0.423];
    const doc = withFields(example('fly-sensing'), { organ: { ...(example('fly-sensing').organ as object), normal: n, senseMode: { frequency: '1.2 kHz', quality: 20, mass: '6 ug' } } });
    (doc.sensor as Record<string, unknown>).readoutNoise = '1e-12 N / Hz^0.5';
    const a = answerOf(doc);
    expect(a.organs[0]?.read.axes).toEqual(['normal']);
    expect(a.pair.conditionNumber === null || (a.pair.conditionNumber as number) > 1e10).toBe(true);
    const c = a.pair.confusions.find((x) => x.kind === 'confused');
    expect(c?.axes).toEqual(['roll', 'yaw']);
    const len = Math.hypot(0.906, 0.423);
    expect(c?.direction.roll).toBeCloseTo(0.906 / len, 6);
    expect(c?.direction.yaw).toBeCloseTo(0.423 / len, 6);
    expect(a.pair.pitch.observable).toBe(true);
    expect(a.pair.roll.minimumRate).toBeNull();
    expect(a.warnings.join(' ')).toMatch(/cannot tell roll and yaw apart/);
  });

  it('the same organ read on all three axes (no sense mode) separates them again', () => {
    const a = answerOf(example('fly-sensing'));
    expect(a.pair.confusions).toEqual([]);
    expect(a.pair.conditionNumber).toBeLessThan(1e3);
    for (const axis of RATES) expect(a.pair[axis].minimumRate).toBeGreaterThan(0);
  });
});

describe('sensing: refused input names the field', () => {
  const mems = example('mems-sensing');
  const fly = example('fly-sensing');
  const cases: [string, Record<string, unknown>, string, RegExp][] = [
    ['negative Q', withFields(mems, { organ: { ...(mems.organ as object), senseMode: { frequency: '15.3 kHz', quality: -5, mass: '4 ug' } } }), 'organ.senseMode.quality', /-5 must be greater than zero/],
    ['zero temperature', withFields(mems, { sensor: { temperature: '0 K' } }), 'sensor.temperature', /'0 K' must be greater than zero/],
    ['integration shorter than one beat', withFields(fly, { sensor: { integration: '2 ms' } }), 'sensor.integration', /shorter than one beat/],
    ['zero beats', withFields(fly, { sensor: { integration: { beats: 0 } } }), 'sensor.integration.beats', /too small/],
    ['threshold 0', withFields(fly, { sensor: { threshold: 0 } }), 'sensor.threshold', /must be greater than zero/],
    ['threshold negative', withFields(fly, { sensor: { threshold: -1 } }), 'sensor.threshold', /must be greater than zero/],
    ['noise density of the wrong dimension', withFields(fly, { sensor: { readoutNoise: '2e-10 N' } }), 'sensor.readoutNoise', /is not a force noise density or a strain noise density or a displacement noise density/],
    ['strain readout without a stalk', withFields(mems, { sensor: { readoutNoise: '1e-9 / Hz^0.5' } }), 'sensor.readoutNoise', /strain noise density, but the organ has no stalk/],
    ['displacement readout without a sense mode', withFields(fly, { sensor: { readoutNoise: '1e-12 m / Hz^0.5' } }), 'sensor.readoutNoise', /displacement noise density, but without organ.senseMode/],
    ['inner semi-axis outside the outer', withFields(fly, { organ: { ...(fly.organ as object), stalk: { length: '0.8 mm', outerSemiAxes: ['40 um', '30 um'], innerSemiAxes: ['20 um', '35 um'], modulus: '5 GPa' } } }), 'organ.stalk.innerSemiAxes', /not smaller than the outer semi-axis/],
    ['zero harmonics', withFields(fly, { sampling: { harmonics: 0 } }), 'sampling.harmonics', /nothing to lock in/],
  ];
  it.each(cases)('%s', (_name, doc, path, message) => {
    const r = sensing(doc);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const issue = r.issues.find((i) => i.path === path);
    expect(issue, JSON.stringify(r.issues)).toBeDefined();
    expect(issue?.message).toMatch(message);
  });
});

describe('rateSweep(prepared, rates)', () => {
  it('gives each best channel\'s in-phase output as the core loads do at that rate, and the pair\'s estimate of the rate', () => {
    const doc = withFields(example('fly-sensing'), { body: { rate: { roll: 0, pitch: 0, yaw: 0 }, gravity: true } });
    const { scenario, model } = compiled(doc);
    const p = prepareSensing(scenario, model);
    if (!p.ok) throw new Error('prepare');
    const P = p.prepared;
    const rates = [[0.5, -0.2, 1.5], [-3, 2, 8], [20, -15, 30]];
    const sweep = rateSweep(P, rates.flat());
    rates.forEach((w, t) => {
      const at = withFields(doc, { body: { rate: { roll: w[0], pitch: w[1], yaw: w[2] }, gravity: true } });
      const f = forces(at);
      if (!f.ok) throw new Error('forces');
      const outputOf = (oi: number, row: number) => {
        const o = P.organs[oi];
        const ch = o?.channels as Float64Array, c = row * CH.size;
        const b = ch[c + CH.b] as number, k = ch[c + CH.k] as number, tr = ch[c + CH.tr] as number, ti = ch[c + CH.ti] as number;
        const l = f.answer.organs[oi]?.harmonics.find((x) => x.component === 'total' && x.axis === ['radial', 'tangential', 'normal'][b] && x.order === k);
        const pp = (l?.amplitude ?? 0) * Math.cos(l?.phase ?? 0), qq = -(l?.amplitude ?? 0) * Math.sin(l?.phase ?? 0);
        // through T (a real gain here) then in-phase at ψ.
        expect(ti).toBe(0);
        return lineOutputs(tr * pp, tr * qq, ch[c + CH.psi] as number).inPhase;
      };
      P.organs.forEach((o, oi) => {
        for (let i = 0; i < 3; i++) {
          const got = sweep.outputs[oi * 3 + i]?.[t] as number;
          const want = outputOf(oi, o.best[i] as number);
          expect(Math.abs(got - want)).toBeLessThan(1e-9 * Math.abs(want) + 1e-20);
        }
      });
      const y = P.pairRows.map(({ organ, row }) => outputOf(organ, row));
      const direct = estimateRates(P.pair, y);
      for (let r = 0; r < 3; r++) expect(sweep.estimated[3 * t + r]).toBeCloseTo(direct[r] as number, 9);
    });
    // Small rates are recovered (the centrifugal term is quadratic and negligible there).
    for (let r = 0; r < 3; r++) expect(sweep.estimated[r]).toBeCloseTo(rates[0]?.[r] as number, 2);
  });
});

describe('lineOf(w, k)', () => {
  it('follows the harmonics.ts convention (amplitudePhase with p = Re W, q = −Im W)', () => {
    const rnd = normalSource(5);
    for (let t = 0; t < 200; t++) {
      const w: [number, number] = [rnd(), rnd()];
      const k = t % 4;
      expect(lineOf(w, k).amplitude).toBeCloseTo(amplitudePhase(w[0], -w[1], k).amplitude, 14);
      expect(lineOf(w, k).phase).toBeCloseTo(amplitudePhase(w[0], -w[1], k).phase, 14);
    }
    expect(lineOf([-1, 0], 2).phase).toBe(amplitudePhase(-1, 0, 2).phase);
  });
});

describe('sensingOf reuses its buffers safely', () => {
  it('a prepared plan kept by a caller is not changed by later answers', () => {
    const one = compiled(example('fly-sensing'));
    const p = prepareSensing(one.scenario, one.model);
    if (!p.ok) throw new Error('prepare');
    const before = Float64Array.from(p.prepared.organs[0]?.channels ?? []);
    const other = compiled(withFields(example('fly-sensing'), { organ: { ...(example('fly-sensing').organ as object), amplitude: '60 deg' } }));
    sensingOf(other.scenario, other.model);
    sensingOf(one.scenario, one.model);
    expect(Array.from(p.prepared.organs[0]?.channels ?? [])).toEqual(Array.from(before));
    expect(DEG).toBeGreaterThan(0);
  });
});

describe('sensing: series', () => {
  it('quasi-static strain series are the core\'s organ-frame load series times the strain per newton; peaks are their largest magnitudes', () => {
    const doc = withFields(example('fly-sensing'), { output: { series: true }, sampling: { pointsPerBeat: 128, beats: 2, harmonics: 8 } });
    const a = answerOf(doc);
    const f = forces(doc);
    if (!f.ok) throw new Error('forces');
    for (const [oi, organ] of a.organs.entries()) {
      const st = organ.strain;
      const loads = f.answer.organs[oi]?.series?.loads.total;
      expect(st?.series?.time.length).toBe(256);
      for (const [axis, strainAxis] of [['radial', 'axial'], ['tangential', 'inPlane'], ['normal', 'outOfPlane']] as const) {
        const F = loads?.[axis] as number[];
        const e = st?.series?.[strainAxis] as number[];
        const g = st?.perLoad[strainAxis] as number;
        for (let j = 0; j < 256; j += 17) expect(e[j]).toBeCloseTo(g * (F[j] as number), 18);
        expect(st?.peak?.[strainAxis]).toBeCloseTo(Math.max(...F.map((x) => Math.abs(g * x))), 18);
      }
    }
  });

  it('with a sense mode on a rotary organ, the out-of-plane strain follows the spring force: strain per newton × G(kω) × load line', () => {
    const fly = example('fly-sensing');
    const doc = withFields(fly, { organ: { ...(fly.organ as object), senseMode: { frequency: '500 Hz', quality: 8, mass: '6 ug' } }, output: { series: true, lines: true } });
    const a = answerOf(doc);
    const f = forces(doc);
    if (!f.ok) throw new Error('forces');
    const st = a.organs[0]?.strain;
    expect(st?.dynamic).toBe('outOfPlane');
    for (let k = 1; k <= 8; k++) {
      const F = f.answer.organs[0]?.harmonics.find((l) => l.component === 'total' && l.axis === 'normal' && l.order === k);
      const r = (k * 180) / 500;
      const G = 1 / Math.hypot(1 - r * r, r / 8), lag = Math.atan2(r / 8, 1 - r * r);
      const e = st?.harmonics?.find((l) => l.axis === 'outOfPlane' && l.order === k);
      expect(e?.amplitude).toBeCloseTo(Math.abs(st?.perLoad.outOfPlane as number) * G * (F?.amplitude ?? 0), 16);
      if ((F?.amplitude ?? 0) > 1e-12) expect(Math.cos((e?.phase ?? 0) - ((F?.phase ?? 0) + Math.PI - lag))).toBeCloseTo(1, 9);
    }
    // The sense displacement series is the sum of its lines (t = 0: Σ A_k cos ψ_k).
    const sm = a.organs[0]?.senseMode;
    const x0 = sm?.displacement?.reduce((s, l) => s + l.amplitude * Math.cos(l.phase), 0) ?? NaN;
    expect(sm?.series?.displacement[0]).toBeCloseTo(x0, 18);
  });
});
