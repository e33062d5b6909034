/**
 * The core's own Bessel functions (src/bessel.ts) against handbook values, an independent
 * quadrature of Bessel's integral, the npm `bessel` package and the classical identities.
 */
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { besselJ } from '../../src/index.js';
import { besselIntegral } from './independent.js';

const require = createRequire(import.meta.url);
const { besselj } = require('bessel') as { besselj: (x: number, n: number) => number };

/**
 * Abramowitz & Stegun (1964), Table 9.1 (J0 to 15 decimals, J1 and J2 to 10) and Table 9.2
 * (J3..J5). These entries were typed from memory, not copied from the printed table; each is also
 * held against Bessel's integral below, so a slip of memory fails a test rather than passing silently.
 */
const AS_TABLE: { x: number; n: number; value: number; decimals: number }[] = [
  { x: 0.5, n: 0, value: 0.938469807240813, decimals: 15 },
  { x: 0.5, n: 1, value: 0.2422684577, decimals: 10 },
  { x: 0.5, n: 2, value: 0.0306040235, decimals: 10 },
  { x: 1.0, n: 0, value: 0.765197686557967, decimals: 15 },
  { x: 1.0, n: 1, value: 0.4400505857, decimals: 10 },
  { x: 1.0, n: 2, value: 0.1149034849, decimals: 10 },
  { x: 1.0, n: 3, value: 0.0195633540, decimals: 10 },
  { x: 1.0, n: 4, value: 0.0024766390, decimals: 10 },
  { x: 1.0, n: 5, value: 0.0002497577, decimals: 10 },
  { x: 2.0, n: 0, value: 0.223890779141236, decimals: 15 },
  { x: 2.0, n: 1, value: 0.5767248078, decimals: 10 },
  { x: 2.0, n: 2, value: 0.3528340286, decimals: 10 },
  { x: 2.0, n: 3, value: 0.1289432495, decimals: 10 },
  { x: 5.0, n: 0, value: -0.177596771314338, decimals: 15 },
  { x: 5.0, n: 1, value: -0.3275791376, decimals: 10 },
  { x: 5.0, n: 2, value: 0.0465651163, decimals: 10 },
  { x: 10.0, n: 0, value: -0.245935764451348, decimals: 15 },
  { x: 10.0, n: 1, value: 0.0434727462, decimals: 10 },
  { x: 10.0, n: 2, value: 0.2546303137, decimals: 10 },
];

/** Zeros of J0 and J1, A&S Table 9.5 (j_{0,1}, j_{0,2}, j_{1,1}; from memory, 15 digits). */
const ZEROS = [
  { n: 0, x: 2.404825557695773 },
  { n: 0, x: 5.520078110286311 },
  { n: 1, x: 3.831705970207512 },
];

/** Power series J_n(x) = Σ_m (−1)^m (x/2)^{2m+n} / (m! (m+n)!) (A&S 9.1.10), in logs for large n; small x only. */
function powerSeries(n: number, x: number): number {
  let lg = 0;
  for (let i = 2; i <= n; i++) lg += Math.log(i);
  let term = Math.exp(n * Math.log(x / 2) - lg);
  let sum = term;
  for (let m = 1; m < 60; m++) {
    term *= -(x * x) / 4 / (m * (m + n));
    sum += term;
  }
  return sum;
}

