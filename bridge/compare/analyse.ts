/**
 * One comparison of a recorded run: picks the followed track, estimates the lag, computes the
 * deviations of the tracker's own estimate (filtered) and of the smoothed one, with and without
 * the lag, per leg and for the whole run, plus coverage and the multi-target set metrics.
 */
import { EchotrailError } from '../errors.ts';
import { coverageOf, type Coverage } from './coverage.ts';
import { deviations, type Deviation } from './deviation.ts';
import { resolveFollowOptions, TrackFollower, type FollowOptions, type FollowSwitch } from './follow.ts';
import { estimateLag, resolveLagOptions, type LagEstimate, type LagOptions } from './lag.ts';
import { lagInterval, type LagInterval } from './lag-interval.ts';
import { findLegs, resolveLegOptions, type Leg, type LegOptions } from './legs.ts';
import { resolveMultiOptions, setMetricSeries, summariseSetSeries, type MultiOptions, type SetSample, type SetSummary } from './multi.ts';
import { resolveSmootherOptions, smoothTrack, type SmoothedState, type SmootherOptions } from './smoother.ts';
import { summarise, type DeviationSummary } from './stats.ts';
import { sampleAt, timeSpan, type TimedPath } from './timed-path.ts';
import type { TrackRow } from './track-rows.ts';

/** Everything tunable, grouped by the module that uses it. */
export interface AnalyseOptions {
  follow: Partial<FollowOptions>;
  lag: Partial<LagOptions>;
  legs: Partial<LegOptions>;
  smoother: Partial<SmootherOptions>;
  multi: Partial<MultiOptions>;
  /** Least overlap of the track and commanded time spans, as a fraction of the shorter span. */
  minOverlap: number;
}

/** The settings as used: every module's defaults filled in. */
export interface ResolvedAnalyseOptions {
  follow: FollowOptions;
  lag: LagOptions;
  legs: LegOptions;
  smoother: SmootherOptions;
  multi: Partial<MultiOptions>;
  minOverlap: number;
}

/** Defaults in one place (each module's own resolver). The lag's outlier distance defaults to the follow gate. */
export function resolveAnalyseOptions(o: Partial<AnalyseOptions> = {}): ResolvedAnalyseOptions {
  const follow = resolveFollowOptions(o.follow);
  return {
    follow,
    lag: resolveLagOptions({ inlierM: follow.gateM, ...o.lag }),
    legs: resolveLegOptions(o.legs),
    smoother: resolveSmootherOptions(o.smoother),
    multi: o.multi ?? {},
    minOverlap: o.minOverlap ?? 0.5,
  };
}

/** Deviations with and without the lag. */
export interface DeviationPair {
  noLag: Deviation[];
  aligned: Deviation[];
}

/** Summaries with and without the lag. */
export interface SummaryPair {
  noLag: DeviationSummary;
  aligned: DeviationSummary;
}

/** The whole result. */
export interface Analysis {
  commanded: TimedPath;
  legs: Leg[];
  /** Rows of the followed track(s), time order. */
  followed: TrackRow[];
  switches: FollowSwitch[];
  /** The followed track strayed beyond the release distance (diverged) at these times. */
  releases: TrackFollower['releases'];
  /**
   * The lag behind the command: found on the smoothed track when there is one, else on the
   * filtered track. The live filter trails on every turn and speed change, so its own lag adds
   * filter lag to the positioner's (on simulated runs with no positioner lag the filtered track's
   * lag came out 0.00–0.14 s, the smoothed one's within ±0.05 s of zero); the smoothed track,
   * looking both ways in time, has none.
   */
  lag: LagEstimate;
  /** Which estimate `lag` was found on. */
  lagSource: 'smoothed' | 'filtered';
  /** Bootstrap confidence interval of `lag` (lag-interval.ts); null with too few samples or no lag. */
  lagInterval: LagInterval | null;
  /** The lag of the filtered (live) track: `lag` plus the filter's own lag. */
  filteredLag: LagEstimate;
  coverage: Coverage;
  filtered: DeviationPair;
  /** Smoothed states, aligned with `followed` from index smoothedOffset; null without measurement columns. */
  smoothed: { offset: number; states: SmoothedState[]; deviations: DeviationPair } | null;
  whole: { filtered: SummaryPair; smoothed: SummaryPair | null };
  perLeg: { leg: Leg; filtered: SummaryPair; smoothed: SummaryPair | null }[];
  sets: SetSample[];
  setSummary: SetSummary;
  /** Settings the set metrics were computed with (cut-off, order, grid). */
  setOptions: MultiOptions;
  /** Every other setting as used. */
  settings: ResolvedAnalyseOptions;
  trackIds: number[];
}

