import { describe, expect, it } from 'vitest';
import { boundsOf, fitBounds, niceStep, panBy, toScreen, toWorld, trackFitBounds, visibleBounds, zoomAt, type View } from '../../web/src/plan/view.ts';

const base: View = { centreX: 0, centreY: 0, scale: 100, width: 800, height: 600 };

describe('plan view transform', () => {
  it('puts +y up and +x right with the centre in the middle', () => {
    expect(toScreen(base, 0, 0)).toEqual({ px: 400, py: 300 });
    expect(toScreen(base, 1, 2)).toEqual({ px: 500, py: 100 });
  });

  it('maps a point at azimuth 90° (clockwise from +y) to the right of the radar', () => {
    const az = Math.PI / 2, r = 2;
    const s = toScreen(base, r * Math.sin(az), r * Math.cos(az));
    expect(s.px).toBeCloseTo(600);
    expect(s.py).toBeCloseTo(300);
  });

  it('round-trips screen and world', () => {
    const v = { ...base, centreX: 1.3, centreY: -0.7, scale: 37 };
    const w = toWorld(v, 123, 456);
    const s = toScreen(v, w.x, w.y);
    expect(s.px).toBeCloseTo(123);
    expect(s.py).toBeCloseTo(456);
  });

  it('zooms about the pointer: the world point under it stays put', () => {
    const before = toWorld(base, 650, 120);
    const z = zoomAt(base, 650, 120, 2.5);
    expect(z.scale).toBe(250);
    const after = toWorld(z, 650, 120);
    expect(after.x).toBeCloseTo(before.x);
    expect(after.y).toBeCloseTo(before.y);
  });

  it('clamps zoom to its limits', () => {
    expect(zoomAt(base, 0, 0, 1e9).scale).toBe(20000);
    expect(zoomAt(base, 0, 0, 1e-9).scale).toBe(5);
  });

  it('pans with the drag: dragging right moves the world right', () => {
    const p = panBy(base, 50, -20);
    expect(toScreen(p, 0, 0)).toEqual({ px: 450, py: 280 });
  });

  it('fits bounds inside the margins, centred', () => {
    const f = fitBounds(base, { minX: -1, minY: 2, maxX: 3, maxY: 4 }, 50);
    expect(f.centreX).toBe(1);
    expect(f.centreY).toBe(3);
    expect(f.scale).toBe(175); // min(700 / 4, 500 / 2)
    const vis = visibleBounds(f);
    expect(vis.minX).toBeLessThanOrEqual(-1);
    expect(vis.maxY).toBeGreaterThanOrEqual(4);
  });

  it('computes bounds, skipping non-finite points', () => {
    expect(boundsOf([])).toBeNull();
    expect(boundsOf([{ x: 1, y: 2 }, { x: NaN, y: 0 }, { x: -1, y: 5 }])).toEqual({ minX: -1, minY: 2, maxX: 1, maxY: 5 });
  });

  it('picks 1-2-5 ring steps at least the minimum pixel spacing apart', () => {
    expect(niceStep(100, 70)).toBe(1);
    expect(niceStep(100, 150)).toBe(2);
    expect(niceStep(100, 300)).toBe(5);
    expect(niceStep(1000, 70)).toBeCloseTo(0.1);
    for (const s of [7, 55, 333, 4100]) expect(niceStep(s, 70) * s).toBeGreaterThanOrEqual(70 - 1e-9);
  });
});

describe('fitting with overlays and a minimum extent', () => {
  it('fits inside the area the insets leave free (a toolbar over the top of the canvas)', () => {
    const f = fitBounds(base, { minX: -1, minY: -1, maxX: 1, maxY: 1 }, 0, 0.5, { top: 100, right: 0, bottom: 0, left: 0 });
    expect(f.scale).toBe(250);
    // The top of the box lands at the bottom of the inset, the bottom at the canvas edge.
    expect(toScreen(f, 0, 1).py).toBeCloseTo(100, 6);
    expect(toScreen(f, 0, -1).py).toBeCloseTo(600, 6);
  });

  it('"Fit tracks" on one track frames at least about a metre, its trail included', () => {
    const b = trackFitBounds([{ x: 1, y: 3 }, { x: 1.01, y: 3.02 }])!;
    expect(b.maxX - b.minX).toBeGreaterThanOrEqual(1);
    expect(b.maxY - b.minY).toBeGreaterThanOrEqual(1);
    const f = fitBounds(base, b, 60);
    // Rings at least 10 cm apart, not 5 cm.
    expect(niceStep(f.scale)).toBeGreaterThanOrEqual(0.1);
    const long = trackFitBounds([{ x: 0, y: 2 }, { x: 3, y: 2 }, { x: 3, y: 4 }])!;
    expect(long.minX).toBeLessThan(0);
    expect(long.maxX).toBeGreaterThan(3);
  });
});
