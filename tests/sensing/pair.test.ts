import { Matrix, SVD, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { analysePair, estimateRates, estimatorGain, jacobiSvd3, type PairRow } from '../../src/sensing/pair.js';
import { normalSource } from './random.js';

const rows = (H: number[][], sigma: number[]): PairRow[] => H.map((h, i) => ({ sensitivity: h as [number, number, number], sigma: sigma[i] as number }));

describe('analysePair(rows)', () => {
  it('gives the hand-derived covariance, condition number and minimum rates of a diagonal case', () => {
    // Rows: roll seen once (σ 1), pitch once with gain 2, yaw twice (σ 1): Cov = diag(1, 1/4, 1/2).
    const a = analysePair(rows([[1, 0, 0], [0, 2, 0], [0, 0, 1], [0, 0, 1]], [1, 1, 1, 1]), { threshold: 2 });
    expect(a.singularValues[0]).toBeCloseTo(2, 12);
    expect(a.singularValues[2]).toBeCloseTo(1, 12);
    expect(a.conditionNumber).toBeCloseTo(2, 12);
    expect(a.covariance[0]?.[0]).toBeCloseTo(1, 12);
    expect(a.covariance[1]?.[1]).toBeCloseTo(0.25, 12);
    expect(a.covariance[2]?.[2]).toBeCloseTo(0.5, 12);
    expect(a.minimumRate.pitch).toBeCloseTo(2 * 0.5, 12);
    expect(a.confusions).toEqual([]);
  });

  it('equals (Hᵀ R⁻¹ H)⁻¹ computed directly with ml-matrix for a random matrix, and the estimator inverts H', () => {
    const rnd = normalSource(3);
    const H = Array.from({ length: 12 }, () => [rnd(), rnd(), rnd()]);
    const sigma = Array.from({ length: 12 }, () => 0.5 + Math.abs(rnd()));
    const a = analysePair(rows(H, sigma));
    const Hw = new Matrix(H.map((h, i) => h.map((x) => x / (sigma[i] as number))));
    const cov = inverse(Hw.transpose().mmul(Hw));
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(a.covariance[i]?.[j]).toBeCloseTo(cov.get(i, j), 10);
    const omega = [0.3, -1.2, 2.5];
    const y = H.map((h) => h.reduce((s, x, i) => s + x * (omega[i] as number), 0));
    const est = estimateRates(a, y);
    for (let i = 0; i < 3; i++) expect(est[i]).toBeCloseTo(omega[i] as number, 10);
    // Weighted least squares: the estimate of noisy outputs equals the normal-equation solution.
    const yn = y.map((v, i) => v + 0.1 * (sigma[i] as number) * rnd());
    const rhs = Hw.transpose().mmul(Matrix.columnVector(yn.map((v, i) => v / (sigma[i] as number))));
    const direct = cov.mmul(rhs);
    const e2 = estimateRates(a, yn);
    for (let i = 0; i < 3; i++) expect(e2[i]).toBeCloseTo(direct.get(i, 0), 10);
  });

  it('names an axis that no channel sees and two axes seen only in one combination', () => {
    // Pitch never appears; roll and yaw only as (roll + 2 yaw).
    const a = analysePair(rows([[1, 0, 2], [2, 0, 4], [-0.5, 0, -1]], [1, 1, 1]));
    expect(a.conditionNumber === null || a.conditionNumber > 1e12).toBe(true);
    expect(a.observable).toEqual({ roll: false, pitch: false, yaw: false });
    expect(a.minimumRate).toEqual({ roll: null, pitch: null, yaw: null });
    const unobserved = a.confusions.find((c) => c.kind === 'unobserved');
    expect(unobserved?.axes).toEqual(['pitch']);
    const confused = a.confusions.find((c) => c.kind === 'confused');
    expect(confused?.axes).toEqual(['roll', 'yaw']);
    // The null direction is ⟂ (1, 0, 2): ∝ (2, 0, −1)/√5.
    expect(confused?.direction.roll).toBeCloseTo(2 / Math.sqrt(5), 10);
    expect(confused?.direction.yaw).toBeCloseTo(-1 / Math.sqrt(5), 10);
    expect(confused?.message).toMatch(/roll and yaw/);
  });

  it('keeps the observable axes finite when another axis is unseen', () => {
    const a = analysePair(rows([[1, 0, 0], [0, 0, 3]], [2, 1]));
    expect(a.observable).toEqual({ roll: true, pitch: false, yaw: true });
    expect(a.minimumRate.roll).toBeCloseTo(2, 12);
    expect(a.minimumRate.yaw).toBeCloseTo(1 / 3, 12);
    expect(a.minimumRate.pitch).toBeNull();
    expect(a.confusions.map((c) => [c.kind, c.axes])).toEqual([['unobserved', ['pitch']]]);
  });

  it('works without noise (unweighted): covariance and minimum rates are null, the estimator still inverts H', () => {
    const a = analysePair(rows([[1, 0, 0], [0, 1, 0], [0, 0, 1]], [0, 0, 0]));
    expect(a.weighted).toBe(false);
    expect(a.minimumRate.roll).toBeNull();
    expect(Array.from(estimateRates(a, [1, 2, 3]))).toEqual([1, 2, 3].map((v) => expect.closeTo(v, 12)));
  });
});

describe('jacobiSvd3(A) against ml-matrix SVD (reference library)', () => {
  const rnd = normalSource(11);
  const cases: [string, number[][]][] = [
    ['random', [[rnd(), rnd(), rnd()], [rnd(), rnd(), rnd()], [rnd(), rnd(), rnd()]]],
    ['rank 2', [[1, 2, 3], [2, 4, 6], [0, 1, -1]]],
    ['rank 1', [[1, 0, 2], [3, 0, 6], [-1, 0, -2]]],
    ['graded 1e-9', [[1, 0, 0], [0, 1e-4, 0], [0.3, 0.2, 1e-9]]],
    ['zero', [[0, 0, 0], [0, 0, 0], [0, 0, 0]]],
  ];
  it.each(cases)('%s: singular values and right singular vectors agree', (_name, M) => {
    const A = M.flat(), V = new Array<number>(9).fill(0), sv = [0, 0, 0];
    jacobiSvd3(A, V, sv);
    const ref = new SVD(new Matrix(M), { autoTranspose: false });
    const mine = [...sv].sort((a, b) => b - a);
    const theirs = [...ref.diagonal].map(Math.abs).sort((a, b) => b - a);
    const top = Math.max(theirs[0] ?? 0, 1e-300);
    for (let j = 0; j < 3; j++) expect(Math.abs((mine[j] as number) - (theirs[j] as number))).toBeLessThan(1e-13 * top);
    // Each right singular vector v_j satisfies ‖M v_j‖ = s_j and V is orthogonal.
    const Mm = new Matrix(M);
    for (let j = 0; j < 3; j++) {
      const v = Matrix.columnVector([V[j] as number, V[3 + j] as number, V[6 + j] as number]);
      expect(Math.abs(Mm.mmul(v).norm() - (sv[j] as number))).toBeLessThan(1e-13 * top + 1e-300);
      for (let i = 0; i < 3; i++) {
        const dotv = (V[i] as number) * (V[j] as number) + (V[3 + i] as number) * (V[3 + j] as number) + (V[6 + i] as number) * (V[6 + j] as number);
        expect(dotv).toBeCloseTo(i === j ? 1 : 0, 13);
      }
    }
    expect(analysePair(M.map((h) => ({ sensitivity: h as [number, number, number], sigma: 1 }))).singularValues[0]).toBeCloseTo(theirs[0] as number, 12);
  });
});

describe('estimatorGain(analysis)', () => {
  it('gives the same estimate as estimateRates', () => {
    const rnd = normalSource(21);
    const rows2 = Array.from({ length: 7 }, () => ({ sensitivity: [rnd(), rnd(), rnd()] as [number, number, number], sigma: 0.3 + Math.abs(rnd()) }));
    const a = analysePair(rows2);
    const G = estimatorGain(a);
    const y = rows2.map(() => rnd());
    const e = estimateRates(a, y);
    for (let r = 0; r < 3; r++) expect(y.reduce((s, v, i) => s + (G[r * 7 + i] as number) * v, 0)).toBeCloseTo(e[r] as number, 12);
  });
});
