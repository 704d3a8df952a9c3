/**
 * Running comparison for the live view and replays: fed the commanded path (or positioner samples
 * as they arrive) and every track update, it keeps the `ComparisonFigures` of protocol.ts current.
 *
 *   const live = new LiveComparison();
 *   live.setCommanded(points);          // or live.addPositioner(sample) as samples arrive
 *   for (const u of output.updates) live.update(u);
 *   send({ type: 'comparison', figures: live.figures() });
 *   live.reset();                        // new run / seek in a replay
 *
 * Cost per update: one binary search on the path plus O(1) sums; every `lagEvery` accepted samples
 * the lag is re-estimated over a bounded window (lag.ts), so the amortised cost stays small and
 * memory stays bounded however long the run: positioner samples extend the path, and its head is
 * dropped once no lookup can reach it (trimPath). rmseM, maxErrorM, alongTrackM and crossTrackM are
 * raw (track at t against command at t): what the operator sees; lagS is reported beside them.
 */
import type { ComparisonFigures } from '../server/protocol.ts';
import type { PositionerSample, TrackUpdate } from '../types.ts';
import { deviationAt } from './deviation.ts';
import { TrackFollower, type FollowOptions } from './follow.ts';
import { estimateLag, type LagOptions } from './lag.ts';
import { makeTimedPath, sampleAt, segmentAt, type PathPoint, type TimedPath } from './timed-path.ts';
import { rowFromUpdate } from './track-rows.ts';

/** Options of the live comparison. */
export interface LiveComparisonOptions {
  /** Which track is the followed one (follow.ts). */
  follow: Partial<FollowOptions>;
  /** Lag search settings (lag.ts); the live default search is ±1.5 s. */
  lag: Partial<LagOptions>;
  /** Accepted samples kept for the lag estimate (the latest ones; older ones drop off the front). */
  lagWindow: number;
  /** Re-estimate the lag after this many newly accepted samples. */
  lagEvery: number;
  /** Updates newer than the commanded path's end wait for it; at most this many are held. */
  maxPending: number;
  /**
   * Positioner points no longer needed (older than the lag window and the newest update, less the
   * largest lag) are dropped once this many have gathered, so the splice cost is amortised.
   */
  trimChunk: number;
  /**
   * Hard cap on the points kept while the followed track is lost for long (the lag window then
   * stops moving): the oldest window samples are dropped with the path under them.
   */
  maxPathPoints: number;
  /** Least run time between two points of the running-RMSE history, s. */
  historyStepS: number;
  /** Most points of that history; beyond it every other point is dropped and the step doubles. */
  maxHistoryPoints: number;
}

/** Defaults in one place: 240 samples ≈ a minute at 4 scans/s. */
export function resolveLiveComparisonOptions(o: Partial<LiveComparisonOptions> = {}): LiveComparisonOptions {
  return {
    follow: o.follow ?? {},
    lag: { maxLagS: 1.5, ...o.lag },
    lagWindow: o.lagWindow ?? 240,
    lagEvery: o.lagEvery ?? 20,
    maxPending: o.maxPending ?? 64,
    trimChunk: o.trimChunk ?? 512,
    // 20 minutes of a 20 Hz positioner.
    maxPathPoints: o.maxPathPoints ?? 24_000,
    historyStepS: o.historyStepS ?? 0.25,
    // As many as the dashboard keeps.
    maxHistoryPoints: o.maxHistoryPoints ?? 4000,
  };
}

/**
 * Extra history kept behind the horizon, seconds: an update held back by the tracker (sweep
 * deferral, confirmation) may arrive a little after positioner samples newer than it.
 */
const LATE_SLACK_S = 10;

/**
 * After a reset, a positioner sample at most this long after the kept path's end extends it; a
 * later one (a seek forward) starts a new path rather than bridge the gap with a straight line.
 */
const RESUME_GAP_S = 1;

export class LiveComparison {
  private readonly o: LiveComparisonOptions;
  private path: TimedPath | null = null;
  /** Commanded points from positioner samples, until there are two to make a path. */
  private raw: PathPoint[] = [];
  private follower: TrackFollower;
  private pending: TrackUpdate[] = [];
  private window: { timeS: number; x: number; y: number }[] = [];
  private sinceLag = 0;
  private n = 0;
  private sumSq = 0;
  private max = 0;
  private last: { timeS: number; along: number | null; cross: number | null } = { timeS: 0, along: null, cross: null };
  private lagS: number | null = null;
  /** True when the path is made of positioner samples (no whole path given): a reset then forgets it. */
  private fromPositioner = false;
  /** Time of the newest update compared, any track: later ones (time order) never look further back. */
  private newestS: number | null = null;
  /** A positioner-built path kept through a reset, until the next sample shows it still fits (reset). */
  private onProbation = false;
  /** The running RMSE over the run: flat [t, rmse, …], at least `historyStep` apart (see record()). */
  private rmseHistory: number[] = [];
  private historyStep = 0;

