// Along/cross-track split of the error vector in the commanded direction of travel; the cases
// are worked by hand (common practice for path-following error).
import { describe, expect, it } from 'vitest';
import { deviationAt, deviations } from '../../bridge/compare/deviation.ts';
import { makeTimedPath } from '../../bridge/compare/timed-path.ts';

// A square 2 m side, 0.4 m/s, counter-clockwise seen from above: east, north, west, south.
const square = makeTimedPath([
  { timeS: 0, x: -1, y: 2 },
  { timeS: 5, x: 1, y: 2 },
  { timeS: 10, x: 1, y: 4 },
  { timeS: 15, x: -1, y: 4 },
  { timeS: 20, x: -1, y: 2 },
]);

describe('deviationAt', () => {
  it('a constant offset to the left gives that cross-track error on every leg', () => {
    const offset = 0.15;
    const states = [];
    for (let t = 0.25; t < 20; t += 0.5) {
      const d0 = deviationAt(square, { timeS: t, x: 0, y: 0 });
      // Left normal of the leg direction (u = (ux, uy) → (−uy, ux)); reuse the commanded point.
      const leg = Math.floor(t / 5);
      const u = [[1, 0], [0, 1], [-1, 0], [0, -1]][leg];
      states.push({ timeS: t, x: d0.cmdX - offset * u[1], y: d0.cmdY + offset * u[0], vx: 0.4 * u[0], vy: 0.4 * u[1] });
    }
    for (const d of deviations(square, states)) {
      expect(d.crossM).toBeCloseTo(offset, 12);
      expect(d.alongM).toBeCloseTo(0, 12);
      expect(d.positionM).toBeCloseTo(offset, 12);
      expect(d.speedMps).toBeCloseTo(0, 12);
      expect(d.headingRad).toBeCloseTo(0, 12);
    }
  });

  it('a track 0.5 s late is behind by speed × lag, and aligning removes it', () => {
    // Command at t = 2.5 − 0.5 = 2 s is x = −1 + 0.4·2 = −0.2.
    const late = { timeS: 2.5, x: -0.2, y: 2, vx: 0.4, vy: 0 };
    const d = deviationAt(square, late);
    expect(d.alongM).toBeCloseTo(-0.2, 12);
    expect(d.crossM).toBeCloseTo(0, 12);
    expect(deviationAt(square, late, 0.5).positionM).toBeCloseTo(0, 12);
  });

  it('a track to the right (outside of the counter-clockwise square) is negative', () => {
    expect(deviationAt(square, { timeS: 7.5, x: 1.3, y: 3 }).crossM).toBeCloseTo(-0.3, 12);
  });

  it('speed and heading errors against the commanded velocity', () => {
    const d = deviationAt(square, { timeS: 2, x: -0.2, y: 2, vx: 0.5, vy: 0.5 * Math.tan(0.1) });
    expect(d.headingRad).toBeCloseTo(-0.1, 12); // turned left of east: heading is clockwise from +y
    expect(d.speedMps).toBeCloseTo(0.5 / Math.cos(0.1) - 0.4, 12);
  });
});
