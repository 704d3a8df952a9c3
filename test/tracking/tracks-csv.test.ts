import { describe, expect, it } from 'vitest';
import { TRACKS_CSV_COLUMNS, TRACKS_CSV_HEADER, TracksCsvEncoder, trackCsvLine } from '../../bridge/tracking/tracks-csv.ts';
import { createRng } from '../../bridge/sim/prng.ts';
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

describe('TracksCsvEncoder', () => {
  // The definition the encoder must match byte for byte: toFixed for the fixed-point columns,
  // six significant digits in their shortest form for the covariance.
  const RAD = 180 / Math.PI;
  const f = (v: number, d: number) => (Number.isFinite(v) ? v.toFixed(d) : '');
  const g = (v: number) => (Number.isFinite(v) ? Number(v.toPrecision(6)).toString() : '');
  const reference = (u: TrackUpdate): string => {
    let az = Math.atan2(u.x, u.y) * RAD;
    if (az < 0) az += 360;
    const m = u.measurement;
    const meas = m ? `${f(m.x, 4)},${f(m.y, 4)},${g(m.rxx)},${g(m.rxy)},${g(m.ryy)},${u.nis !== undefined ? f(u.nis, 3) : ''}` : ',,,,,';
    return (
      `${f(u.timeS, 6)},${u.id},${f(u.x, 4)},${f(u.y, 4)},${f(u.vx, 4)},${f(u.vy, 4)},${f(u.speed, 4)},${f(u.headingRad * RAD, 2)},` +
      `${u.status},${f(u.quality, 3)},${f(Math.hypot(u.x, u.y), 4)},${f(az, 3)},${meas}`
    );
  };
  // Ties in decimal (0.125, 2.5e-5), values a hair off a tie (1.005 is 1.00499…), the sign of a
  // negative value rounding to zero, magnitudes beyond the fast path, non-finite values.
  const special = [0, -0, NaN, Infinity, -Infinity, 0.5, -0.5, 0.125, -0.125, 1.005, 2.675, 1e-7, 1.5e-7, -0.00001, 5e-324, 1e21, -1e21, 1e15, 123456.5,
    0.00015, 9.9999995, 99999.95, 999999.5, 1e300, -1e-300, 2.5e-5, 1.000005, 0.0000125, 9.999995e-7, 1e-6, 1e-5, 1e20, 1.5e20, 123456789.123456];
  const updates = (count: number, seed: number): TrackUpdate[] => {
    const rng = createRng(seed);
    const pick = (): number => {
      const r = rng.uniform();
      if (r < 0.15) return special[Math.floor(rng.uniform() * special.length)];
      if (r < 0.35) return (rng.uniform() - 0.5) * 10 ** Math.floor(rng.uniform() * 44 - 22);
      if (r < 0.55) return (Math.round((rng.uniform() - 0.5) * 2e6) + 0.5) / 10 ** Math.floor(rng.uniform() * 7); // decimal ties
      return (rng.uniform() - 0.5) * 100;
    };
    return Array.from({ length: count }, (_, i) => {
      const u: TrackUpdate = {
        ...base, timeS: Math.abs(pick()) * 1000, id: i % 50 ? i : pick(), status: i % 3 ? 'confirmed' : 'coasting',
        x: pick(), y: pick(), vx: pick(), vy: pick(), speed: pick(), headingRad: pick(), quality: pick(),
      };
      if (i % 5) u.measurement = { timeS: u.timeS, x: pick(), y: pick(), rxx: pick(), rxy: pick(), ryy: pick() };
      if (i % 7) u.nis = pick();
      return u;
    });
  };

  it('writes exactly the digits of toFixed and of six significant digits, fast path or not', () => {
    const wrong = updates(20000, 11).filter((u) => trackCsvLine(u) !== reference(u));
    expect(wrong.slice(0, 3).map((u) => [trackCsvLine(u), reference(u)])).toEqual([]);
  });

  it('hands over the header and the rows in pieces, growing for a row longer than its capacity', () => {
    const rows = updates(3000, 12);
    const enc = new TracksCsvEncoder(16);
    enc.header();
    const pieces: Buffer[] = [];
    for (const u of rows) {
      enc.add(u);
      if (enc.length >= 16) pieces.push(enc.take());
    }
    pieces.push(enc.take());
    expect(enc.length).toBe(0);
    expect(Buffer.concat(pieces).toString('utf8')).toBe([TRACKS_CSV_HEADER, ...rows.map(reference)].join('\n') + '\n');
  });
});
