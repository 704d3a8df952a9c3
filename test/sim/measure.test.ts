import { describe, expect, it } from 'vitest';
import { meanAmplitude, positionerToRadar, toPolar, wrapPi, wrapTwoPi } from '../../bridge/sim/measure.ts';
import { resolveScenarioOptions } from '../../bridge/sim/scenario.ts';

describe('geometry', () => {
  it('azimuth is clockwise from +y: x = r·sin(az), y = r·cos(az) (docs/conventions.md)', () => {
    expect(toPolar(0, 2)).toEqual({ rangeM: 2, azimuthRad: 0 });
    expect(toPolar(2, 0).azimuthRad).toBeCloseTo(Math.PI / 2, 15);
    expect(toPolar(-1, 0).azimuthRad).toBeCloseTo((3 * Math.PI) / 2, 15);
    const p = toPolar(3, 4);
    expect(p.rangeM).toBe(5);
    expect(5 * Math.sin(p.azimuthRad)).toBeCloseTo(3, 12);
  });

  it('wraps into [0, 2π) and [−π, π)', () => {
    expect(wrapTwoPi(-1e-17)).toBeLessThan(2 * Math.PI);
    expect(wrapTwoPi(7)).toBeCloseTo(7 - 2 * Math.PI, 15);
    expect(wrapPi(Math.PI)).toBeCloseTo(-Math.PI, 15);
    expect(wrapPi(-0.1)).toBeCloseTo(-0.1, 15);
  });

  it('positioner → radar frame rotates counter-clockwise then translates', () => {
    const s = positionerToRadar({ x: 1, y: 0, vx: 0, vy: 1 }, Math.PI / 2, { x: 0.5, y: 2 });
    expect(s.x).toBeCloseTo(0.5, 15);
    expect(s.y).toBeCloseTo(3, 15);
    expect(s.vx).toBeCloseTo(-1, 15);
    expect(s.vy).toBeCloseTo(0, 15);
  });

  it('amplitude falls as R⁻² and grows as √σ', () => {
    // Received power ∝ σ/R⁴ (Skolnik, Introduction to Radar Systems, 3rd ed., eq. 1.3), so voltage ∝ √σ/R².
    const sc = resolveScenarioOptions({});
    expect(meanAmplitude(sc, 0.04, 2) / meanAmplitude(sc, 0.04, 4)).toBeCloseTo(4, 12);
    expect(meanAmplitude(sc, 0.16, 3) / meanAmplitude(sc, 0.04, 3)).toBeCloseTo(2, 12);
  });
});
