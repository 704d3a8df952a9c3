/**
 * A small seeded pseudo-random generator for the simulator, so that a scenario and a seed give
 * the same run on every machine.
 *
 * The core is mulberry32 (Tommy Ettinger's 32-bit generator, public domain): one 32-bit state,
 * period 2³², good enough for simulated noise and far from cryptographic. Gaussian variates use
 * the Box–Muller transform (Box & Muller, Ann. Math. Stat. 29(2):610–611, 1958); Poisson counts
 * use Knuth's product method for small means and a normal approximation above 500 (Knuth,
 * The Art of Computer Programming vol. 2, §3.4.1).
 */
export interface Rng {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Uniform on [lo, hi). */
  between(lo: number, hi: number): number;
  /** Normal with the given mean and standard deviation. */
  normal(mean?: number, std?: number): number;
  /** Poisson-distributed count with the given mean (≥ 0). */
  poisson(mean: number): number;
  /** True with probability p. */
  chance(p: number): boolean;
  /** Rayleigh variate with E[x²] = 1 (amplitude of a unit-power complex Gaussian). */
  rayleigh(): number;
}

/** mulberry32: returns a function giving uniform floats on [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A seeded generator with the distributions the simulator needs. */
export function createRng(seed: number): Rng {
  const next = mulberry32(seed);
  // Box–Muller yields two variates per pair of uniforms; keep the second for the next call.
  let spare: number | null = null;
  const standardNormal = (): number => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = next();
    while (u === 0) u = next(); // ln(0) would be -∞
    const v = next();
    const mag = Math.sqrt(-2 * Math.log(u));
    spare = mag * Math.sin(2 * Math.PI * v);
    return mag * Math.cos(2 * Math.PI * v);
  };
  return {
    uniform: next,
    between: (lo, hi) => lo + (hi - lo) * next(),
    normal: (mean = 0, std = 1) => mean + std * standardNormal(),
    poisson(mean) {
      if (!(mean > 0)) return 0;
      if (mean > 500) return Math.max(0, Math.round(mean + Math.sqrt(mean) * standardNormal()));
      const limit = Math.exp(-mean);
      let k = 0;
      let p = next();
      while (p > limit) {
        k++;
        p *= next();
      }
      return k;
    },
    chance: (p) => next() < p,
    rayleigh() {
      let u = next();
      while (u === 0) u = next();
      return Math.sqrt(-Math.log(u)); // E[x²] = E[-ln u] = 1
    },
  };
}
