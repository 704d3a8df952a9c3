/**
 * How much of the run the radar held the target: the fraction of the commanded time span during
 * which the followed track was confirmed (or coasting). An update counts for the time until the
 * next one, up to a gap limit; beyond it the track is taken as lost until it updates again.
 */
import { median } from 'simple-statistics';
import type { TrackRow } from './track-rows.ts';

/** Coverage of a run. */
export interface Coverage {
  /** Fraction of the commanded span with a confirmed followed track, 0..1. */
  confirmedFraction: number;
  /** Fraction with the followed track coasting (predicted without a detection), 0..1. */
  coastingFraction: number;
  /** Gap limit used, seconds. */
  gapLimitS: number;
}

/**
 * Coverage of followed rows (time order) over [startS, endS]. Default gap limit: 1.5× the median
 * update interval: a gap longer than that counts as uncovered beyond the limit, so a single missed
 * scan costs half an interval of coverage, and a lost track costs all of its absence.
 */
export function coverageOf(rows: readonly TrackRow[], startS: number, endS: number, gapLimitS?: number): Coverage {
  const span = endS - startS;
  const gaps: number[] = [];
  for (let i = 1; i < rows.length; i++) if (rows[i].timeS > rows[i - 1].timeS) gaps.push(rows[i].timeS - rows[i - 1].timeS);
  const limit = gapLimitS ?? (gaps.length ? 1.5 * median(gaps) : 0);
  let confirmed = 0;
  let coasting = 0;
  for (let i = 0; i < rows.length; i++) {
    const from = Math.max(startS, rows[i].timeS);
    const next = i + 1 < rows.length ? rows[i + 1].timeS : rows[i].timeS + limit;
    const to = Math.min(endS, rows[i].timeS + Math.min(limit, next - rows[i].timeS));
    if (to <= from) continue;
    if (rows[i].status === 'coasting') coasting += to - from;
    else if (rows[i].status === 'confirmed') confirmed += to - from;
  }
  return span > 0 ? { confirmedFraction: confirmed / span, coastingFraction: coasting / span, gapLimitS: limit } : { confirmedFraction: 0, coastingFraction: 0, gapLimitS: limit };
}
