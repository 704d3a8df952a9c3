/**
 * The stretch of a track's history the selected-track charts show: the last `windowS` seconds up
 * to the track's newest point (or the run time, when that is earlier). Ending the window at the
 * track's own newest point, not only at the dashboard's clock, keeps the charts filled after a
 * seek or a loop even if the clock were ever ahead of the history just reloaded.
 */
import type { HistoryRing } from './ring.ts';

export interface TrackSeries {
  t: number[];
  speed: number[];
  /** Degrees, [0, 360). */
  headingDeg: number[];
  /** Start of the window, seconds of run time. */
  fromS: number;
}

export function trackSeries(h: HistoryRing, nowS: number, windowS: number): TrackSeries {
  const newest = h.length > 0 ? h.timeS[(h.pushed - 1) % h.capacity] : nowS;
  const fromS = Math.min(nowS, newest) - windowS;
  const from = Math.max(h.firstSeq, h.seqAtOrAfter(fromS));
  const n = h.pushed - from;
  const t = new Array<number>(n), speed = new Array<number>(n), headingDeg = new Array<number>(n);
  for (let k = 0; k < n; k++) {
    const i = (from + k) % h.capacity;
    t[k] = h.timeS[i];
    speed[k] = h.speed[i];
    headingDeg[k] = (h.headingRad[i] * 180) / Math.PI;
  }
  return { t, speed, headingDeg, fromS };
}