  /**
   * @param followedElsewhere true for a track another path's comparison follows (several
   *   carriages): this one does not take it, so a neighbour's track never sets its figures
   */
  constructor(options: Partial<LiveComparisonOptions> = {}, private readonly followedElsewhere: ((trackId: number) => boolean) | null = null) {
    this.o = resolveLiveComparisonOptions(options);
    this.follower = new TrackFollower(this.o.follow);
    this.historyStep = this.o.historyStepS;
  }

  /** Replace the commanded path (points in time order, validated); clears the figures, keeps waiting updates. */
  setCommanded(path: readonly PathPoint[] | TimedPath): void {
    // Updates that came before the path are kept and compared once it is here.
    const waiting = this.pending;
    this.reset();
    this.pending = waiting;
    const pts = 'points' in path ? path.points : path;
    // Own copies: positioner samples appended later extend this path in place.
    this.path = makeTimedPath(pts.map((p) => ({ ...p })), 'commanded path');
    this.raw = this.path.points;
    this.fromPositioner = false;
    this.flushPending();
  }

  /** Append one positioner record to the commanded path (resends and repeated holds are folded). */
  addPositioner(s: PositionerSample): void {
    if (this.onProbation) {
      this.onProbation = false;
      const first = this.raw[0];
      const end = this.endS();
      if (!first || s.timeS < first.timeS || s.timeS > end + RESUME_GAP_S) {
        this.path = null;
        this.raw = [];
        this.fromPositioner = false;
      }
    }
    const last = this.raw[this.raw.length - 1];
    if (last && s.timeS <= last.timeS) return;
    const prev = this.raw[this.raw.length - 2];
    if (last && prev && last.x === s.cmdX && last.y === s.cmdY && prev.x === s.cmdX && prev.y === s.cmdY) {
      last.timeS = s.timeS; // extend the hold: same point, later time; arc length unchanged
    } else {
      this.raw.push({ timeS: s.timeS, x: s.cmdX, y: s.cmdY });
      if (this.path) {
        const k = this.raw.length - 1;
        this.path.cumulativeM.push(this.path.cumulativeM[k - 1] + Math.hypot(s.cmdX - this.raw[k - 1].x, s.cmdY - this.raw[k - 1].y));
      }
    }
    if (!this.path && this.raw.length >= 2) {
      this.path = makeTimedPath(this.raw, 'positioner records');
      this.fromPositioner = true;
    }
    this.flushPending();
    this.trimPath();
  }

  /** The track these figures follow now (null: none). */
  get followedId(): number | null {
    return this.follower.currentId;
  }

  /** Points of the commanded path currently kept (bounded for positioner-fed runs). */
  get pathPoints(): number {
    return this.raw.length;
  }

  /** Feed one track update (any track, any status); the figures move when it is the followed one. */
  update(u: TrackUpdate): void {
    if (!this.path || this.lookupS(u) > this.endS()) {
      if (this.pending.length >= this.o.maxPending) this.pending.shift();
      this.pending.push(u);
      return;
    }
    this.consume(u);
  }

  /**
   * The running RMSE as it went, flat [t0, rmse0, t1, rmse1, …]: a client that joins late, or
   * comes back from a seek, draws its chart from it.
   */
  history(): number[] {
    return this.rmseHistory.slice();
  }

  /** The history's points after run time `afterS` (flat [t, rmse, …]). */
  historyAfter(afterS: number): number[] {
    const h = this.rmseHistory;
    let i = h.length;
    while (i >= 2 && h[i - 2] > afterS) i -= 2;
    return h.slice(i);
  }

  /** Keeps the running RMSE after a compared sample, thinned to the history's spacing and cap. */
  private record(timeS: number): void {
    const h = this.rmseHistory;
    if (h.length && timeS - h[h.length - 2] < this.historyStep) {
      h[h.length - 1] = Math.sqrt(this.sumSq / this.n);
      return;
    }
    h.push(timeS, Math.sqrt(this.sumSq / this.n));
    if (h.length / 2 > this.o.maxHistoryPoints) {
      // Coarser everywhere rather than forget the start of the run.
      this.rmseHistory = h.filter((_, i) => i % 4 < 2);
      this.historyStep *= 2;
    }
  }

