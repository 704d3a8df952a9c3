import { describe, expect, it } from 'vitest';
import { MofN, probabilityAtLeast, resolveInitiationOptions } from '../../bridge/tracking/m-of-n.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import { hasCode } from '../../bridge/errors.ts';

/** Binomial tail recomputed here term by term: Σ_{k=m..n} C(n,k) p^k (1−p)^(n−k). */
function tail(m: number, n: number, p: number): number {
  const c = (a: number, b: number): number => (b === 0 ? 1 : (c(a, b - 1) * (a - b + 1)) / b);
  let s = 0;
  for (let k = m; k <= n; k++) s += c(n, k) * p ** k * (1 - p) ** (n - k);
  return s;
}

describe('M-of-N confirmation (Blackman & Popoli 1999)', () => {
  it('P(≥2 of 3) = 0.972 and P(≥3 of 5) = 0.99144 at P_D = 0.9 (binomial, recomputed)', () => {
    expect(tail(2, 3, 0.9)).toBeCloseTo(0.972, 6);
    expect(tail(3, 5, 0.9)).toBeCloseTo(0.99144, 6);
    expect(probabilityAtLeast(2, 3, 0.9)).toBeCloseTo(tail(2, 3, 0.9), 12);
    expect(probabilityAtLeast(3, 5, 0.9)).toBeCloseTo(tail(3, 5, 0.9), 12);
  });

  it('the sliding window confirms a target with the binomial probability (Monte Carlo)', () => {
    // The first scan is the initiating hit; the other N − 1 scans are Bernoulli(P_D). A track is
    // confirmed within its first N scans iff ≥ M − 1 of those N − 1 are hits.
    const rng = createRng(9);
    const pd = 0.7;
    const runs = 20000;
    let confirmed = 0;
    for (let r = 0; r < runs; r++) {
      const w = new MofN(3, 5);
      for (let k = 1; k < 5 && !w.confirmed() && !w.failed(); k++) w.record(rng.uniform() < pd);
      if (w.confirmed()) confirmed++;
    }
    const expected = tail(2, 4, pd);
    // 4 standard errors of a binomial proportion.
    expect(Math.abs(confirmed / runs - expected)).toBeLessThan(4 * Math.sqrt((expected * (1 - expected)) / runs));
  });

  it('fails a tentative track as soon as M is out of reach', () => {
    const w = new MofN(3, 4);
    w.record(false);
    expect(w.failed()).toBe(false);
    w.record(false);
    expect(w.failed()).toBe(true);
  });

  it('validates M ≤ N', () => {
    let err: unknown;
    try {
      resolveInitiationOptions({ m: 5, n: 3 });
    } catch (e) {
      err = e;
    }
    expect(hasCode(err, 'E_OPTION')).toBe(true);
    expect(resolveInitiationOptions()).toEqual({ m: 3, n: 4, maxSpeedMps: 1.5 });
  });
});
