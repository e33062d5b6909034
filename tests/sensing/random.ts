/** A seeded normal generator for Monte Carlo tests (mulberry32 + Box–Muller), so runs repeat. */
export function normalSource(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = (): number => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  let spare: number | undefined;
  return () => {
    if (spare !== undefined) {
      const s = spare;
      spare = undefined;
      return s;
    }
    let u = 0;
    while (u === 0) u = uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

export const mean = (x: ArrayLike<number>): number => {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i] as number;
  return s / x.length;
};

export const std = (x: ArrayLike<number>): number => {
  const m = mean(x);
  let s = 0;
  for (let i = 0; i < x.length; i++) s += ((x[i] as number) - m) ** 2;
  return Math.sqrt(s / (x.length - 1));
};