  /** Current figures (cheap: nothing is recomputed here). */
  figures(): ComparisonFigures {
    return {
      timeS: this.last.timeS,
      samples: this.n,
      rmseM: this.n ? Math.sqrt(this.sumSq / this.n) : null,
      crossTrackM: this.last.cross,
      alongTrackM: this.last.along,
      maxErrorM: this.n ? this.max : null,
      lagS: this.lagS,
      trackId: this.follower.currentId,
    };
  }

  /**
   * Forget the figures, the followed track and pending updates; keep the commanded path.
   * A path built from positioner samples is kept too, on probation: a replay re-sends the
   * tracks of the window before the new position at once but positioner samples only as it
   * plays, so forgetting the path left a paused replay without figures after every seek. The
   * first sample after the reset decides (addPositioner): inside the kept span, or just after
   * it, the path goes on; before its (trimmed) head or past a gap, it is built again from there.
   */
  reset(): void {
    if (!this.path) this.raw = [];
    this.onProbation = this.fromPositioner;
    this.follower = new TrackFollower(this.o.follow);
    this.pending = [];
    this.window = [];
    this.sinceLag = 0;
    this.n = 0;
    this.sumSq = 0;
    this.max = 0;
    this.last = { timeS: 0, along: null, cross: null };
    this.lagS = null;
    this.newestS = null;
    this.rmseHistory = [];
    this.historyStep = this.o.historyStepS;
  }

  /**
   * Drop the head of a positioner-fed path that nothing can sample any more. Lookups happen at
   * t − lag with |lag| ≤ maxLagS for the window samples (lag search) and for new updates (time
   * order: not older than the newest one seen). Two points are kept before that horizon so the
   * segment holding it and the backward direction search of a dwell see what they saw before;
   * cumulativeM is sliced, not recomputed, so arc lengths stay absolute.
   */
  private trimPath(): void {
    const path = this.path;
    if (!path || this.raw.length < this.o.trimChunk + 3) return;
    const maxLag = this.o.lag.maxLagS ?? 2;
    const oldest = Math.min(this.window[0]?.timeS ?? Infinity, this.newestS ?? this.endS());
    let drop = Math.max(0, segmentAt(path, oldest - maxLag - LATE_SLACK_S) - 2);
    if (this.raw.length > this.o.maxPathPoints) {
      const forced = this.raw.length - this.o.maxPathPoints + this.o.trimChunk;
      if (forced > drop) {
        drop = forced;
        const startS = this.raw[drop].timeS;
        this.window = this.window.filter((w) => w.timeS - maxLag >= startS);
      }
    }
    if (drop < this.o.trimChunk) return;
    this.raw.splice(0, drop);
    path.cumulativeM.splice(0, drop);
  }

  private endS(): number {
    return this.raw[this.raw.length - 1]?.timeS ?? -Infinity;
  }

  private flushPending(): void {
    while (this.path && this.pending.length && this.lookupS(this.pending[0]) <= this.endS()) this.consume(this.pending.shift()!);
  }

  /**
   * Where on the path an update is compared: its time less the lag. A track ahead of its
   * command (negative lag) is compared with a command the positioner has not reported yet, so
   * the update waits for it rather than fall off the path's end.
   */
  private lookupS(u: TrackUpdate): number {
    return u.timeS - (this.lagS ?? 0);
  }

  private consume(u: TrackUpdate): void {
    const path = this.path!;
    const row = rowFromUpdate(u);
    this.newestS = Math.max(this.newestS ?? -Infinity, u.timeS);
    const c = sampleAt(path, this.lookupS(u));
    if (!c.inside || (this.followedElsewhere?.(u.id) && this.follower.currentId !== u.id) || !this.follower.offer(row, c.x, c.y)) return;
    const d = deviationAt(path, row);
    this.n++;
    this.sumSq += d.positionM ** 2;
    this.max = Math.max(this.max, d.positionM);
    this.last = { timeS: u.timeS, along: d.alongM, cross: d.crossM };
    this.record(u.timeS);
    this.window.push({ timeS: u.timeS, x: u.x, y: u.y });
    if (this.window.length > this.o.lagWindow) this.window.shift();
    if (++this.sinceLag >= this.o.lagEvery && this.window.length >= 10) {
      this.sinceLag = 0;
      const e = estimateLag(path, this.window, this.o.lag);
      if (e.lagS !== null) this.lagS = e.lagS;
    }
  }
}
