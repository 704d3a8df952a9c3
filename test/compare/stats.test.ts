// Summary figures. p95 is the linear-interpolation sample quantile, definition 7 of Hyndman &
// Fan, "Sample quantiles in statistical packages", The American Statistician 50(4):361–365, 1996:
// Q(p) = x_(⌊h⌋) + (h − ⌊h⌋)(x_(⌊h⌋+1) − x_(⌊h⌋)), h = (n − 1)p + 1 (1-based order statistics).
import { describe, expect, it } from 'vitest';
import { figuresOf, summarise } from '../../bridge/compare/stats.ts';
import type { Deviation } from '../../bridge/compare/deviation.ts';

describe('figuresOf', () => {
  it('RMSE, mean, max and p95 of 1..20 worked by hand', () => {
    const v = Array.from({ length: 20 }, (_, i) => i + 1);
    const f = figuresOf(v);
    expect(f.rmse).toBeCloseTo(Math.sqrt((20 * 21 * 41) / 6 / 20), 12); // Σk² = n(n+1)(2n+1)/6
    expect(f.mean).toBeCloseTo(10.5, 12);
    expect(f.max).toBe(20);
    expect(f.p95).toBeCloseTo(19.05, 12); // h = 19·0.95 + 1 = 19.05 → 19 + 0.05·(20 − 19)
  });

  it('signed quantities: mean keeps the sign, max and p95 are of |error|', () => {
    const f = figuresOf([-3, 1, 1, 1], true);
    expect(f.mean).toBeCloseTo(0, 12);
    expect(f.max).toBe(3);
    expect(f.rmse).toBeCloseTo(Math.sqrt(3), 12);
  });

  it('nothing to summarise gives nulls', () => {
    expect(figuresOf([])).toEqual({ n: 0, rmse: null, mean: null, max: null, p95: null });
  });
});

describe('summarise', () => {
  it('leaves out missing speed and heading errors and reports headings in degrees', () => {
    const d = (h: number | null): Deviation => ({ timeS: 0, cmdX: 0, cmdY: 0, segment: 0, positionM: 0.1, alongM: 0, crossM: 0.1, speedMps: h === null ? null : 0, headingRad: h });
    const s = summarise([d(Math.PI / 18), d(null)]);
    expect(s.position.n).toBe(2);
    expect(s.headingDeg.n).toBe(1);
    expect(s.headingDeg.mean).toBeCloseTo(10, 12);
  });
});
