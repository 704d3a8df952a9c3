import { describe, expect, it } from 'vitest';
import chisqQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import { createRng, mulberry32 } from '../../bridge/sim/prng.ts';

describe('mulberry32 / createRng', () => {
  it('is deterministic per seed and differs between seeds', () => {
    const a = mulberry32(42);
    const b = mulberry32(42);
    const c = mulberry32(43);
    const sa = Array.from({ length: 5 }, a);
    expect(Array.from({ length: 5 }, b)).toEqual(sa);
    expect(Array.from({ length: 5 }, c)).not.toEqual(sa);
    for (const u of sa) expect(u >= 0 && u < 1).toBe(true);
  });

  it('uniform: mean 1/2 and variance 1/12 within 4 standard errors', () => {
    // Mean and variance of U(0,1) (Papoulis & Pillai, Probability, Random Variables and Stochastic
    // Processes, 4th ed., ch. 5, uniform density; from memory). SE of the mean: √(1/12/n).
    const rng = createRng(7);
    const n = 200_000;
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const u = rng.uniform();
      s += u;
      s2 += u * u;
    }
    const mean = s / n;
    expect(Math.abs(mean - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
    // Var of U² is 1/5 − 1/9 = 4/45, which bounds the error of the second moment.
    expect(Math.abs(s2 / n - mean * mean - 1 / 12)).toBeLessThan(4 * Math.sqrt(4 / 45 / n));
  });

  it('normal: sample variance inside the 99.9% χ² interval', () => {
    // (n−1)s²/σ² ~ χ²(n−1) for Gaussian samples (Papoulis & Pillai, §7-4 on sampling
    // distributions; section number from memory).
    const rng = createRng(11);
    const n = 5000;
    const sigma = 0.3;
    const xs = Array.from({ length: n }, () => rng.normal(2, sigma));
    const mean = xs.reduce((p, q) => p + q, 0) / n;
    const s2 = xs.reduce((p, q) => p + (q - mean) ** 2, 0) / (n - 1);
    const stat = ((n - 1) * s2) / (sigma * sigma);
    expect(stat).toBeGreaterThan(chisqQuantile(0.0005, n - 1));
    expect(stat).toBeLessThan(chisqQuantile(0.9995, n - 1));
    expect(Math.abs(mean - 2)).toBeLessThan((4 * sigma) / Math.sqrt(n));
  });

  it('poisson: mean and variance both equal λ (small and large λ)', () => {
    // Poisson: E[N] = Var[N] = λ (Papoulis & Pillai, ch. 4; from memory).
    for (const lambda of [0.7, 12, 900]) {
      const rng = createRng(3);
      const n = 20_000;
      const ks = Array.from({ length: n }, () => rng.poisson(lambda));
      const mean = ks.reduce((p, q) => p + q, 0) / n;
      const v = ks.reduce((p, q) => p + (q - mean) ** 2, 0) / (n - 1);
      expect(Math.abs(mean - lambda)).toBeLessThan(4 * Math.sqrt(lambda / n));
      // Var(s²) ≈ (μ₄ − σ⁴)/n with the Poisson μ₄ = λ(1 + 3λ), so s²/λ has relative std √((1/λ + 2)/n)
      // (large-sample variance of the sample variance; Papoulis & Pillai, ch. 7, from memory).
      expect(Math.abs(v / lambda - 1)).toBeLessThan(4 * Math.sqrt((1 / lambda + 2) / n));
    }
    expect(createRng(1).poisson(0)).toBe(0);
  });

  it('rayleigh has unit mean square', () => {
    // E[x²] of a Rayleigh variate built as √(−ln u) is E[Exp(1)] = 1 (common practice).
    const rng = createRng(5);
    const n = 100_000;
    let s2 = 0;
    for (let i = 0; i < n; i++) s2 += rng.rayleigh() ** 2;
    expect(Math.abs(s2 / n - 1)).toBeLessThan(4 / Math.sqrt(n));
  });
});
