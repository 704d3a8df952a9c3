// Linear interpolation of a time-parameterised path; cases worked by hand (common practice).
import { describe, expect, it } from 'vitest';
import { hasCode } from '../../bridge/errors.ts';
import { makeTimedPath, sampleAt, segmentAt } from '../../bridge/compare/timed-path.ts';

const path = makeTimedPath([
  { timeS: 0, x: 0, y: 1 },
  { timeS: 2, x: 1, y: 1 }, // 0.5 m/s east
  { timeS: 4, x: 1, y: 1 }, // hold
  { timeS: 5, x: 1, y: 2 }, // 1 m/s north
]);

describe('sampleAt', () => {
  it('interpolates position and gives the segment velocity', () => {
    const s = sampleAt(path, 1);
    expect(s.x).toBeCloseTo(0.5, 12);
    expect(s.y).toBeCloseTo(1, 12);
    expect(s.vx).toBeCloseTo(0.5, 12);
    expect(s.alongM).toBeCloseTo(0.5, 12);
    expect(s.inside).toBe(true);
  });
  it('keeps the direction of the leg just finished during a hold', () => {
    const s = sampleAt(path, 3);
    expect(s.vx).toBe(0);
    expect([s.ux, s.uy]).toEqual([1, 0]);
  });
  it('clamps outside the time span and says so', () => {
    const s = sampleAt(path, 9);
    expect([s.x, s.y, s.inside]).toEqual([1, 2, false]);
    expect(segmentAt(path, -1)).toBe(0);
  });
});

describe('makeTimedPath refuses', () => {
  const code = (f: () => unknown) => {
    try {
      f();
    } catch (e) {
      return hasCode(e, 'E_PATH') ? 'E_PATH' : hasCode(e, 'E_INPUT_ROW') ? 'E_INPUT_ROW' : String(e);
    }
    return 'no error';
  };
  it('a single point', () => {
    expect(code(() => makeTimedPath([{ timeS: 0, x: 0, y: 1 }]))).toBe('E_PATH');
  });
  it('duplicate times, naming the line', () => {
    expect(() => makeTimedPath([{ timeS: 0, x: 0, y: 1, line: 2 }, { timeS: 0, x: 1, y: 1, line: 3 }])).toThrow(/line 3: duplicate time 0 s/);
  });
  it('times going back', () => {
    expect(code(() => makeTimedPath([{ timeS: 1, x: 0, y: 1 }, { timeS: 0, x: 1, y: 1 }]))).toBe('E_INPUT_ROW');
  });
});
