// Waypoints with speeds → time-parameterised path: t = distance / speed per leg (common practice).
import { describe, expect, it } from 'vitest';
import { parseWaypoints } from '../../bridge/compare/waypoints.ts';
import { hasCode } from '../../bridge/errors.ts';

describe('parseWaypoints', () => {
  it('JSON: legs at constant speed with holds (3-4-5 leg at 0.5 m/s takes 10 s)', () => {
    const p = parseWaypoints(JSON.stringify({
      start_s: 2,
      waypoints: [{ x_m: 0, y_m: 1, dwell_s: 1 }, { x_m: 3, y_m: 5, speed_mps: 0.5, dwell_s: 2 }, { x_m: 3, y_m: 6, speed_mps: 0.25 }],
    }));
    expect(p.points.map((q) => q.timeS)).toEqual([2, 3, 13, 15, 19]);
    expect(p.legs).toEqual([0, 1, 2, 3, 3]);
    expect(p.cumulativeM[p.cumulativeM.length - 1]).toBeCloseTo(6, 12);
  });

  it('CSV: the same format as columns', () => {
    const p = parseWaypoints('x_m,y_m,speed_mps,dwell_s\n0,1,,\n1,1,0.5,\n1,2,0.25,\n');
    expect(p.points.map((q) => q.timeS)).toEqual([0, 2, 6]);
  });

  it('refuses a single waypoint, a missing speed, mm/s speeds and a zero-length leg', () => {
    const bad = (t: string, code: 'E_PATH' | 'E_INPUT_UNITS') => {
      try {
        parseWaypoints(t);
      } catch (e) {
        expect(hasCode(e, code), String(e)).toBe(true);
        return;
      }
      throw new Error('expected a failure');
    };
    bad('x_m,y_m,speed_mps\n0,1,\n', 'E_PATH');
    bad('x_m,y_m,speed_mps\n0,1,\n1,1,\n', 'E_PATH');
    bad('x_m,y_m,speed_mps\n0,1,\n1,1,300\n', 'E_INPUT_UNITS');
    bad('x_m,y_m,speed_mps\n0,1,\n0,1,0.2\n', 'E_PATH');
  });

  it('names the field of a malformed JSON document', () => {
    expect(() => parseWaypoints('{"waypoints":[{"x_m":0}]}')).toThrow(/waypoints\.0\.y_m/);
  });
});
