/** Which stretch of the commanded path the plan shows (pure, for tests). */
import type { PathPointWire } from '../../../bridge/server/protocol.ts';

/** Seconds of commanded path shown ahead of the current time. */
export const PATH_AHEAD_S = 5;

/** The points of a time-ordered path within [from, to], plus one on each side so the line reaches the edges. */
export function pathWindow(path: readonly PathPointWire[], from: number, to: number): PathPointWire[] {
  let a = 0;
  while (a < path.length && path[a].timeS < from) a++;
  let b = a;
  while (b < path.length && path[b].timeS <= to) b++;
  return path.slice(Math.max(0, a - 1), Math.min(path.length, b + 1));
}
