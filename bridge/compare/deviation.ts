/**
 * Error of one tracked sample against the commanded path at the same instant (optionally shifted
 * by a lag). The error vector e = p_track − p_cmd(t − L) is split in the commanded direction of
 * travel u: along = e·u (ahead positive), cross = u × e (left positive). Using the commanded point
 * at that time, not the nearest point of the path, keeps the split right on paths that cross
 * themselves and makes a late track show as a negative along-track error.
 */
import { cross, wrapAngle, headingOf } from './geometry.ts';
import { sampleAt, type TimedPath } from './timed-path.ts';

/** A tracked state to compare. */
export interface TrackedState {
  timeS: number;
  x: number;
  y: number;
  /** Velocity, m/s; absent for a position-only estimate. */
  vx?: number;
  vy?: number;
}

/** Errors of one sample. */
export interface Deviation {
  timeS: number;
  /** Commanded position compared with, metres. */
  cmdX: number;
  cmdY: number;
  /** Commanded path segment index at (t − lag). */
  segment: number;
  /** Euclidean position error, metres. */
  positionM: number;
  /** Ahead of the commanded point is positive, metres. */
  alongM: number;
  /** Left of the commanded direction is positive, metres. */
  crossM: number;
  /** Track speed − commanded speed, m/s (null without a velocity). */
  speedMps: number | null;
  /** Track heading − commanded heading, radians in (−π, π] (null when either is not moving). */
  headingRad: number | null;
}

/** Below this commanded or tracked speed a heading means nothing, m/s (common practice: ~noise/T). */
export const MIN_HEADING_SPEED_MPS = 0.02;

/** Deviation of one tracked state from the commanded path at t − lagS. */
export function deviationAt(path: TimedPath, s: TrackedState, lagS = 0): Deviation {
  const c = sampleAt(path, s.timeS - lagS);
  const ex = s.x - c.x;
  const ey = s.y - c.y;
  const cmdSpeed = Math.hypot(c.vx, c.vy);
  let speedMps: number | null = null;
  let headingRad: number | null = null;
  if (s.vx !== undefined && s.vy !== undefined) {
    const speed = Math.hypot(s.vx, s.vy);
    speedMps = speed - cmdSpeed;
    if (speed > MIN_HEADING_SPEED_MPS && cmdSpeed > MIN_HEADING_SPEED_MPS) {
      headingRad = wrapAngle(headingOf(s.vx, s.vy) - headingOf(c.vx, c.vy));
    }
  }
  return {
    timeS: s.timeS,
    cmdX: c.x,
    cmdY: c.y,
    segment: c.segment,
    positionM: Math.hypot(ex, ey),
    alongM: ex * c.ux + ey * c.uy,
    crossM: cross(c.ux, c.uy, ex, ey),
    speedMps,
    headingRad,
  };
}

/** Deviations of a series of tracked states. */
export function deviations(path: TimedPath, states: readonly TrackedState[], lagS = 0): Deviation[] {
  return states.map((s) => deviationAt(path, s, lagS));
}
