/**
 * Merges the increments that arrive between two `scan` messages and paces those messages: the
 * first increment after a quiet spell leaves at once (low latency at low rates), later ones wait
 * for the next slot, so no client ever gets more than `rateHz` scans a second.
 */
import type { DeletionWire, DetectionWire, PositionerWire, ServerMessage, TrackWire } from './protocol.ts';

export type ScanMessage = Extract<ServerMessage, { type: 'scan' }>;

/** Pacing and size caps of the scan batches. */
export interface ScanBatchOptions {
  /** Most scans per second. */
  rateHz: number;
  /** Most detections carried by one scan; beyond it the oldest are dropped from the scan (not the state). Also the update count above which a scan keeps only each track's latest update. */
  maxDetections: number;
  /** Called with each finished scan and the arrival times (performance.now ms) of the lines in it. */
  emit: (scan: ScanMessage, receivedAtMs: number[]) => void;
}

export class ScanBatch {
  private seq = 0;
  private timeS = 0;
  private detections: DetectionWire[] = [];
  private updates: TrackWire[] = [];
  private deletions: DeletionWire[] = [];
  private positioner: PositionerWire[] = [];
  private antenna: number | null = null;
  private arrivals: number[] = [];
  private lastSentMs = -Infinity;
  private timer: NodeJS.Timeout | null = null;
  private readonly intervalMs: number;

  constructor(private readonly options: ScanBatchOptions) {
    this.intervalMs = 1000 / options.rateHz;
  }

  get pending(): boolean {
    return this.detections.length + this.updates.length + this.deletions.length + this.positioner.length > 0 || this.antenna !== null;
  }

  /**
   * The detections the next scan will carry. The live state already holds them, so a snapshot
   * taken now must leave them out or a new client would get each twice (snapshot, then scan).
   */
  pendingDetections(): ReadonlySet<DetectionWire> {
    return new Set(this.detections);
  }

  /** Sequence number the next scan will carry. */
  get nextSeq(): number {
    return this.seq;
  }

  time(t: number): void {
    if (t > this.timeS) this.timeS = t;
  }

  detection(d: DetectionWire, receivedAtMs: number): void {
    this.detections.push(d);
    if (this.detections.length > this.options.maxDetections) this.detections.shift();
    this.arrivals.push(receivedAtMs);
    this.time(d.timeS);
  }

  update(u: TrackWire, receivedAtMs?: number): void {
    this.updates.push(u);
    // A flood of updates (hundreds of tracks, a stalled event loop): keep each track's latest only,
    // which is all a client needs to be current; the history of the skipped ones is in the state.
    if (this.updates.length > 2 * this.options.maxDetections) this.compactUpdates();
    if (receivedAtMs !== undefined) this.arrivals.push(receivedAtMs);
    this.time(u.timeS);
  }

  private compactUpdates(): void {
    const latest = new Map<number, TrackWire>();
    for (const u of this.updates) {
      latest.delete(u.id);
      latest.set(u.id, u);
    }
    this.updates = [...latest.values()];
  }

  deletion(d: DeletionWire): void {
    // Kept beside the track's updates of this scan: clients apply updates first, then deletions
    // (ids are never reused, so no update can follow a deletion).
    this.deletions.push(d);
    this.time(d.timeS);
  }

  positionerSample(p: PositionerWire): void {
    this.positioner.push(p);
    this.time(p.timeS);
  }

  antennaAzimuth(az: number): void {
    this.antenna = az;
  }

  private held = false;

  /** No scans leave until release() (the state is being rebuilt). */
  hold(): void {
    this.held = true;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  release(): void {
    this.held = false;
  }

  /** Asks for a scan: now if the last one left long enough ago, else at the next slot. */
  schedule(): void {
    if (this.timer || this.held) return;
    const wait = this.lastSentMs + this.intervalMs - performance.now();
    if (wait <= 0) this.flush();
    else this.timer = setTimeout(() => this.flush(), wait);
  }

  flush(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    if (!this.pending || this.held) return;
    if (this.updates.length > this.options.maxDetections) this.compactUpdates();
    const scan: ScanMessage = {
      type: 'scan',
      seq: this.seq++,
      timeS: this.timeS,
      detections: this.detections,
      updates: this.updates,
      deletions: this.deletions,
      antennaAzimuthRad: this.antenna,
      positioner: this.positioner,
    };
    const arrivals = this.arrivals;
    this.clearPending();
    this.lastSentMs = performance.now();
    this.options.emit(scan, arrivals);
  }

  /**
   * Forget what is pending (replay seek, loop, new source): those increments belong to the old
   * position. The scan time starts again too: it is the newest time of the increments since, so
   * after a seek back clients follow the replay clock instead of keeping the highest time seen.
   */
  discard(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.clearPending();
    this.timeS = 0;
  }

  /** Empties the increments gathered for the next scan (the arrays were handed on, or are dropped). */
  private clearPending(): void {
    this.detections = [];
    this.updates = [];
    this.deletions = [];
    this.positioner = [];
    this.antenna = null;
    this.arrivals = [];
  }

  close(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }
}
