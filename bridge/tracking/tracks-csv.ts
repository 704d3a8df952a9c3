/**
 * The tracks CSV written by `track` (columns fixed by docs/conventions.md plus the
 * measurement columns the RTS smoother of bridge/compare needs). Degrees at the edge; measurement
 * columns and nis are empty on a coast.
 */
import type { TrackUpdate } from '../types.ts';

export const TRACKS_CSV_COLUMNS = [
  'time_s', 'track_id', 'x_m', 'y_m', 'vx_mps', 'vy_mps', 'speed_mps', 'heading_deg',
  'status', 'quality', 'range_m', 'azimuth_deg', 'meas_x_m', 'meas_y_m', 'meas_sxx', 'meas_sxy', 'meas_syy', 'nis',
] as const;

export const TRACKS_CSV_HEADER = TRACKS_CSV_COLUMNS.join(',');

const RAD = 180 / Math.PI;

/** Compact fixed-point: 0.1 mm, 1 mm/s, 1e-9 m² resolution is far below the bench's noise. */
const f = (v: number, d: number) => (Number.isFinite(v) ? v.toFixed(d) : '');
const g = (v: number) => (Number.isFinite(v) ? Number(v.toPrecision(6)).toString() : '');

/**
 * One row. range_m and azimuth_deg are the track's estimated position in polar form (azimuth
 * clockwise from +y, [0, 360)).
 */
export function trackCsvLine(u: TrackUpdate): string {
  let az = Math.atan2(u.x, u.y) * RAD;
  if (az < 0) az += 360;
  const m = u.measurement;
  const meas = m ? `${f(m.x, 4)},${f(m.y, 4)},${g(m.rxx)},${g(m.rxy)},${g(m.ryy)},${u.nis !== undefined ? f(u.nis, 3) : ''}` : ',,,,,';
  return (
    `${f(u.timeS, 6)},${u.id},${f(u.x, 4)},${f(u.y, 4)},${f(u.vx, 4)},${f(u.vy, 4)},${f(u.speed, 4)},${f(u.headingRad * RAD, 2)},` +
    `${u.status},${f(u.quality, 3)},${f(Math.hypot(u.x, u.y), 4)},${f(az, 3)},${meas}`
  );
}
