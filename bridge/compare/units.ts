/**
 * Plausibility checks that catch inputs in the wrong units before they produce nonsense figures.
 * The bench spans a few metres and a positioner moves at walking pace at most, so millimetres,
 * degrees or milliseconds in the wrong column stand out by orders of magnitude.
 */
import { EchotrailError } from '../errors.ts';
import type { PathPoint } from './timed-path.ts';

/** Limits of what the bench can produce. */
export interface UnitCheckOptions {
  /** Largest believable distance from the radar, metres (a short-range bench spans a few metres). */
  maxRangeM: number;
  /** Largest believable positioner speed, m/s (bench positioners: well under 2 m/s; common practice). */
  maxSpeedMps: number;
}

/** Defaults, in one place. */
export function resolveUnitCheckOptions(o: Partial<UnitCheckOptions> = {}): UnitCheckOptions {
  return { maxRangeM: o.maxRangeM ?? 50, maxSpeedMps: o.maxSpeedMps ?? 5 };
}

/** Refuse positions too far away to be on the bench, saying which unit they probably are in. */
export function checkPositions(points: readonly PathPoint[], what: string, opts: UnitCheckOptions): void {
  let worst: PathPoint | undefined;
  let worstR = 0;
  for (const p of points) {
    const r = Math.hypot(p.x, p.y);
    if (r > worstR) {
      worstR = r;
      worst = p;
    }
  }
  if (worst && worstR > opts.maxRangeM) {
    const guess = worstR > 360 ? 'millimetres' : 'degrees or centimetres';
    throw new EchotrailError(
      'E_INPUT_UNITS',
      `${what}${worst.line !== undefined ? ` line ${worst.line}` : ''}: position (${worst.x}, ${worst.y}) is ${worstR.toFixed(1)} m from the radar, beyond the ${opts.maxRangeM} m a bench run can span; ` +
        `the values look like ${guess} — give metres (x_m, y_m / range_m)`,
    );
  }
}

/** Refuse a path whose implied speed no positioner makes (often: times in ms read as s is the reverse). */
export function checkSpeeds(points: readonly PathPoint[], what: string, opts: UnitCheckOptions): void {
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1];
    const b = points[i];
    const v = Math.hypot(b.x - a.x, b.y - a.y) / (b.timeS - a.timeS);
    if (v > opts.maxSpeedMps) {
      throw new EchotrailError(
        'E_INPUT_UNITS',
        `${what}${b.line !== undefined ? ` line ${b.line}` : ''}: moving ${v.toFixed(2)} m/s between t=${a.timeS} s and t=${b.timeS} s, faster than the ${opts.maxSpeedMps} m/s a positioner makes; ` +
          `check that positions are in metres and times in seconds (not milliseconds or millimetres)`,
      );
    }
  }
}

/**
 * Azimuth given in radians in a degree column: every value within [0, 2π] although the target
 * sweeps a wide arc is the telltale. Plausible paths (a narrow sector in degrees) pass; the check
 * only fires when radians are the much likelier reading.
 */
export function checkAzimuthDegrees(values: readonly number[], what: string): void {
  if (values.length < 3) return;
  const max = Math.max(...values.map(Math.abs));
  const min = Math.min(...values);
  // A sweep of more than 3 (172° if radians) that never leaves 0…2π: a degree path would have to
  // cross half of a 6° sector at boresight's right. Narrower sweeps are plausible in degrees and pass.
  if (max <= 2 * Math.PI + 1e-9 && max - min > 3 && values.some((v) => v !== Math.round(v))) {
    throw new EchotrailError(
      'E_INPUT_UNITS',
      `${what}: azimuth_deg values all lie within 0…${max.toFixed(3)}, which looks like radians; give degrees (clockwise from +y)`,
    );
  }
  if (max > 360) {
    throw new EchotrailError('E_INPUT_UNITS', `${what}: azimuth_deg reaches ${max}, beyond 360; give degrees in [0, 360)`);
  }
}
