/**
 * The commanded path of a run whose positioner reports as it goes (`pos` records) grows on the
 * bridge with every sample, but the dashboard used to hold only the copy in its last snapshot:
 * the selected-track figure then said "outside the commanded time span" while the bridge's
 * comparison, on the grown path, showed an RMSE for the same track. Scans carry the positioner
 * samples, so the dashboard grows its copy the same way and both figures use one path and one
 * time base (the run's clock). A path given whole (`commanded` messages) is never extended.
 */
import type { PositionerWire } from '../../../bridge/server/protocol.ts';
import type { DashboardState } from './state.ts';

/** Samples closer in time than this are not kept, seconds (the bridge's state keeps ≥ 50 ms too). */
export const POSITIONER_MIN_DT_S = 0.05;
/** Most points kept; the oldest are dropped beyond it (20 minutes at the minimum spacing). */
export const POSITIONER_MAX_POINTS = 24_000;

/**
 * Appends the scan's positioner samples to the paths built from them, one per positioner (by
 * `target`; '' for unnamed samples), unless the run gave its paths whole. Returns true when a
 * path changed.
 */
export function extendPositionerPath(state: DashboardState, samples: readonly PositionerWire[]): boolean {
  if (state.commandedExplicit || samples.length === 0) return false;
  let changed = false;
  for (const s of samples) {
    const target = s.target ?? '';
    let entry = state.commandedPaths.find((p) => p.target === target);
    if (!entry) {
      entry = { target, path: [] };
      state.commandedPaths = [...state.commandedPaths, entry];
    }
    const path = entry.path;
    const last = path[path.length - 1];
    if (last && s.timeS < last.timeS + POSITIONER_MIN_DT_S) continue;
    path.push({ timeS: s.timeS, x: s.cmdX, y: s.cmdY });
    if (path.length > POSITIONER_MAX_POINTS) path.splice(0, path.length - POSITIONER_MAX_POINTS);
    changed = true;
  }
  return changed;
}
