/**
 * Position error of a track against the commanded path, sample by sample: the commanded point is
 * interpolated at each track time. The bridge's comparison messages are the authority for
 * summary figures (lag-corrected); this is the quick per-point view for the selected-track chart.
 */
import type { PathPointWire } from '../../../bridge/server/protocol.ts';
import type { HistoryRing } from './ring.ts';

/** Commanded position at time t by linear interpolation; null outside the path's time span. */
export function commandedAt(path: readonly PathPointWire[], t: number): { x: number; y: number } | null {
  const n = path.length;
  if (n === 0 || t < path[0].timeS || t > path[n - 1].timeS) return null;
  let lo = 0, hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (path[mid].timeS <= t) lo = mid; else hi = mid;
  }
  const a = path[lo], b = path[hi];
  const span = b.timeS - a.timeS;
  const f = span > 0 ? (t - a.timeS) / span : 0;
  return { x: a.x + (b.x - a.x) * f, y: a.y + (b.y - a.y) * f };
}

/** Error (metres) of every held point from `fromS` on; points outside the path's time span are skipped. */
export function errorSeries(h: HistoryRing, path: readonly PathPointWire[], fromS = -Infinity): { t: number[]; v: number[] } {
  const out = { t: [] as number[], v: [] as number[] };
  if (path.length < 2) return out;
  for (let s = Math.max(h.firstSeq, h.seqAtOrAfter(fromS)); s < h.pushed; s++) {
    const i = s % h.capacity;
    const c = commandedAt(path, h.timeS[i]);
    if (!c) continue;
    out.t.push(h.timeS[i]);
    out.v.push(Math.hypot(h.x[i] - c.x, h.y[i] - c.y));
  }
  return out;
}
