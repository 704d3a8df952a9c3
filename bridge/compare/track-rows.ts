/**
 * Tracked paths: the rows of a tracks CSV written by `echotrail track`, or TrackUpdates from the
 * live pipeline, reduced to what the comparison needs.
 */
import { EchotrailError } from '../errors.ts';
import type { TrackStatus, TrackUpdate } from '../types.ts';
import { findColumn, numberCell, optionalNumberCell, parseCsvTable, readInputFile, requireColumn } from './csv-table.ts';
import { headingOf } from './geometry.ts';
import { resolveUnitCheckOptions, type UnitCheckOptions } from './units.ts';

/** One track update as the comparison sees it. */
export interface TrackRow {
  timeS: number;
  id: number;
  status: TrackStatus;
  x: number;
  y: number;
  vx: number;
  vy: number;
  speed: number;
  /** Radians clockwise from +y. */
  headingRad: number;
  /** The measurement used by this update with its covariance (m, m²); absent on coasts. */
  meas?: { x: number; y: number; sxx: number; sxy: number; syy: number };
  /** False for a track of a reflector that never moved (live updates say so; CSV rows do not). */
  moving?: boolean;
  line?: number;
}

/** A TrackUpdate from the live tracker as a TrackRow. */
export function rowFromUpdate(u: TrackUpdate): TrackRow {
  const m = u.measurement;
  return {
    timeS: u.timeS,
    id: u.id,
    status: u.status,
    x: u.x,
    y: u.y,
    vx: u.vx,
    vy: u.vy,
    speed: u.speed,
    headingRad: u.headingRad,
    meas: m ? { x: m.x, y: m.y, sxx: m.rxx, sxy: m.rxy, syy: m.ryy } : undefined,
    moving: u.moving,
  };
}

const STATUSES: readonly TrackStatus[] = ['tentative', 'confirmed', 'coasting'];

/** Parse a tracks CSV. A missing status column means every row is confirmed (the writer's default). */
export function parseTracksCsv(text: string, what = 'tracks CSV', units: Partial<UnitCheckOptions> = {}): TrackRow[] {
  const t = parseCsvTable(text, what);
  const hint = 'expected the columns written by `echotrail track`';
  const c = {
    time: requireColumn(t, 'time_s', hint),
    id: requireColumn(t, 'track_id', hint),
    x: requireColumn(t, 'x_m', hint),
    y: requireColumn(t, 'y_m', hint),
    vx: requireColumn(t, 'vx_mps', hint),
    vy: requireColumn(t, 'vy_mps', hint),
    speed: findColumn(t, 'speed_mps'),
    heading: findColumn(t, 'heading_deg'),
    status: findColumn(t, 'status'),
    mx: findColumn(t, 'meas_x_m'),
    my: findColumn(t, 'meas_y_m'),
    sxx: findColumn(t, 'meas_sxx'),
    sxy: findColumn(t, 'meas_sxy'),
    syy: findColumn(t, 'meas_syy'),
  };
  const { maxRangeM } = resolveUnitCheckOptions(units);
  const rows: TrackRow[] = [];
  let lastTime = -Infinity;
  for (const row of t.rows) {
    const timeS = numberCell(t, row, c.time);
    if (timeS < lastTime) throw new EchotrailError('E_INPUT_ROW', `${what} line ${row.line}: time ${timeS} s goes back from ${lastTime} s; rows must be in time order`);
    lastTime = timeS;
    const id = numberCell(t, row, c.id);
    const x = numberCell(t, row, c.x);
    const y = numberCell(t, row, c.y);
    if (Math.hypot(x, y) > maxRangeM) {
      throw new EchotrailError('E_INPUT_UNITS', `${what} line ${row.line}: track position (${x}, ${y}) is beyond ${maxRangeM} m from the radar; the file looks like it is in millimetres — give metres`);
    }
    const vx = numberCell(t, row, c.vx);
    const vy = numberCell(t, row, c.vy);
    const statusRaw = c.status >= 0 ? (row.cells[c.status] ?? '').toLowerCase() : 'confirmed';
    if (!STATUSES.includes(statusRaw as TrackStatus)) {
      throw new EchotrailError('E_INPUT_ROW', `${what} line ${row.line}: status '${statusRaw}' is not one of ${STATUSES.join(', ')}`);
    }
    const mx = optionalNumberCell(t, row, c.mx);
    const my = optionalNumberCell(t, row, c.my);
    const sxx = optionalNumberCell(t, row, c.sxx);
    const sxy = optionalNumberCell(t, row, c.sxy);
    const syy = optionalNumberCell(t, row, c.syy);
    const heading = c.heading >= 0 ? optionalNumberCell(t, row, c.heading) : undefined;
    rows.push({
      timeS,
      id,
      status: statusRaw as TrackStatus,
      x,
      y,
      vx,
      vy,
      speed: (c.speed >= 0 ? optionalNumberCell(t, row, c.speed) : undefined) ?? Math.hypot(vx, vy),
      headingRad: heading !== undefined ? (heading * Math.PI) / 180 : headingOf(vx, vy),
      meas: mx !== undefined && my !== undefined && sxx !== undefined && syy !== undefined ? { x: mx, y: my, sxx, sxy: sxy ?? 0, syy } : undefined,
      line: row.line,
    });
  }
  return rows;
}

/** Read a tracks CSV file. */
export async function readTracksCsv(file: string, units: Partial<UnitCheckOptions> = {}): Promise<TrackRow[]> {
  return parseTracksCsv(await readInputFile(file, 'tracks'), `tracks ${file}`, units);
}
