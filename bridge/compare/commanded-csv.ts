/**
 * Commanded path from CSV: `time_s,x_m,y_m`, or `time_s,azimuth_deg,range_m` (converted with
 * x = r·sin(az), y = r·cos(az)). An optional `segment` column labels legs for per-leg figures.
 */
import { readFile } from 'node:fs/promises';
import { EchotrailError } from '../errors.ts';
import { findColumn, numberCell, parseCsvTable, requireColumn } from './csv-table.ts';
import { makeTimedPath, type PathPoint, type TimedPath } from './timed-path.ts';
import { checkAzimuthDegrees, checkPositions, checkSpeeds, resolveUnitCheckOptions, type UnitCheckOptions } from './units.ts';

/** Parse commanded-path CSV text. */
export function parseCommandedCsv(text: string, what = 'commanded path CSV', units: Partial<UnitCheckOptions> = {}): TimedPath {
  const t = parseCsvTable(text, what);
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

/** Read a commanded-path CSV file. */
export async function readCommandedCsv(file: string, units: Partial<UnitCheckOptions> = {}): Promise<TimedPath> {
  return parseCommandedCsv(await readFile(file, 'utf8'), `commanded path ${file}`, units);
}
