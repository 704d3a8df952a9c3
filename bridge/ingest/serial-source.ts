/**
 * Live input from the acquisition hardware over a serial port, in the line protocol of
 * line-protocol.ts. Bad lines are counted and reported with their numbers, never fatal.
 *
 * When the device goes away (USB unplugged, socat killed: the port closes with
 * `err.disconnected`, and the device path vanishes) the source reports 'waiting' and tries to
 * reopen the path with a doubling, capped delay until the device is back: no restart needed.
 * While live it also checks now and then that the device path still exists: a driver that
 * reports the loss only as a read error, or not at all, must not leave the source showing 'live'
 * with nothing coming in.
 *
 * Line times are checked by clock-guard.ts: one old line is refused as a bad line ("time went
 * back"), and only several consecutive earlier lines pass on as a restart of the hardware's clock
 * (which the pipeline then records as a new run).
 */
import { EventEmitter } from 'node:events';
import { existsSync } from 'node:fs';
import { SerialPort } from 'serialport';
import type { BadLine, Source, SourceRecord, SourceState } from './source.ts';
import { ClockGuard, type Timed } from './clock-guard.ts';
import { recordTime } from '../session/record-time.ts';
import { parseLine } from './line-protocol.ts';
import { LineSplitter } from './line-splitter.ts';
import { resolveSerialOptions, type SerialSourceOptions } from './serial-options.ts';

export { resolveSerialOptions, type SerialSourceOptions };

/** Counters a status display needs. */
export interface SerialCounters {
  /** Lines received since start(). */
  lines: number;
  /** Lines refused since start(). */
  badLines: number;
  /** The most recent refused line. */
  lastBad: BadLine | null;
  /** Times the device was (re)opened. */
  opens: number;
}

/** A parsed line on its way through the clock guard. */
interface GuardedLine {
  record: SourceRecord;
  line: number;
  text: string;
  receivedAtMs: number;
}

/** Distinct port errors reported per state before the rest are only counted. */
const MAX_ERROR_NOTES = 3;

export class SerialSource extends EventEmitter implements Source {
  readonly kind = 'serial' as const;
  readonly carriesTracks = false;
  readonly name: string;
  readonly options: SerialSourceOptions;
  private port: SerialPort | null = null;
  private splitter: LineSplitter;
  private stopped = true;
  private current: SourceState = 'disconnected';
  private retryTimer: NodeJS.Timeout | null = null;
  private presenceTimer: NodeJS.Timeout | null = null;
  private backoffMs: number;
  private readonly counters: SerialCounters = { lines: 0, badLines: 0, lastBad: null, opens: 0 };
  /** Port errors reported in the current state, and those held back (repeats, or over the cap). */
  private errors = { reported: new Set<string>(), held: 0 };
  /** Kept across reopens: a device reset while unplugged still has to prove its new clock. */
  private readonly clock = new ClockGuard<GuardedLine>();

  constructor(options: Partial<SerialSourceOptions> & { path: string }) {
    super();
    this.options = resolveSerialOptions(options);
    this.name = this.options.path;
    this.splitter = new LineSplitter(this.options.maxLineBytes);
    this.backoffMs = this.options.reopenInitialMs;
  }

  /** Opens the port. Resolves even when the device is absent: the source then waits for it. */
  async start(): Promise<void> {
    if (!this.stopped) return;
    this.stopped = false;
    await this.tryOpen();
  }

  async close(): Promise<void> {
    this.stopped = true;
    if (this.retryTimer) clearTimeout(this.retryTimer);
    this.retryTimer = null;
    this.stopPresenceCheck();
    const port = this.port;
    this.port = null;
    if (port?.isOpen) await new Promise<void>((res) => port.close(() => res()));
    this.setState('disconnected');
  }

  /** Current state: live, waiting (device absent, retrying) or disconnected (closed). */
  get state(): SourceState {
    return this.current;
  }

  stats(): SerialCounters {
    return { ...this.counters };
  }

  private setState(s: SourceState, detail?: string): void {
    if (s === this.current) return;
    this.current = s;
    const held = this.errors.held;
    this.errors = { reported: new Set(), held: 0 };
    const note = held ? `${held} more serial error(s) not shown` : '';
    this.emit('state', s, detail && note ? `${detail}; ${note}` : detail || note || undefined);
  }

  /**
   * A flapping adapter can raise the same error many times a second without the state changing:
   * each distinct message is reported once per state (at most MAX_ERROR_NOTES of them), the rest
   * are counted and mentioned with the next state change.
   */
  private onPortError(err: Error): void {
    const e = this.errors;
    if (e.reported.has(err.message) || e.reported.size >= MAX_ERROR_NOTES) {
      e.held++;
      return;
    }
    e.reported.add(err.message);
    this.emit('state', this.current, `serial error: ${err.message}`);
  }

