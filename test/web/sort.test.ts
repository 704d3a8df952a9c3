import { describe, expect, it } from 'vitest';
import { nextOrder, sortRows, trackAge, trackRows, type TrackRow } from '../../web/src/stream/sort.ts';
import { applyMessage } from '../../web/src/stream/reduce.ts';
import { createState } from '../../web/src/stream/state.ts';

const row = (id: number, rangeM: number, quality: number): TrackRow => ({
  id, status: 'confirmed', rangeM, azimuthRad: 0, speed: 0, headingRad: 0, ageS: 0, quality, moving: true,
});

describe('track list rows', () => {
  it('derives range, azimuth and age from the state', () => {
    const s = createState();
    const w = { timeS: 1, id: 7, status: 'confirmed' as const, x: 3, y: -3, vx: 0, vy: 0, speed: 0, headingRad: 0,
      pxx: 0, pxy: 0, pyy: 0, quality: 1, moving: false, hits: 1, misses: 0 };
    applyMessage(s, { type: 'scan', timeS: 1, detections: [], updates: [w], deletions: [], antennaAzimuthRad: null, positioner: [] });
    applyMessage(s, { type: 'scan', timeS: 4, detections: [], updates: [], deletions: [], antennaAzimuthRad: null, positioner: [] });
    const [r] = trackRows(s);
    expect(r.rangeM).toBeCloseTo(Math.hypot(3, 3));
    expect((r.azimuthRad * 180) / Math.PI).toBeCloseTo(135);
    expect(r.ageS).toBe(3);
  });

  it('sorts by a column in either direction with id as the tie-break', () => {
    const rows = [row(3, 2, 0.5), row(1, 5, 0.5), row(2, 2, 0.9)];
    expect(sortRows(rows, { key: 'rangeM', descending: false }).map((r) => r.id)).toEqual([2, 3, 1]);
    expect(sortRows(rows, { key: 'rangeM', descending: true }).map((r) => r.id)).toEqual([1, 2, 3]);
    expect(sortRows(rows, { key: 'quality', descending: true }).map((r) => r.id)).toEqual([2, 1, 3]);
    expect(rows.map((r) => r.id)).toEqual([3, 1, 2]); // input untouched
  });

  it('flips direction on the same column and starts fresh on a new one', () => {
    expect(nextOrder({ key: 'id', descending: false }, 'id')).toEqual({ key: 'id', descending: true });
    expect(nextOrder({ key: 'id', descending: true }, 'rangeM')).toEqual({ key: 'rangeM', descending: false });
    expect(nextOrder({ key: 'id', descending: false }, 'quality')).toEqual({ key: 'quality', descending: true });
  });
});

describe('trackAge', () => {
  it('is the time since first seen, never negative and never more than the run time', () => {
    expect(trackAge(15.7, 10)).toBeCloseTo(5.7, 9);
    expect(trackAge(10, 12)).toBe(0);
    expect(trackAge(10.2, -40)).toBe(10.2);
  });
});
