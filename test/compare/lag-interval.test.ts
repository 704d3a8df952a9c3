// Confidence interval of the lag by the moving-block bootstrap (Künsch 1989, see lag-interval.ts).
// Runs with a known lag by construction: the interval must hold it and say "significant" only
// when it excludes zero.
import { describe, expect, it } from 'vitest';
import { estimateLag, resolveLagOptions } from '../../bridge/compare/lag.ts';
import { lagInterval } from '../../bridge/compare/lag-interval.ts';
import { path, shifted } from './lag-fixture.ts';

const o = resolveLagOptions();

describe('lagInterval', () => {
  it('holds a 0.4 s lag and excludes zero', () => {
    for (const seed of [1, 2, 3]) {
      const s = shifted(0.4, 0.03, seed);
      const e = estimateLag(path, s, o);
      const i = lagInterval(path, s, e.lagS!, o)!;
      expect(i.lowS).toBeLessThanOrEqual(0.4);
      expect(i.highS).toBeGreaterThanOrEqual(0.4);
      expect(i.highS - i.lowS).toBeLessThan(0.2);
      expect(i.significant).toBe(true);
      expect(i.undetermined).toBe(false);
    }
  });

  it('calls a zero lag not significant', () => {
    for (const seed of [4, 5, 6]) {
      const s = shifted(0, 0.05, seed);
      const i = lagInterval(path, s, estimateLag(path, s, o).lagS!, o)!;
      expect(i.lowS).toBeLessThan(0);
      expect(i.highS).toBeGreaterThan(0);
      expect(i.significant).toBe(false);
    }
  });

  it('widens with the noise, and is reproducible', () => {
    const quiet = shifted(0.2, 0.01, 7);
    const loud = shifted(0.2, 0.3, 7);
    const iq = lagInterval(path, quiet, estimateLag(path, quiet, o).lagS!, o)!;
    const il = lagInterval(path, loud, estimateLag(path, loud, o).lagS!, o)!;
    expect(il.highS - il.lowS).toBeGreaterThan(3 * (iq.highS - iq.lowS));
    expect(lagInterval(path, loud, estimateLag(path, loud, o).lagS!, o)).toEqual(il);
  });

  it('needs at least 20 samples', () => {
    expect(lagInterval(path, shifted(0.2, 0.01, 1).slice(0, 15), 0.2, o)).toBeNull();
  });
});
