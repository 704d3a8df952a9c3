import { describe, expect, it } from 'vitest';
import { waypointTrajectory } from '../../bridge/sim/waypoints.ts';

describe('waypointTrajectory', () => {
  const pts = [{ x: 0, y: 2, dwellS: 1 }, { x: 1, y: 2, speedMps: 0.5 }, { x: 1, y: 3, speedMps: 0.25 }];

  it('each leg takes its own speed, dwells on the way', () => {
    const f = waypointTrajectory(pts, 0.1, Infinity, false);
    expect(f(0.5)).toEqual({ x: 0, y: 2, vx: 0, vy: 0 });
    // leg 1 at the default speed 0.1 m/s: 1 m in 10 s after the 1 s dwell
    expect(f(6).x).toBeCloseTo(0.5, 12);
    expect(f(6).vx).toBeCloseTo(0.1, 12);
    // leg 2 leaves point 2 at its own 0.5 m/s
    expect(f(12).y).toBeCloseTo(2.5, 12);
    expect(f(12).vy).toBeCloseTo(0.5, 12);
    expect(f(100)).toEqual({ x: 1, y: 3, vx: 0, vy: 0 });
  });

  it('loops back to the start', () => {
    const f = waypointTrajectory(pts, 0.1, Infinity, true);
    const cycle = 1 + 10 + 2 + Math.SQRT2 / 0.25;
    expect(f(cycle + 0.5).x).toBeCloseTo(0, 9);
    expect(f(cycle + 6).x).toBeCloseTo(0.5, 9);
  });
});