  private tryOpen(): Promise<void> {
    const o = this.options;
    const port = new SerialPort({ path: o.path, baudRate: o.baudRate, dataBits: o.dataBits, parity: o.parity, stopBits: o.stopBits, autoOpen: false });
    // Listen before opening: an 'error' without a listener would crash the bridge.
    port.on('error', (err: Error) => this.onPortError(err));
    return new Promise((resolve) => {
      port.open((err) => {
        if (this.stopped) {
          if (!err) port.close();
          return resolve();
        }
        if (err) {
          this.setState('waiting', `cannot open ${o.path}: ${err.message}; retrying`);
          this.scheduleReopen();
          return resolve();
        }
        this.port = port;
        this.counters.opens++;
        this.backoffMs = o.reopenInitialMs;
        port.on('data', (chunk: Buffer) => this.onData(chunk, performance.now()));
        port.on('close', (closeErr?: Error & { disconnected?: boolean }) => this.onClose(port, closeErr));
        this.startPresenceCheck(port);
        this.setState('live', `opened ${o.path} at ${o.baudRate} baud`);
        resolve();
      });
    });
  }

  private startPresenceCheck(port: SerialPort): void {
    const every = this.options.presenceCheckMs;
    // Only a path the file system knows can be watched (not a Windows COM port name).
    if (!(every > 0) || !existsSync(this.options.path)) return;
    this.stopPresenceCheck();
    this.presenceTimer = setInterval(() => {
      if (this.port !== port || existsSync(this.options.path)) return;
      // The path is gone but no 'close' came: handle it as one, then let the port go (its own
      // 'close', if it ever comes, finds this.port changed and is ignored).
      this.onClose(port, Object.assign(new Error('device path vanished'), { disconnected: true }));
      if (port.isOpen) port.close(() => undefined);
    }, every);
    // A status check must not keep the process alive on its own.
    this.presenceTimer.unref();
  }

  private stopPresenceCheck(): void {
    if (this.presenceTimer) clearInterval(this.presenceTimer);
    this.presenceTimer = null;
  }

  private onClose(port: SerialPort, err?: Error & { disconnected?: boolean }): void {
    if (this.port !== port) return;
    this.port = null;
    this.stopPresenceCheck();
    this.refuseStale(this.clock.drain(), this.clock.latestS);
    const cut = this.splitter.reset();
    if (cut) {
      this.counters.lines = cut.line;
      this.refuse({ line: cut.line, reason: `line cut off after ${cut.bytes} bytes when the port closed`, text: '' });
    }
    if (this.stopped) return;
    const why = err?.disconnected ? 'device disconnected' : `port closed${err ? `: ${err.message}` : ''}`;
    this.setState('waiting', `${why}; waiting for ${this.options.path} to return`);
    this.scheduleReopen();
  }

  private scheduleReopen(): void {
    if (this.stopped || this.retryTimer) return;
    const wait = this.backoffMs;
    this.backoffMs = Math.min(this.backoffMs * 2, this.options.reopenMaxMs);
    this.retryTimer = setTimeout(() => {
      this.retryTimer = null;
      if (!this.stopped) void this.tryOpen();
    }, wait);
  }

  private onData(chunk: Buffer, receivedAtMs: number): void {
    for (const l of this.splitter.push(chunk)) {
      this.counters.lines = l.line;
      if (l.oversized !== undefined) {
        this.refuse({ line: l.line, reason: `no newline within ${this.options.maxLineBytes} bytes; line dropped`, text: l.text });
        continue;
      }
      if (l.text === '' || l.text === '\r') continue; // blank lines separate bursts; not an error
      const r = parseLine(l.text, l.line);
      if (r.ok) this.pass({ record: r.record, line: l.line, text: l.text, receivedAtMs });
      else this.refuse(r.bad);
    }
  }

  /** Passes a good line through the clock guard: on, held, or refused as out of order. */
  private pass(g: GuardedLine): void {
    const step = this.clock.push(g, recordTime(g.record));
    this.refuseStale(step.refused, step.refusedFromS);
    for (const a of step.accepted) this.emit('record', a.record, a.receivedAtMs);
  }

  private refuseStale(lines: Timed<GuardedLine>[], fromS: number): void {
    for (const { item, timeS } of lines) {
      this.refuse({ line: item.line, reason: `time went back from ${fromS.toFixed(3)} s to ${timeS.toFixed(3)} s`, text: item.text.slice(0, 200) });
    }
  }

  private refuse(bad: BadLine): void {
    this.counters.badLines++;
    this.counters.lastBad = bad;
    this.emit('bad', bad);
  }
}
