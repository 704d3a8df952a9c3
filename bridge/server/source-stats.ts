/**
 * Source health for the dashboard's status line: bad-line count and the last bad line, the
 * detection rate and the latency from a line's arrival to its update leaving the bridge.
 * Rates and latencies are over the last second, kept in bounded rings.
 */
import type { BadLine, SourceState } from '../ingest/source.ts';
import type { SourceStatus } from './protocol.ts';
import { Ring } from './ring.ts';

const WINDOW_MS = 1000;
const MAX_SAMPLES = 8192;

export class SourceStats {
  kind: SourceStatus['kind'] = 'none';
  name = '';
  state: SourceState = 'waiting';
  badLines = 0;
  lastBad: { line: number; reason: string } | null = null;
  recording: string | null = null;
  recordingError: string | null = null;
  private readonly arrivals = new Ring<number>(MAX_SAMPLES);
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
    this.arrivals.clear();
    this.latencies.clear();
  }

  bad(b: BadLine): void {
    this.badLines++;
    this.lastBad = { line: b.line, reason: b.reason };
  }

  detection(receivedAtMs: number): void {
    this.arrivals.push(receivedAtMs);
  }

  /** One latency sample: the update built from a line received at `receivedAtMs` left at `sentAtMs`. */
  latency(receivedAtMs: number, sentAtMs: number): void {
    this.latencies.push([sentAtMs, Math.max(0, sentAtMs - receivedAtMs)]);
  }

  status(): SourceStatus {
    const t = this.now();
    this.arrivals.dropWhile((a) => a < t - WINDOW_MS);
    this.latencies.dropWhile(([s]) => s < t - WINDOW_MS);
    const lat = this.latencies.toArray().map(([, l]) => l).sort((a, b) => a - b);
    const median = lat.length ? lat[Math.floor(lat.length / 2)] : null;
    return {
      kind: this.kind,
      state: this.state,
      name: this.name,
      badLines: this.badLines,
      lastBad: this.lastBad,
      detectionsPerSecond: (this.arrivals.length * 1000) / WINDOW_MS,
      latencyMs: median === null ? null : Math.round(median * 100) / 100,
      recording: this.recording,
      recordingError: this.recordingError,
    };
  }
}
