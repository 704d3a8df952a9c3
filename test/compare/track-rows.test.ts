// Tracks CSV reader: column layout of `echotrail track` (the project's issue 5 and
// docs/conventions.md); degrees at the edge, radians inside.
import { describe, expect, it } from 'vitest';
import { parseTracksCsv } from '../../bridge/compare/track-rows.ts';

const HEAD = 'time_s,track_id,x_m,y_m,vx_mps,vy_mps,speed_mps,heading_deg,status,quality,range_m,azimuth_deg,meas_x_m,meas_y_m,meas_sxx,meas_sxy,meas_syy,nis';

describe('parseTracksCsv', () => {
  it('reads updates and coasts (empty measurement columns)', () => {
    const rows = parseTracksCsv(`${HEAD}\n0.5,3,1,2,0.1,0,0.1,90,confirmed,0.8,2.236,26.6,1.01,1.99,0.001,0,0.002,0.7\n0.75,3,1.03,2,0.1,0,0.1,90,coasting,0.7,2.25,27,,,,,,\n`);
    expect(rows).toHaveLength(2);
    expect(rows[0].headingRad).toBeCloseTo(Math.PI / 2, 12);
    expect(rows[0].meas).toEqual({ x: 1.01, y: 1.99, sxx: 0.001, sxy: 0, syy: 0.002 });
    expect(rows[1].meas).toBeUndefined();
    expect(rows[1].status).toBe('coasting');
  });

  it('accepts the minimal columns of docs/conventions.md (status defaults to confirmed)', () => {
    const rows = parseTracksCsv('time_s,track_id,x_m,y_m,vx_mps,vy_mps,speed_mps,heading_deg\n0,1,0,2,0,0.2,0.2,0\n');
    expect(rows[0].status).toBe('confirmed');
  });

  it('refuses millimetres, unknown status and rows out of time order', () => {
    expect(() => parseTracksCsv(`${HEAD}\n0,1,1500,2000,0,0,0,0,confirmed,1,,,,,,,,\n`)).toThrow(/millimetres/);
    expect(() => parseTracksCsv(`${HEAD}\n0,1,1,2,0,0,0,0,lost,1,,,,,,,,\n`)).toThrow(/status 'lost'/);
    expect(() => parseTracksCsv(`${HEAD}\n1,1,1,2,0,0,0,0,confirmed,1,,,,,,,,\n0,1,1,2,0,0,0,0,confirmed,1,,,,,,,,\n`)).toThrow(/line 3: time 0 s goes back/);
  });
});
