/**
 * Waypoints with speeds turned into a time-parameterised path.
 *
 * Format (JSON): { "start_s": 0, "waypoints": [ { "x_m": 1, "y_m": 2 },
 *   { "x_m": 2, "y_m": 2, "speed_mps": 0.3, "dwell_s": 1 }, ... ] }
 * or CSV with columns x_m,y_m,speed_mps,dwell_s (speed empty on the first row). `speed_mps` is the
 * constant speed of the leg that ends at the waypoint; `dwell_s` is a hold after arriving. The
 * first waypoint may carry a dwell too (the positioner holds before it starts). Legs move at
 * constant speed (accelerations are treated as instantaneous: at bench speeds they last a few
 * tens of milliseconds, below the radar's update interval).
 */
import { z } from 'zod';
import { EchotrailError } from '../errors.ts';
import { findColumn, numberCell, optionalNumberCell, parseCsvTable, readInputFile, requireColumn } from './csv-table.ts';
import { makeTimedPath, type PathPoint, type TimedPath } from './timed-path.ts';
import { checkPositions, resolveUnitCheckOptions, type UnitCheckOptions } from './units.ts';

/** One waypoint. */
export interface Waypoint {
  x: number;
  y: number;
  /** Speed of the leg arriving here, m/s (ignored on the first waypoint). */
  speedMps?: number;
  /** Hold after arriving, seconds. */
  dwellS?: number;
  line?: number;
}

const waypointJson = z.object({
  start_s: z.number().finite().optional(),
  waypoints: z.array(
    z.object({
      x_m: z.number().finite(),
      y_m: z.number().finite(),
      speed_mps: z.number().finite().optional(),
      dwell_s: z.number().finite().nonnegative().optional(),
    }),
  ),
});

/** Turn waypoints into a path; each leg (move or dwell) gets its own leg label. */
export function waypointsToPath(wps: readonly Waypoint[], startS = 0, what = 'waypoints', units: Partial<UnitCheckOptions> = {}): TimedPath {
  if (wps.length < 2) throw new EchotrailError('E_PATH', `${what}: ${wps.length} waypoint(s); at least two are needed for a path`);
  const opts = resolveUnitCheckOptions(units);
  const points: PathPoint[] = [{ timeS: startS, x: wps[0].x, y: wps[0].y, line: wps[0].line }];
  const legs: number[] = [];
  let t = startS;
  let leg = 0;
  const hold = (w: Waypoint) => {
    if (w.dwellS && w.dwellS > 0) {
      t += w.dwellS;
      legs.push(leg++);
      points.push({ timeS: t, x: w.x, y: w.y, line: w.line });
    }
  };
  hold(wps[0]);
  for (let i = 1; i < wps.length; i++) {
    const a = wps[i - 1];
    const b = wps[i];
    const v = b.speedMps;
    const where = `${what}${b.line !== undefined ? ` line ${b.line}` : ` waypoint ${i + 1}`}`;
    if (v === undefined || !(v > 0)) throw new EchotrailError('E_PATH', `${where}: speed_mps must be a positive speed in m/s`);
    if (v > opts.maxSpeedMps) {
      throw new EchotrailError('E_INPUT_UNITS', `${where}: speed ${v} m/s is beyond the ${opts.maxSpeedMps} m/s a positioner makes; give m/s (not mm/s)`);
    }
    const d = Math.hypot(b.x - a.x, b.y - a.y);
    if (d === 0) throw new EchotrailError('E_PATH', `${where}: same position as the previous waypoint; use dwell_s to hold`);
    t += d / v;
    legs.push(leg++);
    points.push({ timeS: t, x: b.x, y: b.y, line: b.line });
    hold(b);
  }
  legs.push(legs.length > 0 ? legs[legs.length - 1] : 0); // the last point closes the last leg
  checkPositions(points, what, opts);
  return makeTimedPath(points, what, legs);
}

/** Parse waypoints from JSON or CSV text (decided by the first non-blank character). */
export function parseWaypoints(text: string, what = 'waypoints', units: Partial<UnitCheckOptions> = {}): TimedPath {
  if (text.trimStart().startsWith('{')) {
    let raw: unknown;
    try {
      raw = JSON.parse(text);
    } catch (err) {
      throw new EchotrailError('E_INPUT_ROW', `${what}: not valid JSON: ${(err as Error).message}`, { cause: err });
    }
    const r = waypointJson.safeParse(raw);
    if (!r.success) {
      const issue = r.error.issues[0];
      throw new EchotrailError('E_INPUT_ROW', `${what}: ${issue.path.join('.') || 'document'}: ${issue.message}`);
    }
    const wps = r.data.waypoints.map((w) => ({ x: w.x_m, y: w.y_m, speedMps: w.speed_mps, dwellS: w.dwell_s }));
    return waypointsToPath(wps, r.data.start_s ?? 0, what, units);
  }
  const t = parseCsvTable(text, what);
  const cx = requireColumn(t, 'x_m');
  const cy = requireColumn(t, 'y_m');
  const cv = findColumn(t, 'speed_mps');
  const cd = findColumn(t, 'dwell_s');
  const wps = t.rows.map((row) => ({
    x: numberCell(t, row, cx),
    y: numberCell(t, row, cy),
    speedMps: optionalNumberCell(t, row, cv),
    dwellS: optionalNumberCell(t, row, cd),
    line: row.line,
  }));
  return waypointsToPath(wps, 0, what, units);
}

/** Read a waypoint file (JSON or CSV). */
export async function readWaypoints(file: string, units: Partial<UnitCheckOptions> = {}): Promise<TimedPath> {
  return parseWaypoints(await readInputFile(file, 'waypoints'), `waypoints ${file}`, units);
}
