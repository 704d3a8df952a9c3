/**
 * Source health for the dashboard's status line: bad-line count and the last bad line, the
 * detection rate and the latency from a line's arrival to its update leaving the bridge.
 * Rates and latencies are over the last second. Detections are counted per 100 ms bucket, not
 * kept per arrival, so a fast replay (tens of thousands a second) is counted in full in a fixed
 * eleven numbers; latencies are a bounded ring of the newest samples (a median needs no more).
 */
import type { BadLine, SourceState } from '../ingest/source.ts';
import type { SourceStatus } from './protocol.ts';
import { Ring } from './ring.ts';

const WINDOW_MS = 1000;
const BUCKET_MS = 100;
const MAX_SAMPLES = 8192;

export class SourceStats {
  kind: SourceStatus['kind'] = 'none';
  name = '';
  state: SourceState = 'waiting';
  badLines = 0;
  lastBad: { line: number; reason: string } | null = null;
  recording: string | null = null;
  recordingError: string | null = null;
  /** Detection counts per BUCKET_MS bucket (index = floor(ms / BUCKET_MS)), oldest first, the last second's only. */
  private buckets: { index: number; count: number }[] = [];
  /** [sentAtMs, latencyMs] pairs. */
  private readonly latencies = new Ring<[number, number]>(MAX_SAMPLES);
  private readonly now: () => number;

  constructor(now: () => number = () => performance.now()) {
    this.now = now;
  }

  /** A new source: counts start again (bad-line numbers are per source). */
  reset(kind: SourceStatus['kind'], name: string): void {
    this.kind = kind;
    this.name = name;
    this.state = kind === 'replay' ? 'paused' : 'waiting';
    this.badLines = 0;
    this.lastBad = null;
    this.recording = null;
    this.recordingError = null;
    this.buckets = [];
    this.latencies.clear();
  }

  bad(b: BadLine): void {
    this.badLines += b.count ?? 1;
    this.lastBad = { line: b.line, reason: b.reason };
  }

  detection(receivedAtMs: number): void {
    const index = Math.floor(receivedAtMs / BUCKET_MS);
    const last = this.buckets[this.buckets.length - 1];
    if (last && last.index === index) last.count++;
    else if (!last || index > last.index) this.buckets.push({ index, count: 1 });
    else (this.buckets.find((b) => b.index >= index) ?? last).count++; // an arrival stamped out of order
    this.dropBuckets(index * BUCKET_MS);
  }

  /** Forgets buckets wholly older than the second before `t`: at most WINDOW_MS / BUCKET_MS + 1 stay. */
  private dropBuckets(t: number): void {
    const oldest = Math.floor((t - WINDOW_MS) / BUCKET_MS);
    let k = 0;
    while (k < this.buckets.length && this.buckets[k].index < oldest) k++;
    if (k) this.buckets.splice(0, k);
  }

  /** Detections in [t − 1 s, t]: whole buckets, and the share of the oldest one inside the window (uniform within it). */
  private detectionRate(t: number): number {
    this.dropBuckets(t);
    const from = t - WINDOW_MS;
    let n = 0;
    for (const b of this.buckets) {
      const start = b.index * BUCKET_MS;
      if (start >= from) n += b.count;
      else n += (b.count * Math.max(0, start + BUCKET_MS - from)) / BUCKET_MS;
    }
    return Math.round((n * 1000) / WINDOW_MS);
  }

  /** One latency sample: the update built from a line received at `receivedAtMs` left at `sentAtMs`. */
  latency(receivedAtMs: number, sentAtMs: number): void {
    this.latencies.push([sentAtMs, Math.max(0, sentAtMs - receivedAtMs)]);
  }

  status(): SourceStatus {
    const t = this.now();
    this.latencies.dropWhile(([s]) => s < t - WINDOW_MS);
    const lat = this.latencies.toArray().map(([, l]) => l).sort((a, b) => a - b);
    const median = lat.length ? lat[Math.floor(lat.length / 2)] : null;
    return {
      kind: this.kind,
      state: this.state,
      name: this.name,
      badLines: this.badLines,
      lastBad: this.lastBad,
      detectionsPerSecond: this.detectionRate(t),
      latencyMs: median === null ? null : Math.round(median * 100) / 100,
      recording: this.recording,
      recordingError: this.recordingError,
    };
  }
}
