// OSPA/GOSPA over time (Schuhmacher, Vo & Vo 2008; Rahmathullah, García-Fernández & Svensson
// 2017): each instant reduces to the set distance of ospa.ts, checked here on hand-made sets.
import { describe, expect, it } from 'vitest';
import { setMetricSeries, summariseSetSeries } from '../../bridge/compare/multi.ts';
import { makeTimedPath } from '../../bridge/compare/timed-path.ts';
import type { TrackRow } from '../../bridge/compare/track-rows.ts';

const path = makeTimedPath([{ timeS: 0, x: 0, y: 2 }, { timeS: 2, x: 0, y: 2 }]);
const row = (timeS: number, id: number, x: number, y: number, vx = 0): TrackRow => ({
  timeS, id, status: 'confirmed', x, y, vx, vy: 0, speed: Math.abs(vx), headingRad: 0,
});

describe('setMetricSeries', () => {
  it('a target 0.3 m off plus a false track: GOSPA² = 0.09 + c²/2', () => {
    const rows = [row(0, 1, 0.3, 2), row(0, 2, 3, 3), row(1, 1, 0.3, 2), row(1, 2, 3, 3)];
    const s = setMetricSeries([path], rows, { stepS: 0.5, maxAgeS: 1.5, cutoffM: 1, order: 2 });
    expect(s.map((x) => x.timeS)).toEqual([0, 0.5, 1, 1.5, 2]);
    for (const x of s) {
      expect(x.estimates).toBe(2);
      expect(x.localisation).toBeCloseTo(0.09, 12);
      expect(x.false).toBeCloseTo(0.5, 12);
      expect(x.gospaM).toBeCloseTo(Math.sqrt(0.59), 12);
      expect(x.ospaM).toBeCloseTo(Math.sqrt((0.09 + 1) / 2), 12); // OSPA: (1/n)(d² + c²(n − m))
    }
    expect(summariseSetSeries(s).meanFalse).toBeCloseTo(0.5, 12);
  });

  it('predicts tracks to the grid time and drops stale ones (then the target is missed)', () => {
    // Track at x = −0.2 moving +0.2 m/s: at t = 1 it is predicted onto the target exactly.
    const s = setMetricSeries([path], [row(0, 1, -0.2, 2, 0.2)], { stepS: 1, maxAgeS: 1.5 });
    expect(s[1].localisation).toBeCloseTo(0, 12);
    expect(s[2].estimates).toBe(0);
    expect(s[2].missed).toBeCloseTo(0.5, 12);
  });

  it('leaves out tracks of reflectors that never moved', () => {
    const still = { ...row(0, 3, 2, 2), moving: false };
    const s = setMetricSeries([path], [row(0, 1, 0, 2), still], { stepS: 1, maxAgeS: 1.5 });
    expect(s[0].estimates).toBe(1);
    expect(s[0].false).toBe(0);
  });
});
