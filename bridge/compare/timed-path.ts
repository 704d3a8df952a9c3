/**
 * A time-parameterised path: positions at strictly increasing times, linear in between. This is
 * what the positioner is told to follow, whatever it was read from (CSV, waypoints, records).
 */
import { EchotrailError } from '../errors.ts';
import { cumulativeLength, type Point } from './geometry.ts';

/** One commanded point. */
export interface PathPoint extends Point {
  /** Seconds from the start of the run. */
  timeS: number;
  /** Where it came from (file line), for error messages. */
  line?: number;
}

/** A validated path with its arc length precomputed. */
export interface TimedPath {
  /** Points in strictly increasing time. */
  points: PathPoint[];
  /** Arc length at each point, metres. */
  cumulativeM: number[];
  /** Optional leg label per point (from a `segment` column or waypoint legs); leg i runs from point i. */
  legs?: number[];
}

/** The commanded state at one instant. */
export interface PathSample extends Point {
  /** Index i of the segment [i, i+1] holding the instant (clamped at the ends). */
  segment: number;
  /** Commanded velocity, m/s (the segment's constant velocity). */
  vx: number;
  vy: number;
  /** Unit direction of travel; that of the nearest moving segment while the path dwells. */
  ux: number;
  uy: number;
  /** Arc length of the commanded point, metres. */
  alongM: number;
  /** False when the instant lies outside the path's time span (the sample is clamped). */
  inside: boolean;
}

/** Build a path, refusing what cannot be compared: under two points, unsorted or repeated times. */
export function makeTimedPath(points: PathPoint[], what = 'commanded path', legs?: number[]): TimedPath {
  if (points.length < 2) {
    throw new EchotrailError('E_PATH', `${what} has ${points.length} point(s); at least two with different times are needed to define motion`);
  }
  for (let i = 0; i < points.length; i++) {
    const p = points[i];
    if (!Number.isFinite(p.timeS) || !Number.isFinite(p.x) || !Number.isFinite(p.y)) {
      throw new EchotrailError('E_INPUT_ROW', `${what}${where(p)}: time and position must be finite numbers`);
    }
    if (i > 0 && p.timeS === points[i - 1].timeS) {
      throw new EchotrailError('E_INPUT_ROW', `${what}${where(p)}: duplicate time ${p.timeS} s (also${where(points[i - 1]) || ' on the previous row'}); remove one of the rows`);
    }
    if (i > 0 && p.timeS < points[i - 1].timeS) {
      throw new EchotrailError('E_INPUT_ROW', `${what}${where(p)}: time ${p.timeS} s goes back from ${points[i - 1].timeS} s; rows must be in time order`);
    }
  }
  return { points, cumulativeM: cumulativeLength(points), legs };
}

function where(p: PathPoint): string {
  return p.line !== undefined ? ` line ${p.line}` : '';
}

/** Index i with t in [t_i, t_{i+1}), clamped to [0, n−2]. Binary search: O(log n) per call. */
export function segmentAt(path: TimedPath, timeS: number): number {
  const pts = path.points;
  let lo = 0;
  let hi = pts.length - 1;
  if (timeS <= pts[0].timeS) return 0;
  if (timeS >= pts[hi].timeS) return hi - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (pts[mid].timeS <= timeS) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** Commanded position, velocity and direction at a time (linear interpolation; clamped outside). */
export function sampleAt(path: TimedPath, timeS: number): PathSample {
  const pts = path.points;
  const i = segmentAt(path, timeS);
  const a = pts[i];
  const b = pts[i + 1];
  const dt = b.timeS - a.timeS;
  const inside = timeS >= pts[0].timeS && timeS <= pts[pts.length - 1].timeS;
  const f = Math.min(1, Math.max(0, (timeS - a.timeS) / dt));
  const vx = (b.x - a.x) / dt;
  const vy = (b.y - a.y) / dt;
  const [ux, uy] = directionNear(path, i);
  return {
    x: a.x + f * (b.x - a.x),
    y: a.y + f * (b.y - a.y),
    segment: i,
    vx,
    vy,
    ux,
    uy,
    alongM: path.cumulativeM[i] + f * (path.cumulativeM[i + 1] - path.cumulativeM[i]),
    inside,
  };
}

/**
 * Direction of segment i, or of the closest segment that moves when i is a dwell. Searching
 * backwards first keeps the frame of the leg just finished during a hold, which is what an
 * operator reading "ahead"/"left" at a stop expects.
 */
function directionNear(path: TimedPath, i: number): [number, number] {
  const pts = path.points;
  const n = pts.length - 1;
  for (let k = 0; k < n; k++) {
    for (const j of [i - k, i + k]) {
      if (j < 0 || j >= n) continue;
      const dx = pts[j + 1].x - pts[j].x;
      const dy = pts[j + 1].y - pts[j].y;
      const len = Math.hypot(dx, dy);
      if (len > 1e-9) return [dx / len, dy / len];
    }
  }
  return [0, 1];
}

/** Time span of a path, seconds. */
export function timeSpan(path: TimedPath): { startS: number; endS: number } {
  return { startS: path.points[0].timeS, endS: path.points[path.points.length - 1].timeS };
}
