/**
 * Piecewise-straight trajectories through waypoints, each leg a trapezoidal move (see motion.ts),
 * with a dwell at a waypoint on arrival. Used directly and by the back-and-forth rail.
 */
import { trapezoidMove, type Move } from './motion.ts';
import type { KinematicState, Trajectory } from './trajectories.ts';

/** One waypoint. */
export interface WaypointSpec {
  /** Position in the positioner frame, m. */
  x: number;
  y: number;
  /** Cruise speed of the leg that leaves this point, m/s (default: the trajectory's speed). */
  speedMps?: number;
  /** Time spent at rest at this point before leaving it, s (default 0). */
  dwellS?: number;
}

interface Leg {
  t0: number;
  dwellS: number;
  move: Move;
  x0: number;
  y0: number;
  ux: number;
  uy: number;
}

/**
 * Goes through the points in order; with `loop` it returns to the first and repeats, otherwise it
 * stays at the last point. Before t = 0 the target rests at the first point.
 */
export function waypointTrajectory(points: WaypointSpec[], speedMps: number, accelMps2: number, loop: boolean): Trajectory {
  if (points.length === 0) return () => ({ x: 0, y: 0, vx: 0, vy: 0 });
  const legs: Leg[] = [];
  let t = 0;
  const n = loop ? points.length : points.length - 1;
  for (let i = 0; i < n; i++) {
    const p = points[i];
    const q = points[(i + 1) % points.length];
    const len = Math.hypot(q.x - p.x, q.y - p.y);
    const move = trapezoidMove(len, p.speedMps ?? speedMps, accelMps2);
    const dwellS = p.dwellS ?? 0;
    legs.push({ t0: t, dwellS, move, x0: p.x, y0: p.y, ux: len > 0 ? (q.x - p.x) / len : 0, uy: len > 0 ? (q.y - p.y) / len : 0 });
    t += dwellS + move.durationS;
  }
  const cycle = t;
  const last = points[points.length - 1];
  const rest = (x: number, y: number): KinematicState => ({ x, y, vx: 0, vy: 0 });
  return (tS) => {
    if (tS <= 0 || legs.length === 0) return rest(points[0].x, points[0].y);
    let local = tS;
    if (loop) local = cycle > 0 ? tS % cycle : 0;
    else if (tS >= cycle) return rest(last.x, last.y);
    // Legs are few (a handful of waypoints): a linear scan is cheaper than keeping an index.
    for (let i = legs.length - 1; i >= 0; i--) {
      const leg = legs[i];
      if (local >= leg.t0) {
        const { s, v } = leg.move.at(local - leg.t0 - leg.dwellS);
        return { x: leg.x0 + leg.ux * s, y: leg.y0 + leg.uy * s, vx: leg.ux * v, vy: leg.uy * v };
      }
    }
    return rest(points[0].x, points[0].y);
  };
}
