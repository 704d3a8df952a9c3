/**
 * OSPA and GOSPA over a run. Tracks are updated at different instants (each when the antenna
 * passes it), so the sets are compared on a regular time grid: truths are the commanded positions
 * of every commanded path active at t; estimates are all confirmed or coasting tracks of moving
 * reflectors, each predicted from its latest update (x + v·Δt) if that update is recent enough.
 */
import type { Point } from './geometry.ts';
import { setDistance, type SetDistance, type SetMetricOptions } from './ospa.ts';
import { sampleAt, timeSpan, type TimedPath } from './timed-path.ts';
import type { TrackRow } from './track-rows.ts';

/** Settings of the time series. */
export interface MultiOptions extends SetMetricOptions {
  /** Grid step, seconds. */
  stepS: number;
  /** A track whose latest update is older than this is not in the estimate set, seconds. */
  maxAgeS: number;
  /** Commanded positions are taken at t − lagS (0: no alignment). */
  lagS: number;
  /** Per path, in the order of the paths, when each target has its own lag (overrides lagS). */
  lagsS?: number[];
}

/** Defaults in one place. */
export function resolveMultiOptions(o: Partial<MultiOptions> = {}): MultiOptions {
  return { cutoffM: o.cutoffM ?? 1, order: o.order ?? 2, stepS: o.stepS ?? 0.1, maxAgeS: o.maxAgeS ?? 1.5, lagS: o.lagS ?? 0, ...(o.lagsS ? { lagsS: o.lagsS } : {}) };
}

/** One instant of the series. */
export interface SetSample extends SetDistance {
  timeS: number;
  truths: number;
  estimates: number;
}

/** Means over the run. */
export interface SetSummary {
  samples: number;
  meanOspaM: number | null;
  meanGospaM: number | null;
  /** Means of the GOSPA parts (p-th powers). */
  meanLocalisation: number | null;
  meanMissed: number | null;
  meanFalse: number | null;
}

/** OSPA/GOSPA series over the union of the commanded paths' time spans. */
export function setMetricSeries(paths: readonly TimedPath[], rows: readonly TrackRow[], options: Partial<MultiOptions> = {}): SetSample[] {
  const o = resolveMultiOptions(options);
  if (paths.length === 0) return [];
  const spans = paths.map(timeSpan);
  const lag = paths.map((_, i) => o.lagsS?.[i] ?? o.lagS);
  const start = Math.min(...spans.map((s, i) => s.startS + lag[i]));
  const end = Math.max(...spans.map((s, i) => s.endS + lag[i]));
  const latest = new Map<number, TrackRow>();
  const out: SetSample[] = [];
  let r = 0;
  for (let k = 0; start + k * o.stepS <= end + 1e-9; k++) {
    const t = start + k * o.stepS;
    while (r < rows.length && rows[r].timeS <= t) {
      // Tentative tracks are not reported yet, and tracks of reflectors that never moved are
      // the bench's furniture, not estimates of a commanded target.
      if (rows[r].status !== 'tentative' && rows[r].moving !== false) latest.set(rows[r].id, rows[r]);
      else latest.delete(rows[r].id);
      r++;
    }
    const truths: Point[] = [];
    paths.forEach((p, i) => {
      const at = t - lag[i];
      if (at >= spans[i].startS && at <= spans[i].endS) truths.push(sampleAt(p, at));
    });
    const estimates: Point[] = [];
    for (const [id, u] of latest) {
      const age = t - u.timeS;
      if (age > o.maxAgeS) {
        latest.delete(id);
        continue;
      }
      estimates.push({ x: u.x + u.vx * age, y: u.y + u.vy * age });
    }
    out.push({ timeS: t, truths: truths.length, estimates: estimates.length, ...setDistance(truths, estimates, o) });
  }
  return out;
}

/** Means of a series. */
export function summariseSetSeries(series: readonly SetSample[]): SetSummary {
  const n = series.length;
  const avg = (f: (s: SetSample) => number) => (n ? series.reduce((a, s) => a + f(s), 0) / n : null);
  return {
    samples: n,
    meanOspaM: avg((s) => s.ospaM),
    meanGospaM: avg((s) => s.gospaM),
    meanLocalisation: avg((s) => s.localisation),
    meanMissed: avg((s) => s.missed),
    meanFalse: avg((s) => s.false),
  };
}
