/** Rows of the track list and their ordering, kept apart from the component so it can be tested. */
import { type DashboardState, type TrackEntry, polarOf } from './state.ts';

export interface TrackRow {
  id: number;
  status: TrackEntry['latest']['status'];
  rangeM: number;
  azimuthRad: number;
  speed: number;
  headingRad: number;
  /** Seconds since the track was first seen. */
  ageS: number;
  quality: number;
  moving: boolean;
}

export type SortKey = 'id' | 'rangeM' | 'azimuthRad' | 'speed' | 'headingRad' | 'ageS' | 'quality';
export interface SortOrder { key: SortKey; descending: boolean }

export function trackRows(state: DashboardState): TrackRow[] {
  const rows: TrackRow[] = [];
  for (const t of state.tracks.values()) {
    const w = t.latest;
    const p = polarOf(w.x, w.y);
    rows.push({
      id: t.id, status: w.status, rangeM: p.rangeM, azimuthRad: p.azimuthRad, speed: w.speed,
      headingRad: w.headingRad, ageS: trackAge(state.timeS, t.firstSeenS), quality: w.quality, moving: w.moving,
    });
  }
  return rows;
}

/**
 * Seconds since the track was first seen, never more than the run time itself (time since the
 * session start): a first-seen time from before a seek or a restart cannot make it larger.
 */
export function trackAge(nowS: number, firstSeenS: number): number {
  return Math.min(Math.max(0, nowS), Math.max(0, nowS - firstSeenS));
}

/** Sorts a copy; ties fall back to id so the order never flickers between frames. */
export function sortRows(rows: readonly TrackRow[], order: SortOrder): TrackRow[] {
  const sign = order.descending ? -1 : 1;
  return [...rows].sort((a, b) => {
    const d = (a[order.key] - b[order.key]) * sign;
    return d !== 0 && !Number.isNaN(d) ? d : a.id - b.id;
  });
}

/** Clicking a column: same key flips direction, a new key starts ascending (descending for quality). */
export function nextOrder(current: SortOrder, key: SortKey): SortOrder {
  if (current.key === key) return { key, descending: !current.descending };
  return { key, descending: key === 'quality' || key === 'speed' };
}
