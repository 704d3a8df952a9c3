/**
 * Commanded path from CSV: `time_s,x_m,y_m`, or `time_s,azimuth_deg,range_m` (converted with
 * x = r·sin(az), y = r·cos(az)). An optional `segment` column labels legs for per-leg figures; an
 * optional `target_id` column holds several targets' paths in one file (as `echotrail simulate
 * --commanded` writes them), each validated on its own.
 */
import { EchotrailError } from '../errors.ts';
import { findColumn, numberCell, parseCsvTable, readInputFile, requireColumn, type CsvTable } from './csv-table.ts';
import { makeTimedPath, type PathPoint, type TimedPath } from './timed-path.ts';
import { checkAzimuthDegrees, checkPositions, checkSpeeds, resolveUnitCheckOptions, type UnitCheckOptions } from './units.ts';

/** One target's commanded path. */
export interface CommandedTarget {
  /** The `target_id` cell, or '' when the file has no such column. */
  target: string;
  path: TimedPath;
}

/** Parse commanded-path CSV text: one path per target, in order of first appearance. */
export function parseCommandedTargets(text: string, what = 'commanded path CSV', units: Partial<UnitCheckOptions> = {}): CommandedTarget[] {
  const t = parseCsvTable(text, what);
  const cTarget = findColumn(t, 'target_id');
  const groups = new Map<string, CsvTable['rows']>();
  for (const row of t.rows) {
    const k = cTarget >= 0 ? (row.cells[cTarget] ?? '') : '';
    if (!groups.has(k)) groups.set(k, []);
    groups.get(k)!.push(row);
  }
  return [...groups].map(([target, rows]) => ({
    target,
    path: pathFromRows({ ...t, rows }, cTarget >= 0 ? `${what} target ${target}` : what, units),
  }));
}

/** Parse commanded-path CSV text holding one target (or take the first target of several). */
export function parseCommandedCsv(text: string, what = 'commanded path CSV', units: Partial<UnitCheckOptions> = {}): TimedPath {
  return parseCommandedTargets(text, what, units)[0].path;
}

function pathFromRows(t: CsvTable, what: string, units: Partial<UnitCheckOptions>): TimedPath {
  const cTime = requireColumn(t, 'time_s', 'the commanded path needs time_s plus x_m,y_m or azimuth_deg,range_m');
  const cx = findColumn(t, 'x_m');
  const cy = findColumn(t, 'y_m');
  const caz = findColumn(t, 'azimuth_deg');
  const cr = findColumn(t, 'range_m');
  const cSeg = findColumn(t, 'segment');
  const cartesian = cx >= 0 && cy >= 0;
  if (!cartesian && !(caz >= 0 && cr >= 0)) {
    throw new EchotrailError(
      'E_INPUT_COLUMNS',
      `${what}: needs columns x_m,y_m or azimuth_deg,range_m besides time_s (found: ${t.header.join(', ')})`,
    );
  }
  const points: PathPoint[] = [];
  const legs: number[] = [];
  const azimuths: number[] = [];
  const legIds = new Map<string, number>();
  for (const row of t.rows) {
    const timeS = numberCell(t, row, cTime);
    let x: number;
    let y: number;
    if (cartesian) {
      x = numberCell(t, row, cx);
      y = numberCell(t, row, cy);
    } else {
      const azDeg = numberCell(t, row, caz);
      const r = numberCell(t, row, cr);
      if (r < 0) throw new EchotrailError('E_INPUT_ROW', `${what} line ${row.line}: negative range_m ${r}`);
      azimuths.push(azDeg);
      const az = (azDeg * Math.PI) / 180;
      x = r * Math.sin(az);
      y = r * Math.cos(az);
    }
    points.push({ timeS, x, y, line: row.line });
    if (cSeg >= 0) {
      const label = row.cells[cSeg] ?? '';
      if (!legIds.has(label)) legIds.set(label, legIds.size);
      legs.push(legIds.get(label)!);
    }
  }
  if (!cartesian) checkAzimuthDegrees(azimuths, what);
  const opts = resolveUnitCheckOptions(units);
  checkPositions(points, what, opts);
  const path = makeTimedPath(points, what, cSeg >= 0 ? legs : undefined);
  checkSpeeds(points, what, opts);
  return path;
}

/** Read a commanded-path CSV file: every target in it. */
export async function readCommandedCsv(file: string, units: Partial<UnitCheckOptions> = {}): Promise<CommandedTarget[]> {
  return parseCommandedTargets(await readInputFile(file, 'commanded path'), `commanded path ${file}`, units);
}