/** Refuse time spans that do not overlap enough to compare (wrong file, or ms against s). */
export function checkOverlap(path: TimedPath, rows: readonly TrackRow[], minOverlap: number): void {
  const c = timeSpan(path);
  const t0 = rows[0].timeS;
  const t1 = rows[rows.length - 1].timeS;
  const overlap = Math.min(c.endS, t1) - Math.max(c.startS, t0);
  const shorter = Math.min(c.endS - c.startS, t1 - t0);
  const longer = Math.max(c.endS - c.startS, t1 - t0);
  // Two tests: most of the shorter span must be shared, and at least a tenth of the longer one
  // (a span 1000× the other is a unit mix-up even though it contains it).
  if (overlap <= 0 || (shorter > 0 && overlap / shorter < minOverlap) || overlap / longer < 0.1) {
    const ratio = (t1 - t0) / (c.endS - c.startS);
    const hint = ratio > 300 && ratio < 3000 ? ' — the tracks look like milliseconds' : ratio < 1 / 300 && ratio > 1 / 3000 ? ' — the commanded times look like milliseconds' : '';
    throw new EchotrailError(
      'E_PATH',
      `time ranges do not match: commanded path ${c.startS}…${c.endS} s, tracks ${t0}…${t1} s` +
        ` (overlap ${Math.max(0, overlap).toFixed(2)} s)${hint}; both must be seconds from the start of the same run`,
    );
  }
}

/**
 * The rows of the track that follows `path`. With `others` (the other targets of a run of several
 * carriages), a track another path's follower holds is left to it, so a neighbour's track passing
 * close never counts against this path (the live comparison does the same, live.ts).
 */
function follow(path: TimedPath, rows: readonly TrackRow[], lagS: number, o: Partial<FollowOptions>, others: readonly TimedPath[] = []): { rows: TrackRow[]; switches: FollowSwitch[]; releases: TrackFollower['releases'] } {
  const f = new TrackFollower(o);
  const rivals = others.map((p) => ({ path: p, follower: new TrackFollower(o) }));
  const out: TrackRow[] = [];
  for (const r of rows) {
    for (const x of rivals) {
      const rc = sampleAt(x.path, r.timeS - lagS);
      if (rc.inside) x.follower.offer(r, rc.x, rc.y);
    }
    const c = sampleAt(path, r.timeS - lagS);
    // Outside the commanded span there is nothing to compare with (the path would be clamped).
    if (!c.inside) continue;
    if (f.currentId !== r.id && rivals.some((x) => x.follower.currentId === r.id)) continue;
    if (f.offer(r, c.x, c.y)) out.push(r);
  }
  return { rows: out, switches: [...f.switches], releases: [...f.releases] };
}

/**
 * The track that follows `path` and its lag: followed without a lag, the lag estimated on those
 * rows, followed again at that lag (a late track sits a lag's distance behind the commanded
 * point), and the lag estimated again on the RTS-smoothed track, which has no filter lag, when
 * the rows carry measurements. Null when no track comes near the path.
 */
