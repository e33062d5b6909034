/**
 * Bessel functions of the first kind J_0 … J_n at one argument, by Miller's backward recurrence
 * J_{k-1}(x) = (2k/x) J_k(x) − J_{k+1}(x), normalised with J_0 + 2 Σ_{k≥1} J_{2k} = 1
 * (Abramowitz & Stegun 9.1.27 and 9.1.46). Accurate to a few ulp of the largest value.
 */
export function besselJ(x: number, nMax: number, out: Float64Array = new Float64Array(nMax + 1)): Float64Array {
  const ax = Math.abs(x);
  out.fill(0, 0, nMax + 1);
  if (ax < 1e-6) {
    // Leading terms of the power series (A&S 9.1.10); the next term is O(x^4) relative.
    let term = 1;
    for (let k = 0; k <= nMax; k++) {
      if (k > 0) term *= ax / 2 / k;
      out[k] = term * (1 - (ax * ax) / 4 / (k + 1));
    }
  } else {
    const top = Math.max(nMax, Math.ceil(ax));
    // Start far enough above max(n, x) that J_start is negligible (NR §6.5 uses √(40 n)).
    const start = 2 * Math.ceil((top + 8 + Math.sqrt(40 * top)) / 2);
    const inv = 2 / ax;
    let jNext = 0;
    let j = 1e-300;
    let norm = 0;
    for (let k = start; k > 0; k--) {
      const jPrev = k * inv * j - jNext;
      jNext = j;
      j = jPrev;
      const m = k - 1;
      if (m <= nMax) out[m] = j;
      if ((m & 1) === 0 && m > 0) norm += 2 * j;
      if (j > 1e250 || j < -1e250) {
        j *= 1e-250;
        jNext *= 1e-250;
        norm *= 1e-250;
        for (let i = m; i <= nMax; i++) out[i] = (out[i] as number) * 1e-250;
      }
    }
    norm += j; // J_0
    const scaleBy = 1 / norm;
    for (let k = 0; k <= nMax; k++) out[k] = (out[k] as number) * scaleBy;
  }
  if (x < 0) for (let k = 1; k <= nMax; k += 2) out[k] = -(out[k] ?? 0); // J_n(−x) = (−1)^n J_n(x)
  return out;
}
