import { describe, expect, it } from 'vitest';
import { breakWraps, decimateMinMax } from '../../web/src/plan/decimate.ts';

describe('decimateMinMax', () => {
  it('returns short series unchanged', () => {
    expect(decimateMinMax([0, 1, 2], [5, 6, 7], 10)).toEqual({ t: [0, 1, 2], v: [5, 6, 7] });
  });

  it('caps the number of points and keeps extremes and time order', () => {
    const n = 5000;
    const t = Array.from({ length: n }, (_, i) => i * 0.1);
    const v = t.map((x) => Math.sin(x));
    v[2345] = 9; // a spike must survive
    v[4000] = -9;
    const d = decimateMinMax(t, v, 400);
    expect(d.t.length).toBeLessThanOrEqual(400);
    expect(d.v).toContain(9);
    expect(d.v).toContain(-9);
    for (let i = 1; i < d.t.length; i++) expect(d.t[i]).toBeGreaterThan(d.t[i - 1]);
  });

  it('keeps an all-gap bucket as a gap', () => {
    const t = Array.from({ length: 100 }, (_, i) => i);
    const v = t.map((i) => (i < 50 ? NaN : i));
    const d = decimateMinMax(t, v, 10);
    expect(Number.isNaN(d.v[0])).toBe(true);
    expect(d.v[d.v.length - 1]).toBe(99);
  });
});

describe('breakWraps', () => {
  it('inserts a gap where a heading crosses 360°/0°', () => {
    const out = breakWraps({ t: [0, 1, 2, 3], v: [350, 358, 2, 10] });
    expect(out.v.length).toBe(5);
    expect(Number.isNaN(out.v[2])).toBe(true);
    expect(out.t[2]).toBe(1.5);
  });
});
