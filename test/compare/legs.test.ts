// Legs of a commanded path: split at corners and at starts/stops (common practice for per-leg figures).
import { describe, expect, it } from 'vitest';
import { findLegs } from '../../bridge/compare/legs.ts';
import { makeTimedPath } from '../../bridge/compare/timed-path.ts';
import { waypointsToPath } from '../../bridge/compare/waypoints.ts';

describe('findLegs', () => {
  it('splits a sampled L at its corner and a hold at the end; keeps gentle bends in one leg', () => {
    const pts = [];
    for (let k = 0; k <= 10; k++) pts.push({ timeS: k, x: 0.1 * k, y: 2 + 0.001 * k * k }); // slight bend
    for (let k = 1; k <= 5; k++) pts.push({ timeS: 10 + k, x: 1, y: 2.1 + 0.1 * k }); // corner, north
    pts.push({ timeS: 20, x: 1, y: 2.6 }); // hold
    const { legs, legOfSegment } = findLegs(makeTimedPath(pts));
    expect(legs.map((l) => l.kind)).toEqual(['move', 'move', 'hold']);
    expect(legOfSegment[9]).toBe(0);
    expect(legOfSegment[10]).toBe(1);
    expect(legs[1].lengthM).toBeCloseTo(0.5, 12);
    expect(legs[2].startS).toBe(15);
  });

  it('uses the waypoint legs when the input names them', () => {
    const p = waypointsToPath([{ x: 0, y: 1 }, { x: 1, y: 1, speedMps: 0.5 }, { x: 2, y: 1, speedMps: 0.25 }]);
    const { legs } = findLegs(p);
    expect(legs.map((l) => l.speedMps)).toEqual([0.5, 0.25]); // collinear, but two legs as commanded
  });

  it('folds a sliver at a ramped corner into the leg before it', () => {
    // East 2 s, a 0.1 s creep south-east at the corner, then north 2 s.
    const p = makeTimedPath([
      { timeS: 0, x: 0, y: 2 }, { timeS: 2, x: 0.5, y: 2 }, { timeS: 2.1, x: 0.501, y: 1.999 }, { timeS: 4.1, x: 0.501, y: 2.5 },
    ]);
    const { legs, legOfSegment } = findLegs(p);
    expect(legOfSegment).toEqual([0, 0, 1]);
    expect(legs).toHaveLength(2);
    expect(legs[0].endS).toBe(2.1);
  });
});

describe('findLegs: the run\'s last half second', () => {
  it('folds a 0.5 s, 6 cm tail into the leg before (a report showed it as its own leg)', async () => {
    const { makeTimedPath: mk } = await import('../../bridge/compare/timed-path.ts');
    const { findLegs: fl } = await import('../../bridge/compare/legs.ts');
    const pts = [];
    for (let k = 0; k <= 30; k++) pts.push({ timeS: 116.5 + k * 0.1, x: 1.5, y: 3 });
    pts.push({ timeS: 119.6, x: 1.49, y: 3 }, { timeS: 119.8, x: 1.47, y: 3 }, { timeS: 120.0, x: 1.4375, y: 3 });
    const { legs } = fl(mk(pts));
    expect(legs).toHaveLength(1);
    expect(legs[0].endS).toBe(120);
    expect(legs[0].kind).toBe('hold');
  });
});
