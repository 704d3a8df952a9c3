/**
 * The live comparison as the pipeline streams it: which comparison is current (a seek in a session
 * swaps in one rebuilt from the start of the run), whether its figures are stale (a seek whose
 * rebuild still runs: they cover only the re-sent window) and, per commanded path, the run time of
 * the last running-RMSE point sent, so each `comparison` message carries only the points since the
 * one before. Kept apart from the pipeline because this is bookkeeping of what clients were sent,
 * not of how records flow; it can be checked alone with a fake comparison.
 */
import type { PositionerSample, TrackDeletion, TrackUpdate } from '../types.ts';
import type { LiveComparisonLike } from './deps.ts';
import type { PathPointWire, ServerMessage } from './protocol.ts';

export type ComparisonMessage = Extract<ServerMessage, { type: 'comparison' }>;

export class ComparisonFeed {
  /** True from a session seek until its comparison is rebuilt: the figures meanwhile cover only the re-sent window. */
  private stale = false;
  /** Run time of the last running-RMSE point sent, per path (a snapshot carries all before it). */
  private readonly sentS = new Map<string, number>();

  /** `comparison` is null when no live comparison is available: every method is then a no-op. */
  constructor(private comparison: LiveComparisonLike | null) {}

  /** The comparison records go to now (rebuild.ts feeds it directly after a seek). */
  get current(): LiveComparisonLike | null {
    return this.comparison;
  }

  commanded(path: PathPointWire[], target?: string): void {
    this.comparison?.commanded(path, target);
  }

  positioner(sample: PositionerSample): void {
    this.comparison?.positioner(sample);
  }

  update(u: TrackUpdate): void {
    this.comparison?.update(u);
  }

  deletion(d: TrackDeletion): void {
    this.comparison?.deletion(d);
  }

  /** A new source or a new live run: everything goes, commanded paths included. */
  restart(): void {
    this.comparison?.restart();
    this.sentS.clear();
    // A source switched in while a seek was still rebuilding: that rebuild belongs to the old
    // source and will never settle this one, whose figures would stay hidden until its own seek.
    this.stale = false;
  }

  /**
   * A replay seek: figures and followed track go, the commanded paths stay. Without a re-track
   * (`retrack` false: a session) the figures stay stale until settle(), since only a rebuild
   * from the start of the run (rebuild.ts) makes them whole again.
   */
  resetForSeek(retrack: boolean): void {
    this.comparison?.reset();
    this.stale = !retrack && this.comparison !== null;
  }

  /** Puts a comparison rebuilt from the start of the run in place of the current one. */
  replace(fresh: LiveComparisonLike): void {
    this.comparison = fresh;
  }

  /**
   * The seek is over and every client is about to get a snapshot with the whole running-RMSE
   * history (a resync): the next `comparison` messages go on from its end. (A snapshot for one
   * joining client does not move this: the others still need the points since the last message;
   * clients drop points they already hold.)
   */
  settle(): void {
    this.stale = false;
    this.sentS.clear();
    for (const h of this.comparison?.history() ?? []) this.sentS.set(h.pathId, h.points[h.points.length - 2]);
  }

  /** The running-RMSE history for a snapshot; none while stale (a comparison still being rebuilt has only the re-sent window). */
  history(): { pathId: string; points: number[] }[] {
    return this.comparison && !this.stale ? this.comparison.history() : [];
  }

  /** The figures of every path for the status tick, each with its chart points since the last message; none while stale. */
  messages(): ComparisonMessage[] {
    if (this.stale || !this.comparison) return [];
    const out: ComparisonMessage[] = [];
    for (const figures of this.comparison.figures()) {
      // The chart's points since the last message of this path (a fast replay moves seconds between two).
      const pathId = figures.pathId ?? '';
      const recent = this.comparison.historyAfter(pathId, this.sentS.get(pathId) ?? -Infinity);
      if (recent.length) this.sentS.set(pathId, recent[recent.length - 2]);
      out.push({ type: 'comparison', figures, ...(recent.length ? { recent } : {}) });
    }
    return out;
  }
}
