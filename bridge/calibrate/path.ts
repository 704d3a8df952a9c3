/**
 * Timed paths for calibration and tuning: the commanded path (positioner frame) or a truth /
 * tracks file, read from CSV with columns time_s,x_m,y_m (others ignored) and an optional id
 * column (target_id or track_id) to pick one object out of several; linear interpolation.
 */
import { readFile } from 'node:fs/promises';
import { parse } from 'csv-parse/sync';
import { EchotrailError } from '../errors.ts';

export interface TimedPoint {
  timeS: number;
  x: number;
  y: number;
}

export interface PathCsvOptions {
  /** Keep only rows whose target_id / track_id equals this (default: the only id, else an error). */
  id?: number;
}

/** Parses path CSV text; rows must be in non-decreasing time (equal times keep the last). */
export function parsePathCsv(text: string, what: string, options: PathCsvOptions = {}): TimedPoint[] {
  const rows = parse(text, { relax_column_count: true, skip_empty_lines: true, trim: true, bom: true }) as string[][];
  if (rows.length < 2) throw new EchotrailError('E_INPUT_EMPTY', `${what} has no data rows (header time_s,x_m,y_m expected)`);
  const header = rows[0].map((h) => h.toLowerCase());
  const col = (n: string) => header.indexOf(n);
  const [ct, cx, cy] = [col('time_s'), col('x_m'), col('y_m')];
  if (ct < 0 || cx < 0 || cy < 0) throw new EchotrailError('E_INPUT_COLUMNS', `${what}: needs columns time_s,x_m,y_m (found ${rows[0].join(',')})`);
  const cid = col('target_id') >= 0 ? col('target_id') : col('track_id');
  let want = options.id;
  if (want === undefined && cid >= 0) {
    const ids = new Set(rows.slice(1).map((r) => Number(r[cid])));
    if (ids.size > 1) throw new EchotrailError('E_OPTION', `${what} holds ${ids.size} ids (${[...ids].slice(0, 8).join(', ')}); say which one to use`);
    want = [...ids][0];
  }
  const out: TimedPoint[] = [];
  for (let i = 1; i < rows.length; i++) {
    const r = rows[i];
    if (cid >= 0 && Number(r[cid]) !== want) continue;
    const p = { timeS: Number(r[ct]), x: Number(r[cx]), y: Number(r[cy]) };
    if (![p.timeS, p.x, p.y].every(Number.isFinite) || r[ct] === '' || r[cx] === '' || r[cy] === '') {
      throw new EchotrailError('E_INPUT_ROW', `${what} line ${i + 1}: time_s, x_m and y_m must be numbers`);
    }
    const last = out[out.length - 1];
    if (last && p.timeS < last.timeS) throw new EchotrailError('E_INPUT_ROW', `${what} line ${i + 1}: time goes backwards (${p.timeS} after ${last.timeS})`);
    if (last && p.timeS === last.timeS) out[out.length - 1] = p;
    else out.push(p);
  }
  if (out.length < 2) throw new EchotrailError('E_INPUT_EMPTY', `${what}: fewer than two points${want !== undefined ? ` for id ${want}` : ''}`);
  return out;
}

export async function readPathCsv(path: string, options?: PathCsvOptions): Promise<TimedPoint[]> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    throw new EchotrailError('E_PATH', `cannot read ${path}: ${(err as Error).message}`, { cause: err });
  }
  return parsePathCsv(text, path, options);
}

/**
 * Position on the path at time t by linear interpolation; null outside its time span. `hint` is
 * a segment index to start the search from (pass the previous result's for sorted queries).
 */
export function samplePath(path: TimedPoint[], t: number, hint = 0): { x: number; y: number; segment: number } | null {
  if (t < path[0].timeS || t > path[path.length - 1].timeS) return null;
  let i = Math.min(Math.max(0, hint), path.length - 2);
  while (i > 0 && path[i].timeS > t) i--;
  while (i < path.length - 2 && path[i + 1].timeS < t) i++;
  const a = path[i];
  const b = path[i + 1];
  const f = b.timeS > a.timeS ? (t - a.timeS) / (b.timeS - a.timeS) : 0;
  return { x: a.x + f * (b.x - a.x), y: a.y + f * (b.y - a.y), segment: i };
}

/**
 * Groups the rows of a tracks CSV (time_s,track_id,x_m,y_m) by track id, time order kept. When
 * the file also has the measurement columns meas_x_m,meas_y_m (as `echotrail track` writes them),
 * those are used by default: they carry independent errors and no filter lag, which is what a
 * frame fit and its standard errors assume. Coasts (no measurement) are then left out.
 */
export function parseTracksById(text: string, what: string, use: 'measurement' | 'estimate' = 'measurement'): Map<number, TimedPoint[]> {
  const rows = parse(text, { relax_column_count: true, skip_empty_lines: true, trim: true, bom: true }) as string[][];
  const header = (rows[0] ?? []).map((h) => h.toLowerCase());
  const [ct, ci, cx0, cy0, mx, my] = ['time_s', 'track_id', 'x_m', 'y_m', 'meas_x_m', 'meas_y_m'].map((n) => header.indexOf(n));
  if (ct < 0 || ci < 0 || cx0 < 0 || cy0 < 0) throw new EchotrailError('E_INPUT_COLUMNS', `${what}: needs columns time_s,track_id,x_m,y_m (the output of echotrail track)`);
  const measured = use === 'measurement' && mx >= 0 && my >= 0;
  const [cx, cy] = measured ? [mx, my] : [cx0, cy0];
  const out = new Map<number, TimedPoint[]>();
  for (let i = 1; i < rows.length; i++) {
    const r = rows[i];
    if (!r[cx] || !r[cy]) continue; // a coast has no measurement
    const p = { timeS: Number(r[ct]), x: Number(r[cx]), y: Number(r[cy]) };
    const id = Number(r[ci]);
    if (![p.timeS, p.x, p.y, id].every(Number.isFinite)) continue; // a damaged row loses one point only
    const list = out.get(id) ?? [];
    list.push(p);
    out.set(id, list);
  }
  if (out.size === 0) throw new EchotrailError('E_INPUT_EMPTY', `${what} holds no track rows`);
  return out;
}