describe('besselJ(x, n) (src/bessel.ts)', () => {
  it('matches A&S Table 9.1/9.2 entries to the table\'s decimals', () => {
    for (const e of AS_TABLE) {
      const J = besselJ(e.x, Math.max(e.n, 2));
      expect(Math.abs((J[e.n] as number) - e.value), `J${e.n}(${e.x})`).toBeLessThanOrEqual(0.6 * 10 ** -e.decimals);
    }
  });

  it('the remembered table entries agree with Bessel\'s integral (A&S 9.1.21) to their decimals', () => {
    // 2e-15: the rounding of the 400-term quadrature sum.
    for (const e of AS_TABLE) expect(Math.abs(besselIntegral(e.n, e.x) - e.value), `J${e.n}(${e.x})`).toBeLessThanOrEqual(0.6 * 10 ** -e.decimals + 2e-15);
  });

  it('vanishes at the zeros j_{0,1}, j_{0,2}, j_{1,1} (A&S Table 9.5)', () => {
    for (const z of ZEROS) expect(Math.abs(besselJ(z.x, 1)[z.n] as number)).toBeLessThan(1e-15);
  });

  it('agrees with Bessel\'s integral (A&S 9.1.21, trapezoidal rule) to 1e-14 absolute for x up to 60 and n up to 40', () => {
    for (const x of [1e-3, 0.1, 0.7, 1.39, 2.8, 5, 12.5, 31, 60]) {
      const J = besselJ(x, 40);
      for (let n = 0; n <= 40; n++) expect(Math.abs((J[n] as number) - besselIntegral(n, x, 512)), `J${n}(${x})`).toBeLessThan(1e-14);
    }
  });

  it('agrees with the npm bessel package to its accuracy (2e-7 absolute; measured against Bessel\'s integral it errs by up to 1.4e-7 for x < 8)', () => {
    for (const x of [0.05, 0.3, 1, 1.48, 2.2, 2.96, 4, 7.5]) {
      const J = besselJ(x, 12);
      for (let n = 0; n <= 12; n++) expect(Math.abs((J[n] as number) - besselj(x, n)), `J${n}(${x})`).toBeLessThan(2e-7);
    }
  });

  it('keeps full relative precision at large order and small argument (power series, A&S 9.1.10)', () => {
    for (const [x, n] of [[1, 20], [1, 100], [0.01, 30], [2, 50], [5e-7, 3], [1e-7, 12]] as const) {
      const J = besselJ(x, n);
      const ref = powerSeries(n, x);
      expect(Math.abs((J[n] as number) - ref) / Math.abs(ref), `J${n}(${x})`).toBeLessThan(1e-12);
    }
    // The leading term (x/2)^n/n! alone: J_100(1) ≈ 8.45e-189 × (1 − 1/404 + …) ≈ 8.4318e-189.
    expect((besselJ(1, 100)[100] as number) / 8.4318e-189).toBeCloseTo(1, 4);
  });

  it('satisfies the recurrence J_{k−1} + J_{k+1} = (2k/x) J_k (A&S 9.1.27)', () => {
    for (const x of [0.2, 1.3, 2.9, 8, 25]) {
      const J = besselJ(x, 30);
      for (let k = 1; k < 30; k++) {
        const lhs = (J[k - 1] as number) + (J[k + 1] as number);
        const rhs = ((2 * k) / x) * (J[k] as number);
        expect(Math.abs(lhs - rhs)).toBeLessThan(1e-14 * Math.max(1, Math.abs(rhs)));
      }
    }
  });

  it('satisfies J_0 + 2 Σ J_2k = 1 (A&S 9.1.46) and J_0² + 2 Σ J_k² = 1 (A&S 9.1.76)', () => {
    for (const x of [0.01, 0.9, 2.5, 6, 19.3, 40]) {
      const top = Math.ceil(x) + 40;
      const J = besselJ(x, top);
      let even = J[0] as number;
      let squares = (J[0] as number) ** 2;
      for (let k = 1; k <= top; k++) {
        if (k % 2 === 0) even += 2 * (J[k] as number);
        squares += 2 * (J[k] as number) ** 2;
      }
      expect(Math.abs(even - 1)).toBeLessThan(1e-14);
      expect(Math.abs(squares - 1)).toBeLessThan(1e-14);
    }
  });

  it('reproduces the Jacobi–Anger expansion cos(x sin u) = J0 + 2 Σ J_2k cos 2ku, sin(x sin u) = 2 Σ J_2k+1 sin (2k+1)u (A&S 9.1.42–43)', () => {
    for (const x of [0.4, 1.5, 2.7]) {
      const J = besselJ(x, 40);
      for (const u of [0, 0.3, 1.1, 2.9, -2.2]) {
        let c = J[0] as number, s = 0;
        for (let k = 1; k <= 40; k++) {
          if (k % 2 === 0) c += 2 * (J[k] as number) * Math.cos(k * u);
          else s += 2 * (J[k] as number) * Math.sin(k * u);
        }
        expect(c).toBeCloseTo(Math.cos(x * Math.sin(u)), 14);
        expect(s).toBeCloseTo(Math.sin(x * Math.sin(u)), 14);
      }
    }
  });

  it('is odd in x for odd orders: J_n(−x) = (−1)^n J_n(x) (A&S 9.1.5); J_n(0) = δ_n0', () => {
    const plus = besselJ(1.7, 9), minus = besselJ(-1.7, 9);
    for (let n = 0; n <= 9; n++) expect(minus[n]).toBe((n % 2 === 0 ? 1 : -1) * (plus[n] as number));
    expect(Array.from(besselJ(0, 4))).toEqual([1, 0, 0, 0, 0]);
  });
});
