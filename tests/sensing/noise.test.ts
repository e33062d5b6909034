import { describe, expect, it } from 'vitest';
import { demodulate } from '../../src/sensing/lockin.js';
import { answerOf, example } from './helpers.js';
import { normalSource } from './random.js';

describe('angleRandomWalk(answer) through the demodulator', () => {
  it('per-beat rate estimates from white channel noise have the Allan deviation N/√τ that the answer\'s angle random walk states', () => {
    const a = answerOf(example('fly-sensing'));
    const yaw = a.organs[0]?.axes.yaw;
    const ch = yaw?.channel;
    if (!ch || !yaw?.noise) throw new Error('no channel');
    const f = 180, n = 32, beats = 40_000;
    const S = yaw.noise.density ** 2;
    const sd = Math.sqrt((S * n * f) / 2); // one-sided S over the band (n f)/2
    const rnd = normalSource(1431);
    const x = new Float64Array(n * beats);
    for (let j = 0; j < x.length; j++) x[j] = sd * rnd();
    const d = demodulate(x, { order: ch.order, pointsPerBeat: n, referencePhase: ch.referencePhase });
    const rate = d.inPhase.map((v) => v / yaw.scaleFactor);
    const N = (yaw.angleRandomWalk as number) / ((180 / Math.PI) * 60); // deg/√h → rad/√s
    for (const m of [1, 20]) {
      const tau = m / f, clusters = Math.floor(beats / m);
      const means = new Float64Array(clusters);
      for (let c = 0; c < clusters; c++) {
        let s = 0;
        for (let i = 0; i < m; i++) s += rate[c * m + i] as number;
        means[c] = s / m;
      }
      let avar = 0;
      for (let c = 0; c + 1 < clusters; c++) avar += ((means[c + 1] as number) - (means[c] as number)) ** 2;
      avar /= 2 * (clusters - 1);
      expect(Math.abs(avar / ((N * N) / tau) - 1)).toBeLessThan(4 * Math.sqrt(2 / (clusters - 1)));
    }
    // And the one-sided rate-noise density is √2 N.
    expect((yaw.rateNoiseDensity as number) / N).toBeCloseTo(Math.SQRT2, 12);
  });
});
