import { describe, expect, it } from 'vitest';
import { makeTrajectory, type TrajectorySpec } from '../../bridge/sim/trajectories.ts';

const specs: Record<string, TrajectorySpec> = {
  line: { kind: 'line', from: { x: -1, y: 2 }, to: { x: 1, y: 3 }, speedMps: 0.3, accelMps2: 0.5, startS: 1 },
  circle: { kind: 'circle', center: { x: 0, y: 3 }, radiusM: 0.6, periodS: 12, startAngleDeg: 30 },
  eight: { kind: 'figure-eight', center: { x: 0.4, y: 2.8 }, widthM: 1.6, heightM: 0.8, periodS: 20, rotationDeg: 15 },
  rail: { kind: 'rail', from: { x: -1.5, y: 3 }, to: { x: 1.5, y: 3 }, speedMps: 0.25, accelMps2: 0.5, dwellS: 5, stops: [{ at: 0.5, dwellS: 3 }] },
  profile: { kind: 'profile', start: { x: 0, y: 1.5 }, headingDeg: 20, segments: [{ durationS: 2, accelMps2: 0.4 }, { durationS: 2, accelMps2: -0.8 }] },
  waypoints: { kind: 'waypoints', speedMps: 0.3, accelMps2: 0.4, loop: true, points: [{ x: 0, y: 2, dwellS: 1 }, { x: 1, y: 2 }, { x: 1, y: 3, speedMps: 0.1 }] },
};

describe('trajectories', () => {
  it('velocity is the time derivative of position (central differences)', () => {
    // Central difference error O(h²) (common practice); h = 1 ms.
    const h = 1e-3;
    for (const [name, spec] of Object.entries(specs)) {
      const f = makeTrajectory(spec);
      for (let t = 0.37; t < 60; t += 1.13) {
        const a = f(t - h);
        const b = f(t + h);
        const s = f(t);
        const dx = (b.x - a.x) / (2 * h);
        const dy = (b.y - a.y) / (2 * h);
        // Ramps change speed abruptly at their ends, so allow the difference to straddle a kink (a·h).
        expect(Math.abs(dx - s.vx), `${name} vx at ${t}`).toBeLessThan(2e-3);
        expect(Math.abs(dy - s.vy), `${name} vy at ${t}`).toBeLessThan(2e-3);
      }
    }
  });

  it('circle keeps its radius and speed 2πR/T, clockwise from +y', () => {
    const f = makeTrajectory(specs.circle);
    for (const t of [0, 1, 5.5, 11]) {
      const s = f(t);
      expect(Math.hypot(s.x - 0, s.y - 3)).toBeCloseTo(0.6, 12);
      expect(Math.hypot(s.vx, s.vy)).toBeCloseTo((2 * Math.PI * 0.6) / 12, 12);
    }
    const s0 = f(0);
    expect(s0.x).toBeCloseTo(0.6 * Math.sin(Math.PI / 6), 12);
    expect(f(3).x).toBeCloseTo(0.6 * Math.sin(Math.PI / 6 + Math.PI / 2), 12); // quarter turn clockwise
  });

  it('figure-eight crosses its centre twice per period', () => {
    const f = makeTrajectory(specs.eight);
    expect(f(0).x).toBeCloseTo(0.4, 12);
    expect(f(10).y).toBeCloseTo(2.8, 12);
    expect(f(20).x).toBeCloseTo(0.4, 12);
  });

  it('rail dwells at its ends and at the stop, and comes back', () => {
    const f = makeTrajectory(specs.rail);
    expect(f(2)).toEqual({ x: -1.5, y: 3, vx: 0, vy: 0 }); // initial dwell
    // leg to the mid stop: 1.5 m at 0.25 m/s with 0.5 m/s² ramps takes 1.5/0.25 + 0.25/0.5 = 6.5 s
    expect(f(5 + 6.5 + 1).x).toBeCloseTo(0, 12);
    expect(f(5 + 6.5 + 1).vx).toBe(0);
    const toEnd = 5 + 6.5 + 3 + 6.5; // at the far end
    expect(f(toEnd + 2).x).toBeCloseTo(1.5, 12);
    expect(f(toEnd + 5 + 3).vx).toBeLessThan(0); // on the way back
    const cycle = 2 * toEnd;
    expect(f(cycle + 2).x).toBeCloseTo(-1.5, 12);
  });

  it('static holds still', () => {
    expect(makeTrajectory({ kind: 'static', at: { x: 1, y: 2 } })(99)).toEqual({ x: 1, y: 2, vx: 0, vy: 0 });
  });
});
