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
  it('carries the line to the edge it crosses, breaks it, and resumes from the other edge', () => {
    // 358° → 2° over 1 s: the shorter way round crosses 360° half-way, at t = 1.5 s.
    const out = breakWraps({ t: [0, 1, 2, 3], v: [350, 358, 2, 10] });
    expect(out.v.length).toBe(7);
    expect(out.v.slice(0, 2)).toEqual([350, 358]);
    expect(out.v[2]).toBe(360);
    expect(Number.isNaN(out.v[3])).toBe(true);
    expect(out.v[4]).toBe(0);
    expect(out.v.slice(5)).toEqual([2, 10]);
    expect(out.t[3]).toBeCloseTo(1.5, 12);
    expect(out.t[2]).toBeLessThan(out.t[3]);
    expect(out.t[4]).toBeGreaterThan(out.t[3]);
    // Times stay in order for the chart.
    for (let i = 1; i < out.t.length; i++) expect(out.t[i]).toBeGreaterThan(out.t[i - 1]);
  });

  it('handles a turn downwards through 0° the same way', () => {
    // 5° → 345° over 2 s: 20° the short way, crossing 0° a quarter of the way, at t = 0.5 s.
    const out = breakWraps({ t: [0, 2], v: [5, 345] });
    expect(out.v[1]).toBe(0);
    expect(Number.isNaN(out.v[2])).toBe(true);
    expect(out.v[3]).toBe(360);
    expect(out.t[2]).toBeCloseTo(0.5, 12);
  });

  it('leaves a series without wraps as it is', () => {
    expect(breakWraps({ t: [0, 1, 2], v: [10, 100, 200] })).toEqual({ t: [0, 1, 2], v: [10, 100, 200] });
  });
});
