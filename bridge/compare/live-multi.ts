/**
 * The live comparison of a run with several commanded paths: one LiveComparison (live.ts) per path.
 */
import { DEFAULT_PATH_ID, POSITIONER_PATH_ID, type ComparisonFigures } from '../server/protocol.ts';
import type { PositionerSample, TrackUpdate } from '../types.ts';
import { LiveComparison, type LiveComparisonOptions } from './live.ts';
import type { PathPoint, TimedPath } from './timed-path.ts';

/**
 * Several commanded paths at once, one per positioner or carriage (a session's `cmd` records
 * with a `target`): each path has its own LiveComparison, so each picks the track that follows
 * it (follow.ts: the confirmed track nearest its commanded position, with hysteresis) and keeps
 * its own figures and lag. A track is only ever compared with the path it follows: on a run with
 * two carriages, the second carriage's track is no longer measured against the first one's path.
 *
 *   const live = new MultiPathComparison();
 *   live.setCommanded(pathA, 'A'); live.setCommanded(pathB, 'B');
 *   for (const u of output.updates) live.update(u);
 *   for (const f of live.figures()) send({ type: 'comparison', figures: f });   // f.pathId: 'A' | 'B'
 */
export class MultiPathComparison {
  private readonly byPath = new Map<string, LiveComparison>();
  /** True once a whole path was given: positioner samples then no longer build one. */
  private explicit = false;

  constructor(private readonly options: Partial<LiveComparisonOptions> = {}) {}

  /** Set (or replace) the path of one target; `target` absent: the single default path. */
  setCommanded(path: readonly PathPoint[] | TimedPath, target: string = DEFAULT_PATH_ID): void {
    if (!this.explicit) this.byPath.delete(POSITIONER_PATH_ID);
    this.explicit = true;
    this.comparisonOf(target).setCommanded(path);
  }

  /**
   * Positioner samples build paths of their own, one per named positioner (`target`, the same
   * name a whole path of that carriage would have), unnamed ones POSITIONER_PATH_ID; unless whole
   * paths were given.
   */
  addPositioner(s: PositionerSample): void {
    if (this.explicit) return;
    this.comparisonOf(s.target ?? POSITIONER_PATH_ID).addPositioner(s);
  }

  /** The comparison of one path, made on first use; it leaves alone the tracks the others follow. */
  private comparisonOf(path: string): LiveComparison {
    let live = this.byPath.get(path);
    if (!live) {
      const own: LiveComparison = new LiveComparison(this.options, (id) => {
        for (const other of this.byPath.values()) if (other !== own && other.followedId === id) return true;
        return false;
      });
      live = own;
      this.byPath.set(path, live);
    }
    return live;
  }

  /** Every path sees every update; each keeps only its own followed track's. */
  update(u: TrackUpdate): void {
    for (const live of this.byPath.values()) live.update(u);
  }

  /** Names of the paths, in the order they came. */
  get paths(): string[] {
    return [...this.byPath.keys()];
  }

  /** Figures of every path that has compared something, each naming its path. */
  figures(): ComparisonFigures[] {
    const out: ComparisonFigures[] = [];
    for (const [pathId, live] of this.byPath) {
      const f = live.figures();
      if (f.samples > 0) out.push({ ...f, pathId });
    }
    return out;
  }

  /** The running-RMSE points of one path after run time `afterS` (LiveComparison.historyAfter). */
  historyAfter(pathId: string, afterS: number): number[] {
    return this.byPath.get(pathId)?.historyAfter(afterS) ?? [];
  }

  /** The running-RMSE history of every path that has compared something (LiveComparison.history). */
  history(): { pathId: string; points: number[] }[] {
    const out: { pathId: string; points: number[] }[] = [];
    for (const [pathId, live] of this.byPath) {
      const points = live.history();
      if (points.length) out.push({ pathId, points });
    }
    return out;
  }

  /** Replay seek: forget figures and followed tracks; keep the paths (see LiveComparison.reset). */
  reset(): void {
    for (const live of this.byPath.values()) live.reset();
  }
}
