/**
 * What the pipeline does when a replay jumps ('seeked'): the picture is cleared at once, then,
 * on the next turn of the event loop (after a session has re-sent its state at the new time),
 * rebuilt for the new time: a detections CSV is re-tracked from the start with a fresh tracker,
 * a session's comparison is built again from the start (rebuild.ts does the reading); records
 * the replay plays meanwhile wait in the seek gate (seek-gate.ts) and are handled after, in
 * order; then every client gets one fresh snapshot. Kept apart from the pipeline because it is a
 * sequence of its own with its own failure rule: a newer seek, a new source or shutdown abandons it.
 */
import type { Source, SourceRecord } from '../ingest/source.ts';
import type { TrackEngine } from '../types.ts';
import type { ComparisonFeed } from './comparison-feed.ts';
import { isReplayControl, type LiveComparisonLike } from './deps.ts';
import { rebuildAfterSeek, rebuildComparison } from './rebuild.ts';
import type { ScanBatch } from './scan-batch.ts';
import { SeekGate } from './seek-gate.ts';
import type { LiveState } from './state.ts';

/** What a seek touches and whom it tells; the pipeline fills these. */
export interface ReplaySeekOptions {
  /** The live picture, cleared and rebuilt. */
  state: LiveState;
  /** The scan batch, held while the picture is rebuilt (its increments would be out of date). */
  batch: Pick<ScanBatch, 'discard' | 'hold' | 'release'>;
  /** The live comparison, reset and (for a session) replaced by one rebuilt from the start. */
  comparison: ComparisonFeed;
  /** The input now: a new source may have replaced the one that seeked. */
  source: () => Source | null;
  /** True when the bridge tracks the input itself (a detections CSV): a seek then re-tracks it. */
  tracking: () => boolean;
  /** Builds a fresh tracking engine for the re-track. */
  createTracker: () => TrackEngine | Promise<TrackEngine>;
  /** Puts the re-track's tracker in place (before queued records are handled with it). */
  useTracker: (tracker: TrackEngine) => void;
  /** Builds a live comparison, or null when none is available. */
  createComparison: (() => LiveComparisonLike) | null;
  /** Handles one record queued during the rebuild, as if it arrived now. */
  handle: (r: SourceRecord, receivedAtMs: number) => void;
  /** Forgets the fixed echoes sent, so the rebuilt map goes out again. */
  forgetFixedEchoes: () => void;
  /** The picture is rebuilt: every client needs a snapshot and the replay state. */
  resync: () => void;
  /** Where rebuild failures go (the replay goes on; only the picture before it is missing). */
  log: (line: string) => void;
}

export class ReplaySeek {
  private readonly gate = new SeekGate();

  constructor(private readonly o: ReplaySeekOptions) {}

  /** True between 'seeked' and the next turn of the event loop: records are a session's re-sent state, not new. */
  get resending(): boolean {
    return this.gate.resending;
  }

  /** Takes a record into the queue while a rebuild runs; false when it should be handled now. */
  intercept(r: SourceRecord, receivedAtMs: number): boolean {
    return this.gate.intercept(r, receivedAtMs);
  }

  /** A new source or shutdown: the unfinished work of any seek is abandoned. */
  abandon(): void {
    this.gate.begin(false, false);
  }

  /** A replay jumped to `timeS`: clears the picture now and rebuilds it on the next turn. */
  seeked(timeS: number): void {
    const retrack = this.o.tracking();
    const epoch = this.gate.begin(retrack, true);
    this.o.batch.discard();
    this.o.batch.hold();
    this.o.state.reset();
    this.o.comparison.resetForSeek(retrack);
    this.o.forgetFixedEchoes();
    setImmediate(() => this.finish(epoch, timeS, retrack).catch((err: unknown) => this.o.log(`seek to ${timeS} s: ${(err as Error).message}`)));
  }

  private async finish(epoch: number, timeS: number, retrack: boolean): Promise<void> {
    if (!this.gate.isCurrent(epoch)) return;
    this.gate.resending = false;
    const src = this.o.source();
    const abandoned = (): boolean => !this.gate.isCurrent(epoch);
    if (retrack && src && isReplayControl(src)) {
      try {
        const tracker = await this.o.createTracker();
        this.o.useTracker(tracker);
        await rebuildAfterSeek(src, tracker, this.o.state, timeS, abandoned, this.o.comparison.current);
      } catch (err) {
        // The replay goes on from the new position; only the picture before it is missing.
        this.o.log(`rebuilding state after seek to ${timeS} s: ${(err as Error).message}`);
      }
      if (abandoned()) return;
      for (const [r, at] of this.gate.drain()) this.o.handle(r, at);
    } else if (src && isReplayControl(src) && this.o.createComparison && typeof src.recordsUntil === 'function') {
      // A session: its re-sent state (handled by now) rebuilt the picture but holds only the last
      // window of track history, so the comparison is built again from the start of the run,
      // while what the replay plays meanwhile waits in the queue (in time order after it).
      this.gate.queueFromNow();
      const fresh = this.o.createComparison();
      try {
        if (await rebuildComparison(src, fresh, this.o.state, timeS, abandoned)) this.o.comparison.replace(fresh);
      } catch (err) {
        this.o.log(`rebuilding the comparison after seek to ${timeS} s: ${(err as Error).message}`);
      }
      if (abandoned()) return;
      for (const [r, at] of this.gate.drain()) this.o.handle(r, at);
    }
    this.o.comparison.settle();
    this.o.state.timeS = Math.max(this.o.state.timeS, timeS);
    this.o.batch.discard();
    this.o.batch.release();
    this.o.resync();
  }
}
