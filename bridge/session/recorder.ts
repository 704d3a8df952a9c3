/**
 * Records a run to a session file (format.ts, docs/session-format.md).
 *
 * Every record is written with its own fs.writeSync as soon as it arrives: after a `kill -9` the
 * kernel still holds every completed write, so at most the line being written is lost (the reader
 * skips a truncated last line). No fsync: power loss may lose the last seconds; a day of
 * recording costs one small write(2) per record, a few µs each.
 * A recording failure (unwritable folder, disk full) never throws: the recorder stops, keeps the
 * error in status() and emits 'error' only when someone listens (an unheard 'error' would crash).
 */
import { EventEmitter } from 'node:events';
import { closeSync, mkdirSync, openSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { EchotrailError } from '../errors.ts';
import type { SourceRecord } from '../ingest/source.ts';
import {
  RECORD_KINDS, SESSION_FORMAT, SESSION_SUFFIX, SESSION_UNITS, SESSION_VERSION,
  toLine, type SessionHeader, type StoredRecord,
} from './format.ts';
import { recordTime } from './record-time.ts';

export interface RecorderOptions {
  /** Folder the session files go into; created when missing. */
  dir: string;
  /** Run name, stored in the header and used in the file name. */
  name: string;
  /** What feeds the run: kind ('serial', 'replay', 'simulator'...) and path or name. */
  source: { kind: string; name: string };
  /** Bench and tracker settings in force, stored in the header as given (must be JSON-safe). */
  config: unknown;
  /** Wall-clock time of run time 0. */
  startUtc: Date;
  /** File name inside `dir`; default `<yyyymmdd>-<hhmmss>-<name>.session.jsonl` (UTC). */
  fileName: string | null;
  /** Program that writes the file, stored in the header. */
  writer: string;
}

export function resolveRecorderOptions(o: Partial<RecorderOptions> = {}): RecorderOptions {
  return {
    dir: o.dir ?? 'sessions',
    name: o.name ?? 'run',
    source: o.source ?? { kind: 'other', name: '' },
    config: o.config ?? {},
    startUtc: o.startUtc ?? new Date(),
    fileName: o.fileName ?? null,
    writer: o.writer ?? 'echotrail 0.1.0',
  };
}

export interface RecorderStatus {
  /** File name being recorded, null when not recording. */
  recording: string | null;
  /** Full path of the file, once opened. */
  path: string | null;
  /** Why recording stopped, or null. */
  error: string | null;
  /** Lines written, header included. */
  lines: number;
  bytes: number;
  /** Records not written because recording had failed. */
  dropped: number;
}

/** `20261202-013000-name.session.jsonl`: sorts by start time, safe on every file system. */
export function defaultSessionFileName(startUtc: Date, name: string): string {
  const iso = startUtc.toISOString(); // 2026-12-02T01:30:00.000Z
  const stamp = `${iso.slice(0, 10).replaceAll('-', '')}-${iso.slice(11, 19).replaceAll(':', '')}`;
  const safe = name.replace(/[^A-Za-z0-9._-]+/g, '_').slice(0, 60) || 'run';
  return `${stamp}-${safe}${SESSION_SUFFIX}`;
}

function describe(err: unknown, dir: string): string {
  const code = (err as NodeJS.ErrnoException)?.code;
  if (code === 'ENOSPC') return `recording stopped: disk full in '${dir}'; free space and start a new run`;
  if (code === 'EACCES' || code === 'EPERM' || code === 'EROFS')
    return `cannot write session files in '${dir}' (${code}); fix its permissions or choose another sessions folder`;
  if (code === 'ENOTDIR') return `'${dir}' is not a folder; choose another sessions folder`;
  return `recording failed in '${dir}': ${err instanceof Error ? err.message : String(err)}`;
}

/**
 * Creates a recorder and opens its file; throws EchotrailError('E_RECORDING') with the reason when
 * the file cannot be created (the caller then runs without recording). Later write failures do not
 * throw: see status().error and the 'error' event.
 */
export function startRecording(options: Partial<RecorderOptions> = {}): Recorder {
  const r = new Recorder(options);
  if (!r.open()) throw new EchotrailError('E_RECORDING', r.status().error ?? 'recording could not start');
  return r;
}

export class Recorder extends EventEmitter {
  readonly options: RecorderOptions;
  private fd: number | null = null;
  private file: string | null = null;
  private fullPath: string | null = null;
  private error: string | null = null;
  private lines = 0;
  private bytes = 0;
  private dropped = 0;
  private lastTimeS = 0;
  private detections = 0;
  private trackIds = new Set<number>();
  private hasCommanded = false;

  constructor(options: Partial<RecorderOptions> = {}) {
    super();
    this.options = resolveRecorderOptions(options);
  }

  /** Creates the file and writes the header. False (and status().error set) when that fails. */
  open(): boolean {
    if (this.fd !== null || this.error) return this.fd !== null;
    const o = this.options;
    try {
      mkdirSync(o.dir, { recursive: true });
      const base = o.fileName ?? defaultSessionFileName(o.startUtc, o.name);
      // 'wx' never overwrites an earlier run started in the same second: number the new one.
      for (let n = 1; this.fd === null; n++) {
        const candidate = n === 1 ? base : base.replace(SESSION_SUFFIX, `-${n}${SESSION_SUFFIX}`);
        try {
          this.fd = openSync(join(o.dir, candidate), 'wx');
          this.file = candidate;
        } catch (err) {
          if ((err as NodeJS.ErrnoException).code !== 'EEXIST' || n > 999) throw err;
        }
      }
      this.fullPath = join(o.dir, this.file!);
      const header: SessionHeader = {
        format: SESSION_FORMAT, version: SESSION_VERSION, name: o.name, startUtc: o.startUtc.toISOString(),
        source: o.source, units: { ...SESSION_UNITS }, records: { ...RECORD_KINDS }, config: o.config, writer: o.writer,
      };
      this.writeLine(JSON.stringify(header));
      return this.fd !== null;
    } catch (err) {
      this.fail(err);
      return false;
    }
  }

  /** Appends one record. `timeS` is needed only for kinds without a time (fixed echoes, commanded path). */
  record(rec: SourceRecord | StoredRecord, timeS?: number): void {
    if (this.fd === null) {
      this.dropped++;
      return;
    }
    const t = recordTime(rec) ?? timeS ?? this.lastTimeS;
    if (t > this.lastTimeS) this.lastTimeS = t;
    if (rec.kind === 'detection') this.detections++;
    else if (rec.kind === 'track') this.trackIds.add(rec.update.id);
    // Positioner samples carry the command too (cmdX, cmdY): compare and the live view use them.
    else if (rec.kind === 'commanded' || rec.kind === 'positioner') this.hasCommanded = true;
    this.writeLine(JSON.stringify(toLine(rec, t)));
  }

  /** Appends a note (operator remark, configuration change...). */
  note(text: string, timeS?: number): void {
    this.record({ kind: 'note', text }, timeS);
  }

  /** Writes the `end` summary line and closes the file. Safe to call twice. Never rejects. */
  async close(): Promise<void> {
    this.closeSync();
  }

  /** close() for exit handlers, where nothing asynchronous runs any more. */
  closeSync(): void {
    if (this.fd === null) return;
    const summary = { detections: this.detections, tracks: this.trackIds.size, lines: this.lines + 1, hasCommanded: this.hasCommanded };
    this.writeLine(JSON.stringify({ k: 'end', timeS: this.lastTimeS, summary }));
    if (this.fd !== null) {
      try { closeSync(this.fd); } catch { /* nothing left to save */ }
      this.fd = null;
    }
    this.file = null;
  }

  /** File name being recorded ('' when not recording): the pipeline's RecorderLike.name. */
  get name(): string {
    return this.file ?? '';
  }

  /** record() under the name the pipeline's RecorderLike uses. */
  write(rec: SourceRecord): void {
    this.record(rec);
  }

  status(): RecorderStatus {
    return { recording: this.file, path: this.fullPath, error: this.error, lines: this.lines, bytes: this.bytes, dropped: this.dropped };
  }

  private writeLine(text: string): void {
    const buf = Buffer.from(text + '\n', 'utf8');
    try {
      // writeSync may write less than asked (rare on files); loop so a line is never half-written by us.
      for (let off = 0; off < buf.length; ) off += writeSync(this.fd!, buf, off, buf.length - off);
      this.lines++;
      this.bytes += buf.length;
    } catch (err) {
      this.fail(err);
    }
  }

  private fail(err: unknown): void {
    this.error = describe(err, this.options.dir);
    if (this.fd !== null) {
      try { closeSync(this.fd); } catch { /* already failing */ }
      this.fd = null;
    }
    this.file = null;
    const e = new EchotrailError('E_RECORDING', this.error, { cause: err });
    if (this.listenerCount('error') > 0) this.emit('error', e);
  }
}
