/**
 * What a replay plays: a recorded session (indexed file, tracks included) or a detections CSV
 * (held in memory, detections only). ReplaySource drives either through this one interface.
 */
import type { BadLine, SourceRecord } from './source.ts';
import type { Detection } from '../types.ts';
import { openSession, type OpenSessionOptions, type SessionReader } from '../session/reader.ts';
import type { SessionSnapshot } from '../session/run-state.ts';
import { readDetectionsCsv, SKIP_DETAIL_LIMIT, type SkipReport } from './detections-csv.ts';

export interface TimedSourceRecord {
  timeS: number;
  record: SourceRecord;
}

export interface ReplayTimeline {
  readonly id: string;
  readonly durationS: number;
  readonly carriesTracks: boolean;
  /** Lines refused when the file was read (at most a capped number), and their exact count. */
  readonly badLines: BadLine[];
  readonly badLineCount: number;
  /** Antenna revolution period when known, s (the default replay step). */
  readonly revolutionS: number | null;
  /** Records at or after `fromS`, in order. */
  cursor(fromS: number): Iterator<TimedSourceRecord>;
  snapshot(timeS: number): SessionSnapshot;
  /** Records to re-send after a seek so consumers rebuild their state (empty when they must re-track). */
  resendAt(timeS: number): SourceRecord[];
  /** Every record up to `timeS`, for consumers that re-track after a seek. */
  recordsUntil(timeS: number): Iterable<SourceRecord>;
  close(): void;
}

function isSource<T extends { kind: string }>(r: T): r is Exclude<T, { kind: 'note' }> {
  return r.kind !== 'note';
}

class SessionTimeline implements ReplayTimeline {
  readonly carriesTracks = true;
  constructor(private readonly s: SessionReader) {}
  get id() { return this.s.id; }
  get durationS() { return this.s.durationS; }
  get badLines() { return this.s.badLines; }
  get badLineCount() { return this.s.badLineCount; }
  get revolutionS() { return this.s.revolutionS; }
  *cursor(fromS: number): Iterator<TimedSourceRecord> {
    for (const r of this.s.cursor(fromS)) if (isSource(r.record)) yield { timeS: r.timeS, record: r.record };
  }
  snapshot(timeS: number) { return this.s.snapshotAt(timeS); }
  resendAt(timeS: number): SourceRecord[] { return this.s.resendAt(timeS).filter(isSource); }
  *recordsUntil(timeS: number): Iterable<SourceRecord> {
    for (const r of this.s.records(0, timeS)) if (isSource(r.record)) yield r.record;
  }
  close() { this.s.close(); }
}

/** First index whose detection time is ≥ t. */
function lowerBound(d: Detection[], t: number): number {
  let lo = 0;
  let hi = d.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (d[mid].timeS < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

class CsvTimeline implements ReplayTimeline {
  readonly carriesTracks = false;
  readonly durationS: number;
  readonly revolutionS = null;
  constructor(readonly id: string, private readonly d: Detection[], readonly badLines: BadLine[], private readonly windowS: number) {
    this.durationS = d.length ? d[d.length - 1].timeS : 0;
  }
  get badLineCount() { return this.badLines.reduce((n, b) => n + (b.count ?? 1), 0); }
  *cursor(fromS: number): Iterator<TimedSourceRecord> {
    for (let i = lowerBound(this.d, fromS); i < this.d.length; i++) yield { timeS: this.d[i].timeS, record: { kind: 'detection', detection: this.d[i] } };
  }
  snapshot(timeS: number): SessionSnapshot {
    const detections = this.d.slice(lowerBound(this.d, timeS - this.windowS), lowerBound(this.d, timeS + 1e-12));
    return { timeS, tracks: [], history: [], detections, fixedEchoes: [], commanded: [], antenna: null, positioner: null };
  }
  resendAt(): SourceRecord[] { return []; }
  *recordsUntil(timeS: number): Iterable<SourceRecord> {
    for (const detection of this.d) {
      if (detection.timeS > timeS) return;
      yield { kind: 'detection', detection };
    }
  }
  close() { /* nothing held open */ }
}

/**
 * A CSV's skipped rows as bad lines: the earliest ones the reader lists, then the last in the file,
 * which also counts those between the two (the reader keeps a bounded list, not every row).
 */
function csvBadLines(report: SkipReport): BadLine[] {
  const listed: BadLine[] = report.skippedLines.slice(0, SKIP_DETAIL_LIMIT).map((s) => ({ line: s.line, reason: s.reason, text: '' }));
  const last = report.lastSkipped;
  if (last && (listed.length === 0 || last.line > listed[listed.length - 1].line)) listed.push({ line: last.line, reason: last.reason, text: '' });
  const unlisted = report.skipped - listed.length;
  if (unlisted > 0 && listed.length) listed[listed.length - 1] = { ...listed[listed.length - 1], count: 1 + unlisted };
  return listed;
}

/** Opens a session file (`*.jsonl`) or a detections CSV (`*.csv`) for replay. */
export async function openTimeline(path: string, format: 'session' | 'csv', id: string, session: Partial<OpenSessionOptions>): Promise<ReplayTimeline> {
  if (format === 'session') return new SessionTimeline(await openSession(path, session));
  // The CSV reader streams; a replay needs random access for seeks, so the detections are held
  // in memory (about 100 bytes each: a million rows is ~100 MB).
  const csv = readDetectionsCsv(path);
  const detections: Detection[] = [];
  for await (const batch of csv.batches()) for (const d of batch) detections.push(d);
  return new CsvTimeline(id, detections, csvBadLines(csv.report), session.recentDetectionsS ?? 1);
}
