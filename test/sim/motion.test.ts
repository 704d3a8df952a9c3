import { describe, expect, it } from 'vitest';
import { segmentedMotion, trapezoidMove } from '../../bridge/sim/motion.ts';

// Constant-acceleration kinematics s = v0·t + ½·a·t² (common practice).
describe('trapezoidMove', () => {
  it('trapezoid: duration d/v + v/a, ends at rest at d', () => {
    const m = trapezoidMove(3, 0.5, 1);
    expect(m.durationS).toBeCloseTo(3 / 0.5 + 0.5 / 1, 12);
    expect(m.at(m.durationS).s).toBe(3);
    expect(m.at(m.durationS + 5)).toEqual({ s: 3, v: 0 });
    expect(m.at(0.25)).toEqual({ s: 0.5 * 1 * 0.25 ** 2, v: 0.25 });
    expect(m.at(3).v).toBe(0.5); // cruising
  });

  it('triangle when the distance is too short to reach cruise speed', () => {
    const m = trapezoidMove(0.1, 2, 1); // v_peak = √(d·a) ≈ 0.316
    expect(m.durationS).toBeCloseTo(2 * Math.sqrt(0.1), 12);
    expect(m.at(m.durationS / 2).v).toBeCloseTo(Math.sqrt(0.1), 12);
    expect(m.at(m.durationS / 2).s).toBeCloseTo(0.05, 12);
  });

  it('without ramps, speed jumps to cruise', () => {
    const m = trapezoidMove(2, 0.4, Infinity);
    expect(m.durationS).toBeCloseTo(5, 12);
    expect(m.at(1)).toEqual({ s: 0.4, v: 0.4 });
  });
});

describe('segmentedMotion', () => {
  it('accelerate, brake to a stop, reverse', () => {
    const f = segmentedMotion(0, [{ durationS: 2, accelMps2: 0.5 }, { durationS: 2, accelMps2: -0.5 }, { durationS: 1, accelMps2: -1 }]);
    expect(f(2)).toEqual({ s: 1, v: 1 });
    expect(f(4).s).toBeCloseTo(2, 12);
    expect(f(4).v).toBeCloseTo(0, 12);
    expect(f(5).s).toBeCloseTo(1.5, 12);
    expect(f(5).v).toBeCloseTo(-1, 12);
    expect(f(7).s).toBeCloseTo(-0.5, 12); // keeps the final speed after the last segment
  });
});
