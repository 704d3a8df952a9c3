/**
 * Bookkeeping of a replay seek in the pipeline. Two things happen after 'seeked':
 * - a recorded session re-sends its state at the new time synchronously (the `resending` window,
 *   closed on the next turn of the event loop): those records rebuild the state but are neither
 *   recorded nor streamed as increments;
 * - a detections CSV is re-tracked from the start; records the replay releases meanwhile are
 *   queued (bounded) so the tracker still sees them in time order afterwards.
 * Each seek gets an epoch; work for an overtaken seek is abandoned.
 */
import type { SourceRecord } from '../ingest/source.ts';

/** Records queued during a re-track at most (a few seconds at the highest replay speeds). */
const MAX_QUEUED = 200_000;

export class SeekGate {
  private epoch = 0;
  private queue: [SourceRecord, number][] | null = null;
  /** True between 'seeked' and the next turn of the event loop. */
  resending = false;
  /** Records dropped because the queue was full. */
  dropped = 0;

  /** A new seek (or a new source, or shutdown): earlier work is abandoned. Returns its epoch. */
  begin(queueRecords: boolean, resending: boolean): number {
    this.queue = queueRecords ? [] : null;
    this.resending = resending;
    return ++this.epoch;
  }

  /** Starts queueing now, within the current seek (records already handled stay handled). */
  queueFromNow(): void {
    this.queue ??= [];
  }

  isCurrent(epoch: number): boolean {
    return epoch === this.epoch;
  }

  /** Takes a record into the queue while a re-track runs; false when it should be handled now. */
  intercept(r: SourceRecord, receivedAtMs: number): boolean {
    if (!this.queue) return false;
    if (this.queue.length < MAX_QUEUED) this.queue.push([r, receivedAtMs]);
    else this.dropped++;
    return true;
  }

  /** Ends queueing and hands back what was queued, in arrival order. */
  drain(): [SourceRecord, number][] {
    const q = this.queue ?? [];
    this.queue = null;
    return q;
  }
}
