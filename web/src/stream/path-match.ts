/**
 * Which commanded path a track is measured against, when a run commands several (one per
 * positioner or carriage). The bridge's comparison says which track follows each path; a track
 * it names is measured against that path. Any other track is measured against the path it has
 * stayed nearest to over its recent points, if that path is close enough to be the one it
 * follows; otherwise there is no figure, and the reason is given instead of a distance to some
 * other carriage's path (the reviewer's "3.029 m against the first carriage's path").
 */
import { DEFAULT_PATH_ID, POSITIONER_PATH_ID, type PathPointWire } from '../../../bridge/server/protocol.ts';
import type { HistoryRing } from './ring.ts';
import type { DashboardState } from './state.ts';
import { commandedAt } from './path-error.ts';

/** A track further than this on average from every path follows none of them, metres (the bridge's follow gate). */
export const MATCH_GATE_M = 1.0;
/** Recent points judged. */
const RECENT_POINTS = 12;


export interface PathMatch {
  /** The path's target ('' for a run's one unnamed path), or null when none matches. */
  target: string | null;
  path: readonly PathPointWire[] | null;
  /** 'followed': the bridge's comparison follows this track on it; 'nearest': judged here. */
  how: 'followed' | 'nearest' | null;
  /** Why there is no path, when there is none. */
  reason: string | null;
}

/** How a path is named on screen: "commanded path" when it is the only one, else "path 2", "positioner path". */
export function pathLabel(target: string, count: number): string {
  if (count <= 1 || target === '' || target === DEFAULT_PATH_ID) return 'commanded path';
  if (target === POSITIONER_PATH_ID) return 'positioner path';
  return `path ${target}`;
}

export function matchPath(state: Pick<DashboardState, 'commandedPaths' | 'comparisons'>, trackId: number, h: HistoryRing): PathMatch {
  const paths = state.commandedPaths.filter((p) => p.path.length > 1);
  if (paths.length === 0) return { target: null, path: null, how: null, reason: 'no commanded path' };
  for (const [pathId, f] of state.comparisons) {
    if (f.trackId !== trackId) continue;
    // The dashboard holds a run's one path unnamed (''), while the bridge's figures name it
    // 'commanded' or 'positioner': the same path, so the followed track is measured on it.
    const unnamed = pathId === '' || pathId === DEFAULT_PATH_ID || pathId === POSITIONER_PATH_ID;
    const p = paths.find((q) => q.target === pathId) ?? (paths.length === 1 && unnamed ? paths[0] : undefined);
    if (p) return { target: p.target, path: p.path, how: 'followed', reason: null };
  }
  let best: { p: (typeof paths)[number]; d: number } | null = null;
  let inSpan = false;
  for (const p of paths) {
    let sum = 0, n = 0;
    for (let s = Math.max(h.firstSeq, h.pushed - RECENT_POINTS); s < h.pushed; s++) {
      const i = s % h.capacity;
      const c = commandedAt(p.path, h.timeS[i]);
      if (!c) continue;
      sum += Math.hypot(h.x[i] - c.x, h.y[i] - c.y);
      n++;
    }
    if (n === 0) continue;
    inSpan = true;
    const d = sum / n;
    if (!best || d < best.d) best = { p, d };
  }
  if (!inSpan) return { target: null, path: null, how: null, reason: 'outside the commanded time span' };
  if (!best || best.d > MATCH_GATE_M) return { target: null, path: null, how: null, reason: `not within ${MATCH_GATE_M} m of any commanded path` };
  return { target: best.p.target, path: best.p.path, how: 'nearest', reason: null };
}
