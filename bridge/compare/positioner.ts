/**
 * Commanded path from positioner records (live stream or a recorded session). The positioner
 * repeats its commanded position while it holds, so identical consecutive records collapse, and a
 * record repeating a time (a resend) is dropped rather than refused: these are machine-made.
 */
import type { PositionerSample } from '../types.ts';
import { makeTimedPath, type PathPoint, type TimedPath } from './timed-path.ts';
import { checkPositions, checkSpeeds, resolveUnitCheckOptions, type UnitCheckOptions } from './units.ts';

/** Points of the commanded path from positioner samples, in time order; resends dropped. */
export function positionerPoints(samples: readonly PositionerSample[]): PathPoint[] {
  const sorted = [...samples].sort((a, b) => a.timeS - b.timeS);
  const out: PathPoint[] = [];
  for (const s of sorted) {
    const last = out[out.length - 1];
    if (last && s.timeS === last.timeS) continue;
    const prev = out[out.length - 2];
    // Three equal positions in a row: the middle one adds nothing to a piecewise-linear path.
    if (last && prev && last.x === s.cmdX && last.y === s.cmdY && prev.x === s.cmdX && prev.y === s.cmdY) {
      last.timeS = s.timeS;
      continue;
    }
    out.push({ timeS: s.timeS, x: s.cmdX, y: s.cmdY });
  }
  return out;
}

/** A validated commanded path from positioner samples. */
export function positionerToPath(samples: readonly PositionerSample[], what = 'positioner records', units: Partial<UnitCheckOptions> = {}): TimedPath {
  const points = positionerPoints(samples);
  const opts = resolveUnitCheckOptions(units);
  checkPositions(points, what, opts);
  const path = makeTimedPath(points, what);
  checkSpeeds(points, what, opts);
  return path;
}
