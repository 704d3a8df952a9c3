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

/**
 * Half-width of the error band drawn around the commanded path: twice the running position RMSE
 * (about 95 % of the errors for a Gaussian error, common practice), rounded to the centimetre so
 * the band is not rebuilt for every new figure; none before there is a figure.
 */
export function errorBandHalfWidthM(rmseM: number | null): number {
  if (rmseM === null || !Number.isFinite(rmseM) || rmseM <= 0) return 0;
  return Math.max(0.01, Math.round(2 * rmseM * 100) / 100);
}
