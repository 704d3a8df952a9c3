import { describe, expect, it } from 'vitest';
import { TRACKS_CSV_COLUMNS, TRACKS_CSV_HEADER, trackCsvLine } from '../../bridge/tracking/tracks-csv.ts';
import type { TrackUpdate } from '../../bridge/types.ts';

const base: TrackUpdate = {
  timeS: 12.5, id: 7, status: 'confirmed', x: 3, y: -4, vx: -0.3, vy: 0, speed: 0.3, headingRad: (3 * Math.PI) / 2,
  pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.8, moving: true, hits: 5, misses: 0,
};

describe('tracks CSV', () => {
  it('has the columns of the conventions plus the measurement columns', () => {
    expect(TRACKS_CSV_HEADER.startsWith('time_s,track_id,x_m,y_m,vx_mps,vy_mps,speed_mps,heading_deg,')).toBe(true);
    expect(TRACKS_CSV_COLUMNS).toContain('meas_sxy');
    expect(TRACKS_CSV_COLUMNS.at(-1)).toBe('nis');
  });

  it('writes degrees at the edge, polar position clockwise from +y, empty measurement on a coast', () => {
    const c = trackCsvLine(base).split(',');
    expect(c).toHaveLength(TRACKS_CSV_COLUMNS.length);
    expect(Number(c[7])).toBeCloseTo(270, 6); // heading: −x is 270° clockwise from +y
    expect(Number(c[10])).toBeCloseTo(5, 6); // range of (3, −4)
    // azimuth of (3, −4): atan2(3, −4) = 143.13°, clockwise from +y (common practice: x = r·sin az).
    expect(Number(c[11])).toBeCloseTo((Math.atan2(3, -4) * 180) / Math.PI, 3);
    expect(c.slice(12)).toEqual(['', '', '', '', '', '']);
    const m = trackCsvLine({ ...base, measurement: { timeS: 12.5, x: 3.01, y: -4.02, rxx: 0.0025, rxy: -0.0001, ryy: 0.004 }, nis: 1.234 }).split(',');
    expect(m.slice(12).map(Number)).toEqual([3.01, -4.02, 0.0025, -0.0001, 0.004, 1.234]);
  });
});
