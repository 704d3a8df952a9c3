// Commanded path CSV reader and its plausibility checks. Polar conversion x = r·sin(az),
// y = r·cos(az) with azimuth clockwise from +y (docs/conventions.md).
import { describe, expect, it } from 'vitest';
import { parseCommandedCsv, parseCommandedTargets } from '../../bridge/compare/commanded-csv.ts';
import { EchotrailError } from '../../bridge/errors.ts';

function failure(text: string): EchotrailError {
  try {
    parseCommandedCsv(text, 'path.csv');
  } catch (e) {
    if (e instanceof EchotrailError) return e;
    throw e;
  }
  throw new Error('expected a failure');
}

describe('parseCommandedCsv', () => {
  it('reads x/y columns in any order, with comments and blank lines', () => {
    const p = parseCommandedCsv('y_m,time_s,x_m\n# start\n2,0,1\n\n2,1,1.5\n');
    expect(p.points.map((q) => [q.timeS, q.x, q.y])).toEqual([[0, 1, 2], [1, 1.5, 2]]);
    expect(p.points[1].line).toBe(5);
  });

  it('converts azimuth/range: 90° at 2 m is (2, 0); 30° at 4 m is (2, 2√3)', () => {
    const p = parseCommandedCsv('time_s,azimuth_deg,range_m\n0,90,2\n4,30,4\n');
    expect(p.points[0].x).toBeCloseTo(2, 12);
    expect(p.points[0].y).toBeCloseTo(0, 12);
    expect(p.points[1].x).toBeCloseTo(2, 12);
    expect(p.points[1].y).toBeCloseTo(2 * Math.sqrt(3), 12);
  });

  it('keeps a segment column as leg labels', () => {
    expect(parseCommandedCsv('time_s,x_m,y_m,segment\n0,0,1,a\n1,0.1,1,a\n2,0.2,1,b\n').legs).toEqual([0, 0, 1]);
  });

  it('refuses a path with one point', () => {
    const e = failure('time_s,x_m,y_m\n0,1,2\n');
    expect(e.code).toBe('E_PATH');
    expect(e.message).toMatch(/1 point/);
  });

  it('refuses duplicate times, naming both lines', () => {
    const e = failure('time_s,x_m,y_m\n0,1,2\n1,1.1,2\n1,1.2,2\n');
    expect(e.code).toBe('E_INPUT_ROW');
    expect(e.message).toMatch(/line 4: duplicate time 1 s \(also line 3\)/);
  });

  it('refuses millimetres in metre columns', () => {
    const e = failure('time_s,x_m,y_m\n0,1000,2000\n1,1100,2000\n');
    expect(e.code).toBe('E_INPUT_UNITS');
    expect(e.message).toMatch(/millimetres/);
  });

  it('refuses degrees in a range column', () => {
    const e = failure('time_s,azimuth_deg,range_m\n0,10,2\n1,10,120\n');
    expect(e.code).toBe('E_INPUT_UNITS');
    expect(e.message).toMatch(/degrees/);
  });

  it('refuses radians in the azimuth column', () => {
    const e = failure('time_s,azimuth_deg,range_m\n0,0.2,2\n10,3.4,2\n20,6.0,2\n');
    expect(e.code).toBe('E_INPUT_UNITS');
    expect(e.message).toMatch(/radians/);
  });

  it('refuses speeds no positioner makes (0.5 m in 1 ms: times given in seconds that were milliseconds)', () => {
    const e = failure('time_s,x_m,y_m\n0,0,2\n0.001,0.5,2\n');
    expect(e.code).toBe('E_INPUT_UNITS');
    expect(e.message).toMatch(/500\.00 m\/s/);
  });

  it('accepts a narrow sector in degrees near boresight', () => {
    expect(parseCommandedCsv('time_s,azimuth_deg,range_m\n0,1.5,3\n1,2.5,3\n2,3.5,3\n').points).toHaveLength(3);
  });

  it('names a missing column and a bad number', () => {
    expect(failure('time_s,x_m\n0,1\n1,2\n').code).toBe('E_INPUT_COLUMNS');
    expect(failure('time_s,x_m,y_m\n0,1,2\n1,abc,2\n').message).toMatch(/line 3: column 'x_m' is 'abc'/);
    expect(failure('').code).toBe('E_INPUT_EMPTY');
  });

  it('splits a target_id column into one path per target (same times in both are fine)', () => {
    const t = parseCommandedTargets('time_s,target_id,x_m,y_m\n0,1,0,2\n0,2,1,3\n1,1,0.1,2\n1,2,1.1,3\n');
    expect(t.map((x) => x.target)).toEqual(['1', '2']);
    expect(t[1].path.points.map((p) => p.x)).toEqual([1, 1.1]);
    expect(() => parseCommandedTargets('time_s,target_id,x_m,y_m\n0,1,0,2\n0,2,1,3\n')).toThrow(/target 1 has 1 point/);
  });
});
