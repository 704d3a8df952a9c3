/**
 * A serial device whose clock restarts (power cycle, firmware reset) begins a new run on the same
 * port: the old run's last tracks are flushed and recorded, the picture starts again, a fresh
 * tracker takes over and the recording moves on to a new file, all before the record that showed
 * the restart is handled. Kept apart from the pipeline because it is the one way a live input
 * starts over without a new source, and its order matters.
 */
import { CLOCK_BACK_S } from '../ingest/clock-guard.ts';
import type { Source, SourceRecord } from '../ingest/source.ts';
import type { TrackEngine } from '../types.ts';
import type { RecordingSlot } from './recording.ts';
import type { ScanBatch } from './scan-batch.ts';

/**
 * A live record this much older than the run's latest time means the hardware's clock restarted,
 * s. The serial source passes such a record on only once several lines in a row confirmed the
 * restart (ingest/clock-guard.ts); a single stale line is refused there as a bad line.
 */
export const CLOCK_RESET_S = CLOCK_BACK_S;

/**
 * True when a live record's time lies well before `latestS`, the run's latest time: the hardware
 * restarted its clock. Its records would otherwise be out of order for the tracker and the
 * recording. Records without a time of their own (tracks, commanded paths...) never say so.
 */
export function clockWentBack(r: SourceRecord, latestS: number): boolean {
  const t = r.kind === 'detection' ? r.detection.timeS : r.kind === 'antenna' || r.kind === 'positioner' ? r.sample.timeS : null;
  return t !== null && latestS - t > CLOCK_RESET_S;
}

/** What a new run touches; the pipeline fills these. */
export interface LiveRestartOptions {
  /** The run's latest time, s (the live state's). */
  latestS: () => number;
  /** Sends the tracker's buffered output through the usual path (recorded and streamed), when a tracker runs. */
  flushTracker: () => void;
  /** The scan batch: what it holds goes out, then its timeline starts again with the device's clock. */
  batch: Pick<ScanBatch, 'flush' | 'discard'>;
  /** Forgets the run: live state, commanded paths, comparison, fixed echoes sent. */
  forgetRun: () => void;
  /** Builds the new run's tracker; it must be synchronous, as records are handled synchronously. */
  createTracker: () => TrackEngine | Promise<TrackEngine>;
  /** Puts the new run's tracker in place. */
  useTracker: (tracker: TrackEngine) => void;
  /** The live recording, moved on to a new file. */
  recording: Pick<RecordingSlot, 'rotate'>;
  /** Tells clients: a snapshot for every one, then the source status (which names the new file). */
  announce: () => void;
  /** Where the restart is logged. */
  log: (line: string) => void;
}

export class LiveRestart {
  constructor(private readonly o: LiveRestartOptions) {}

  /** Call with every record of a serial source before handling it: starts a new run first when its clock went back. */
  check(r: SourceRecord, source: Source): void {
    if (clockWentBack(r, this.o.latestS())) this.newRun(source);
  }

  /** A new run on the same port: fresh tracker, state and recording file; clients get a snapshot. */
  private newRun(source: Source): void {
    this.o.log(`source ${source.name}: time went back from ${this.o.latestS().toFixed(3)} s; starting a new run`);
    this.o.flushTracker();
    this.o.batch.flush();
    // The hardware's clock restarted: the scans' time starts again with it.
    this.o.batch.discard();
    this.o.forgetRun();
    const tracker = this.o.createTracker();
    // Records are handled synchronously, so the tracker must be ready now: factories are synchronous in practice.
    if (tracker instanceof Promise) throw new Error('tracker factory must be synchronous for live runs');
    this.o.useTracker(tracker);
    this.o.recording.rotate(source);
    this.o.announce();
  }
}