function followWithLag(path: TimedPath, rows: readonly TrackRow[], others: readonly TimedPath[], o: AnalyseOptions) {
  let chosen = follow(path, rows, 0, o.follow, others);
  if (chosen.rows.length < 2) return null;
  const filteredLag = estimateLag(path, chosen.rows, o.lag);
  if (filteredLag.lagS) chosen = follow(path, rows, filteredLag.lagS, o.follow, others);
  const sm = smoothTrack(chosen.rows, o.smoother);
  const smoothedLag = sm ? estimateLag(path, sm.smoothed, o.lag) : null;
  const lagSource: 'smoothed' | 'filtered' = smoothedLag?.lagS != null ? 'smoothed' : 'filtered';
  const lag = lagSource === 'smoothed' ? smoothedLag! : filteredLag;
  return { chosen, filteredLag, sm, lagSource, lag };
}

function pair(path: TimedPath, states: readonly { timeS: number; x: number; y: number; vx: number; vy: number }[], lagS: number): DeviationPair {
  return { noLag: deviations(path, states, 0), aligned: deviations(path, states, lagS) };
}

function summaryPair(p: DeviationPair, keep: (d: Deviation, i: number) => boolean = () => true): SummaryPair {
  return { noLag: summarise(p.noLag.filter(keep)), aligned: summarise(p.aligned.filter(keep)) };
}

/** Compare tracks with the commanded paths (the first is the one the single-target figures use). */
export function analyse(paths: readonly TimedPath[], rows: readonly TrackRow[], options: Partial<AnalyseOptions> = {}): Analysis {
  const o = resolveAnalyseOptions(options);
  const path = paths[0];
  if (!path) throw new EchotrailError('E_PATH', 'no commanded path given');
  if (rows.length === 0) throw new EchotrailError('E_INPUT_EMPTY', 'no track rows to compare');
  checkOverlap(path, rows, o.minOverlap);
  const found = followWithLag(path, rows, paths.slice(1), o);
  if (!found) {
    throw new EchotrailError('E_PATH', `no confirmed track came within ${o.follow.gateM} m of the commanded path; check the frame (calibration) or widen the follow gate`);
  }
  const { chosen, filteredLag, sm, lagSource, lag } = found;
  const followed = chosen.rows;
  const lagS = lag.lagS ?? 0;
  const interval = lag.lagS === null ? null : lagInterval(path, lagSource === 'smoothed' ? sm!.smoothed : followed, lag.lagS, o.lag);
  const filtered = pair(path, followed, lagS);
  const smoothed = sm ? { offset: sm.offset, states: sm.smoothed, deviations: pair(path, sm.smoothed, lagS) } : null;
  const { legs, legOfSegment } = findLegs(path, o.legs);
  const span = timeSpan(path);
  const perLeg = legs.map((leg) => ({
    leg,
    filtered: summaryPair(filtered, (d) => legOfSegment[d.segment] === leg.index),
    smoothed: smoothed ? summaryPair(smoothed.deviations, (d) => legOfSegment[d.segment] === leg.index) : null,
  }));
  // Each target at its own lag, so the set figures do not depend on which one is detailed.
  const lagOf = (i: number) => followWithLag(paths[i], rows, paths.filter((_, j) => j !== i), o)?.lag.lagS ?? 0;
  const lagsS = o.multi.lagS !== undefined ? undefined : paths.map((_, i) => (i === 0 ? lagS : lagOf(i)));
  const setOptions = resolveMultiOptions({ ...o.multi, lagS: o.multi.lagS ?? lagS, ...(lagsS ? { lagsS } : {}) });
  const sets = setMetricSeries(paths, rows, setOptions);
  return {
    commanded: path,
    legs,
    followed,
    switches: chosen.switches,
    releases: chosen.releases,
    lag,
    lagSource,
    lagInterval: interval,
    filteredLag,
    coverage: coverageOf(followed, span.startS, span.endS),
    filtered,
    smoothed,
    whole: { filtered: summaryPair(filtered), smoothed: smoothed ? summaryPair(smoothed.deviations) : null },
    perLeg,
    sets,
    setSummary: summariseSetSeries(sets),
    setOptions,
    settings: o,
    trackIds: [...new Set(rows.map((r) => r.id))].sort((a, b) => a - b),
  };
}
