/**
 * Opens a session file: validates the header and every line (zod), reports bad lines with their
 * numbers, notes a truncated last line (a writer killed mid-line), and builds the seek index in
 * the same single pass. Afterwards snapshots and record ranges are read from byte offsets.
 */
import { closeSync, openSync } from 'node:fs';
import { basename } from 'node:path';
import { EchotrailError } from '../errors.ts';
import type { BadLine } from '../ingest/source.ts';
import { SESSION_SUFFIX, SESSION_VERSION, sessionHeader, type SessionHeader, type StoredRecord, type SessionSummary, type TimedRecord } from './format.ts';
import { parseSessionLine } from './parse-line.ts';
import { RevolutionEstimate } from './revolution.ts';

export { parseSessionLine };
import { LineReader } from './line-reader.ts';
import { SeekIndex } from './seek-index.ts';
import { buildSnapshot, type SessionSnapshot } from './run-state.ts';

export interface OpenSessionOptions {
  /** Run time between seek-index checkpoints, s. */
  checkpointS: number;
  /** Track history a snapshot carries, s before its time. */
  historyS: number;
  /** Detections a snapshot carries, s before its time (about one antenna revolution). */
  recentDetectionsS: number;
  /** Bad lines kept in full; the count stays exact beyond it. */
  maxBadLines: number;
  /** Longest line read, bytes; longer ones are bad lines (a commanded path of 100k points fits). */
  maxLineBytes: number;
}

export function resolveOpenSessionOptions(o: Partial<OpenSessionOptions> = {}): OpenSessionOptions {
  const r = { checkpointS: o.checkpointS ?? 1, historyS: o.historyS ?? 10, recentDetectionsS: o.recentDetectionsS ?? 1, maxBadLines: o.maxBadLines ?? 1000, maxLineBytes: o.maxLineBytes ?? 16 * 1024 * 1024 };
  if (!(r.checkpointS > 0) || !(r.historyS >= 0) || !(r.recentDetectionsS >= 0)) throw new EchotrailError('E_OPTION', 'session windows must be positive numbers of seconds');
  return r;
}

/** Session id: the file name without its suffix. */
export function sessionIdOf(path: string): string {
  const b = basename(path);
  return b.endsWith(SESSION_SUFFIX) ? b.slice(0, -SESSION_SUFFIX.length) : b.replace(/\.[^.]*$/, '');
}

export class SessionReader {
  readonly id: string;
  readonly opts: OpenSessionOptions;
  /** Filled by openSession(). */
  header!: SessionHeader;
  durationS = 0;
  detections = 0;
  trackIds = new Set<number>();
  hasCommanded = false;
  badLines: BadLine[] = [];
  badLineCount = 0;
  /** The `end` line's summary when the session was closed cleanly, else null (killed or still recording). */
  endSummary: SessionSummary | null = null;
  /** A last line without newline, ignored. */
  truncatedTail: { line: number; bytes: number } | null = null;
  index!: SeekIndex;
  /** Antenna revolution period (median of the first revolutions), s; null for a staring antenna. */
  revolutionS: number | null = null;
  private fd: number | null;

  constructor(readonly path: string, opts: Partial<OpenSessionOptions> = {}) {
    this.id = sessionIdOf(path);
    this.opts = resolveOpenSessionOptions(opts);
    try {
      this.fd = openSync(path, 'r');
    } catch (err) {
      // A missing or unreadable file is a path problem, said the way the other commands say it;
      // E_SESSION_FORMAT is for a file that opens but is not a session.
      const code = (err as NodeJS.ErrnoException).code;
      const why = code === 'ENOENT' ? 'no such file' : code === 'EACCES' ? 'permission denied' : code === 'EISDIR' ? 'is a folder' : (err as Error).message;
      throw new EchotrailError('E_PATH', `cannot read session ${path}: ${why}`, { cause: err });
    }
  }

  /** Records with from ≤ timeS ≤ to, in file order (the file is in time order, within a scan). */
  *records(fromS: number, toS = Infinity): Generator<TimedRecord> {
    for (const r of this.cursor(fromS)) {
      if (r.timeS > toS) return;
      yield r;
    }
  }

  /** Every good record from the first one at or after `fromS` to the end. */
  *cursor(fromS: number): Generator<TimedRecord> {
    for (const r of this.fromCheckpoint(fromS)) if (r.timeS >= fromS) yield r;
  }

  /** The run as it was at `timeS` (clamped to [0, duration]). */
  snapshotAt(timeS: number): SessionSnapshot {
    const t = Math.min(Math.max(timeS, 0), this.durationS);
    const from = t - Math.max(this.opts.historyS, this.opts.recentDetectionsS);
    const cp = this.index.find(from);
    return buildSnapshot(cp.state, this.linesFrom(cp.offset, cp.line), t, this.opts);
  }

