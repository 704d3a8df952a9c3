// Rigid 2-D transform, rotation counter-clockwise then translation (common practice; the same
// convention as bridge/sim/measure.ts positionerToRadar).
import { describe, expect, it } from 'vitest';
import { pathToRadarFrame, toRadarFrame } from '../../bridge/compare/frame.ts';
import { makeTimedPath } from '../../bridge/compare/timed-path.ts';

describe('toRadarFrame', () => {
  it('turns (1, 0) by 90° onto (0, 1), then shifts', () => {
    const p = toRadarFrame(1, 0, { rotationRad: Math.PI / 2, tx: 0.5, ty: -0.25 });
    expect(p.x).toBeCloseTo(0.5, 12);
    expect(p.y).toBeCloseTo(0.75, 12);
  });
  it('keeps lengths and times of a path', () => {
    const path = makeTimedPath([{ timeS: 0, x: 0, y: 2 }, { timeS: 2, x: 1, y: 2 }]);
    const q = pathToRadarFrame(path, { rotationRad: 0.05, tx: 0.05, ty: -0.08 });
    expect(q.cumulativeM[1]).toBeCloseTo(1, 12);
    expect(q.points.map((p) => p.timeS)).toEqual([0, 2]);
  });
});