  /**
   * What a replay re-sends after seeking to `timeS` so a consumer that reset its state sees the run
   * as it was: commanded path, fixed echoes, the tracks alive when the history window opens, then
   * the window's own records (track updates, deletions, recent detections) and the latest samples.
   */
  resendAt(timeS: number): StoredRecord[] {
    const t = Math.min(Math.max(timeS, 0), this.durationS);
    const from = t - this.opts.historyS;
    const cp = this.index.find(from);
    const state = cp.state.clone();
    const window: StoredRecord[] = [];
    for (const r of this.linesFrom(cp.offset, cp.line)) {
      if (r.timeS > t) break;
      const k = r.record.kind;
      if (r.timeS < from || k === 'antenna' || k === 'positioner' || k === 'note') state.apply(r.record);
      else if (k !== 'detection' || r.timeS >= t - this.opts.recentDetectionsS) window.push(r.record);
    }
    const out: StoredRecord[] = [];
    for (const [target, path] of state.commandedByTarget) if (path.length) out.push(target ? { kind: 'commanded', path, target } : { kind: 'commanded', path });
    if (state.fixedEchoes.length) out.push({ kind: 'fixed-echoes', echoes: state.fixedEchoes });
    for (const update of state.tracks.values()) out.push({ kind: 'track', update });
    out.push(...window);
    if (state.antenna) out.push({ kind: 'antenna', sample: state.antenna });
    if (state.positioner) out.push({ kind: 'positioner', sample: state.positioner });
    return out;
  }

  close(): void {
    if (this.fd !== null) closeSync(this.fd);
    this.fd = null;
  }

  /** Good records from the checkpoint at or before fromS (bad lines were reported at open). */
  private fromCheckpoint(fromS: number): Generator<TimedRecord> {
    const cp = this.index.find(fromS);
    return this.linesFrom(cp.offset, cp.line);
  }

  private *linesFrom(offset: number, line: number): Generator<TimedRecord> {
    if (this.fd === null) throw new EchotrailError('E_SESSION_FORMAT', `session '${this.id}' is closed`);
    for (const raw of new LineReader(this.fd, { maxLineBytes: this.opts.maxLineBytes }).lines(offset, line)) {
      const r = parseSessionLine(raw);
      if (typeof r !== 'string' && 'record' in r) yield r;
    }
  }

  /** The single validating pass: header, every line, counts, index. */
  async scan(): Promise<void> {
    const reader = new LineReader(this.fd!, { maxLineBytes: this.opts.maxLineBytes });
    const it = reader.lines(0, 1);
    const first = it.next();
    if (first.done) throw new EchotrailError('E_SESSION_FORMAT', `${this.path}: empty file, or its header line is incomplete`);
    const raw = first.value;
    let json: unknown = null;
    try { json = JSON.parse(raw.text); } catch { /* reported below */ }
    const h = sessionHeader.safeParse(json);
    if (!h.success) throw new EchotrailError('E_SESSION_FORMAT', `${this.path}: line 1 is not an echotrail session header (${h.error.issues[0]?.message ?? 'not JSON'})`);
    if (h.data.version > SESSION_VERSION) throw new EchotrailError('E_SESSION_FORMAT', `${this.path}: format version ${h.data.version} is newer than this echotrail reads (${SESSION_VERSION}); update echotrail`);
    this.header = h.data;
    this.index = new SeekIndex(this.opts.checkpointS, raw.offset + raw.bytes + 1, 2);
    let n = 0;
    const revolution = new RevolutionEstimate();
    for (const rawLine of it) {
      const r = parseSessionLine(rawLine);
      if (typeof r === 'string') {
        this.badLineCount++;
        if (this.badLines.length < this.opts.maxBadLines) this.badLines.push({ line: rawLine.line, reason: r, text: rawLine.text.slice(0, 200) });
      } else if ('end' in r) {
        this.endSummary = r.end;
        this.durationS = Math.max(this.durationS, r.timeS);
      } else {
        this.index.add(r.timeS, r.record, r.offset, r.line);
        if (r.timeS > this.durationS) this.durationS = r.timeS;
        if (r.record.kind === 'detection') this.detections++;
        else if (r.record.kind === 'track') this.trackIds.add(r.record.update.id);
        else if (r.record.kind === 'commanded') this.hasCommanded = true;
        else if (r.record.kind === 'antenna') revolution.add(r.record.sample.timeS, r.record.sample.azimuthRad);
      }
      // Let a server keep serving while a long session is indexed.
      if (++n % 50_000 === 0) await new Promise((res) => setImmediate(res));
    }
    this.truncatedTail = reader.tail();
    this.revolutionS = revolution.periodS();
  }
}

/** Opens and indexes a session file. Throws EchotrailError('E_SESSION_FORMAT') when it is not one. */
export async function openSession(path: string, opts: Partial<OpenSessionOptions> = {}): Promise<SessionReader> {
  const s = new SessionReader(path, opts);
  try {
    await s.scan();
  } catch (err) {
    s.close();
    throw err;
  }
  return s;
}
