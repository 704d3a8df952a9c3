/**
 * source → tracker (when the source carries no tracks) → recorder → fan-out.
 *
 * The pipeline owns the bounded live state used for snapshots and turns source events into
 * protocol messages. It emits:
 * - 'scan' (scan: ScanMessage): a paced, merged increment for every client;
 * - 'message' (msg: ServerMessage): other increments (source, replay, fixed-echoes, commanded, ...);
 * - 'resync' (): the state was rebuilt (replay seek, new source); every client needs a fresh snapshot;
 * - 'source-state' (state: SourceState): the source changed state (the playlist listens for 'ended').
 */
import { EventEmitter } from 'node:events';
import type { BadLine, Source, SourceRecord, SourceState } from '../ingest/source.ts';
import type { FixedEcho, PositionerSample, TrackEngine, TrackerOutput } from '../types.ts';
import type { ReplayState, ServerMessage, SourceStatus } from './protocol.ts';
import { PROTOCOL_VERSION } from './protocol.ts';
import { isReplayControl, type LiveComparisonLike, type ReplaySourceLike } from './deps.ts';
import { RecordingSlot, type OpenRecorder } from './recording.ts';
import { SeekGate } from './seek-gate.ts';
import { LiveState } from './state.ts';
import { SourceStats } from './source-stats.ts';
import { ScanBatch, type ScanMessage } from './scan-batch.ts';
import { rebuildAfterSeek, rebuildComparison } from './rebuild.ts';
import { recordTime as recordTimeOf } from '../session/record-time.ts';
import { CLOCK_BACK_S } from '../ingest/clock-guard.ts';

export type SnapshotMessage = Extract<ServerMessage, { type: 'snapshot' }>;

/** What the pipeline is built from; the bridge fills these from its options. */
export interface PipelineOptions {
  /** Builds a fresh tracking engine (also after a seek in a CSV replay). */
  createTracker: () => TrackEngine | Promise<TrackEngine>;
  /** Opens a recorder for a live source; null when the run is not recorded. */
  createRecorder: OpenRecorder | null;
  /** Builds a live comparison, or null when none is available. */
  createComparison: (() => LiveComparisonLike) | null;
  /** Caps of the live state. */
  state: ConstructorParameters<typeof LiveState>[0];
  /** Most scans per second. */
  scanRateHz: number;
  /** Where problems the user should see in the log go. */
  log: (line: string) => void;
  /**
   * Maps live positioner samples from the positioner's frame into the radar frame (bench
   * calibration), or null when the frames coincide. Applied to serial input only, before
   * recording: sessions then hold radar-frame samples and replays need no mapping.
   */
  positionerToRadar: ((s: PositionerSample) => PositionerSample) | null;
}

/** How often source status, replay state, fixed echoes and comparison figures are refreshed, ms. */
const STATUS_MS = 1000;
const REPLAY_MS = 250;
/**
 * A live record this much older than the run's latest time means the hardware's clock restarted,
 * s. The serial source passes such a record on only once several lines in a row confirmed the
 * restart (ingest/clock-guard.ts); a single stale line is refused there as a bad line.
 */
const CLOCK_RESET_S = CLOCK_BACK_S;

export class Pipeline extends EventEmitter {
  readonly state: LiveState;
  readonly stats = new SourceStats();
  private source: Source | null = null;
  private tracker: TrackEngine | null = null;
  private readonly recording: RecordingSlot;
  private readonly seek = new SeekGate();
  private comparison: LiveComparisonLike | null;
  /** True from a session seek until its comparison is rebuilt: the figures meanwhile cover only the re-sent window. */
  private comparisonStale = false;
  /** Run time of the last running-RMSE point sent, per path (a snapshot carries all before it). */
  private readonly comparisonSentS = new Map<string, number>();
  private readonly batch: ScanBatch;
  private readonly timers: NodeJS.Timeout[] = [];
  private lastReplayJson = '';
  private fixedSignature = '';
  private sourceListeners: [string, (...a: never[]) => void][] = [];
  trackerErrors = 0;
  /** Records whose handling threw (logged for the first few): never fatal. */
  recordErrors = 0;

  constructor(private readonly options: PipelineOptions) {
    super();
    this.state = new LiveState(options.state);
    this.comparison = options.createComparison ? options.createComparison() : null;
    this.recording = new RecordingSlot(options.createRecorder, this.stats, options.log, (message) => {
      this.emitMessage({ type: 'error', code: 'E_RECORDING', message });
      this.emitMessage({ type: 'source', source: this.stats.status() });
    });
    this.batch = new ScanBatch({
      rateHz: options.scanRateHz,
      maxDetections: 5000,
      emit: (scan, arrivals) => this.sendScan(scan, arrivals),
    });
    this.timers.push(setInterval(() => this.tickStatus(), STATUS_MS), setInterval(() => this.tickReplay(), REPLAY_MS));
  }

  get current(): Source | null {
    return this.source;
  }

  get replay(): ReplaySourceLike | null {
    return this.source && isReplayControl(this.source) ? this.source : null;
  }

  /** Source switches run one at a time: two dashboards opening sessions at once must not leave two attached. */
  private switching: Promise<void> = Promise.resolve();

  /** Replaces the input: the old source is closed, the state starts again, clients get a snapshot. */
  setSource(source: Source): Promise<void> {
    const run = this.switching.then(() => this.switchTo(source));
    this.switching = run.catch(() => undefined);
    return run;
  }

  private async switchTo(source: Source): Promise<void> {
    // Built first: bad tracker options leave the current source running.
    let tracker: TrackEngine | null;
    try {
      tracker = source.carriesTracks ? null : await this.options.createTracker();
    } catch (err) {
      await source.close().catch(() => undefined);
      throw err;
    }
    this.seek.begin(false, false);
    await this.detach();
    this.batch.discard();
    this.batch.release();
    this.state.reset();
    this.state.clearCommanded();
    this.comparison?.restart();
    this.comparisonSentS.clear();
    this.fixedSignature = '';
    this.stats.reset(source.kind, source.name);
    this.tracker = tracker;
    this.source = source;
    this.on2(source, 'record', (r: SourceRecord, at: number) => this.onRecord(r, at));
    this.on2(source, 'bad', (b: BadLine) => this.onBad(b));
    this.on2(source, 'state', (s: SourceState, detail?: string) => this.onState(s, detail));
    this.on2(source, 'seeked', (t: number) => this.onSeeked(t));
    this.on2(source, 'error', (e: Error) => this.options.log(`source ${source.name}: ${e.message}`));
    await this.recording.start(source);
    this.emit('resync');
    try {
      await source.start();
    } catch (err) {
      // An unreadable session must not leave a half-open source behind: back to no source.
      await this.detach();
      this.tracker = null;
      this.stats.reset('none', '');
      this.emit('resync');
      throw err;
    }
    this.emitMessage({ type: 'source', source: this.stats.status() });
  }

  private on2(src: Source, ev: string, fn: (...a: never[]) => void): void {
    src.on(ev, fn as (...a: unknown[]) => void);
    this.sourceListeners.push([ev, fn]);
  }

  private async detach(): Promise<void> {
    const old = this.source;
    this.source = null;
    if (old) {
      for (const [ev, fn] of this.sourceListeners) old.off(ev, fn as (...a: unknown[]) => void);
      // Keep listening for errors: a late 'error' with no listener would crash the process.
      old.on('error', () => undefined);
      await old.close().catch((e: Error) => this.options.log(`closing ${old.name}: ${e.message}`));
    }
    this.sourceListeners = [];
    await this.recording.close();
  }

  /**
   * Runs inside the serial port's 'data' callback and the replay timer: a throw here would take
   * the whole bridge (and a live recording) down, so one bad record is counted and logged instead.
   */
  private onRecord(r: SourceRecord, receivedAtMs: number): void {
    try {
      this.handleRecord(r, receivedAtMs);
    } catch (err) {
      if (this.recordErrors++ < 5) this.options.log(`record at ${recordTimeOf(r) ?? '?'} s refused: ${(err as Error).message}`);
    }
  }

  private handleRecord(r: SourceRecord, receivedAtMs: number): void {
    if (this.seek.intercept(r, receivedAtMs)) return;
    if (this.source?.kind === 'serial') {
      if (this.clockWentBack(r)) this.newLiveRun();
      if (r.kind === 'positioner' && this.options.positionerToRadar) r = { kind: 'positioner', sample: this.options.positionerToRadar(r.sample) };
    }
    // A replay's re-sent state after a seek is not new: neither record nor stream it twice.
    if (!this.seek.resending) this.recording.write(r);
    switch (r.kind) {
      case 'detection': {
        // A seek's re-sent state is not new data: it must not show as a burst of detections per second.
        if (!this.seek.resending) this.stats.detection(receivedAtMs);
        this.batch.detection(this.state.addDetection(r.detection), receivedAtMs);
        if (this.tracker) this.applyOutput(this.runTracker((t) => t.push(r.detection)), receivedAtMs);
        break;
      }
      case 'antenna':
        this.state.antennaAzimuthRad = r.sample.azimuthRad;
        this.batch.antennaAzimuth(r.sample.azimuthRad);
        this.batch.time(r.sample.timeS);
        break;
      case 'positioner':
        this.state.addPositioner(r.sample);
        this.comparison?.positioner(r.sample);
        this.batch.positionerSample(r.sample);
        break;
      case 'track':
        this.applyOutput({ updates: [r.update], deletions: [] }, receivedAtMs, false);
        break;
      case 'deletion':
        this.applyOutput({ updates: [], deletions: [r.deletion] }, receivedAtMs, false);
        break;
      case 'fixed-echoes':
        this.setFixedEchoes(r.echoes);
        break;
      case 'commanded': {
        const path = this.state.setCommanded(r.path, r.target);
        this.comparison?.commanded(r.path, r.target);
        this.emitMessage(r.target === undefined ? { type: 'commanded', path } : { type: 'commanded', path, target: r.target });
        break;
      }
    }
    this.batch.schedule();
  }

  /**
   * True when a live record's time lies well before what the run has seen: the hardware restarted
   * its clock (power cycle, firmware reset). Its records would otherwise be out of order for the
   * tracker and the recording.
   */
  private clockWentBack(r: SourceRecord): boolean {
    const t = r.kind === 'detection' ? r.detection.timeS : r.kind === 'antenna' || r.kind === 'positioner' ? r.sample.timeS : null;
    return t !== null && this.state.timeS - t > CLOCK_RESET_S;
  }

  /** A new run on the same port: fresh tracker, state and recording file; clients get a snapshot. */
  private newLiveRun(): void {
    const source = this.source as Source;
    this.options.log(`source ${source.name}: time went back from ${this.state.timeS.toFixed(3)} s; starting a new run`);
    if (this.tracker) this.applyOutput(this.runTracker((t) => t.flush()), undefined);
    this.batch.flush();
    // The hardware's clock restarted: the scans' time starts again with it.
    this.batch.discard();
    this.state.reset();
    this.state.clearCommanded();
    this.comparison?.restart();
    this.comparisonSentS.clear();
    this.fixedSignature = '';
    const tracker = this.options.createTracker();
    // Records are handled synchronously, so the tracker must be ready now: factories are synchronous in practice.
    if (tracker instanceof Promise) throw new Error('tracker factory must be synchronous for live runs');
    this.tracker = tracker;
    this.recording.rotate(source);
    this.emit('resync');
    this.emitMessage({ type: 'source', source: this.stats.status() });
  }

  private runTracker(fn: (t: TrackEngine) => TrackerOutput): TrackerOutput {
    try {
      return fn(this.tracker as TrackEngine);
    } catch (err) {
      // One bad detection must not stop the stream; report the first few.
      if (this.trackerErrors++ < 5) this.options.log(`tracker: ${(err as Error).message}`);
      return { updates: [], deletions: [] };
    }
  }

  private applyOutput(out: TrackerOutput, receivedAtMs: number | undefined, recordIt = true): void {
    for (const u of out.updates) {
      if (recordIt) this.recording.write({ kind: 'track', update: u });
      this.comparison?.update(u);
      this.batch.update(this.state.addUpdate(u), receivedAtMs);
    }
    for (const d of out.deletions) {
      if (recordIt) this.recording.write({ kind: 'deletion', deletion: d });
      this.comparison?.deletion(d);
      this.state.addDeletion(d);
      this.batch.deletion(d);
    }
  }

  private setFixedEchoes(echoes: FixedEcho[]): void {
    const sig = `${echoes.length}:${echoes.reduce((s, e) => s + e.seen + e.x * 7 + e.y * 13, 0)}`;
    if (sig === this.fixedSignature) return;
    this.fixedSignature = sig;
    this.state.fixedEchoes = echoes;
    this.emitMessage({ type: 'fixed-echoes', echoes });
  }

  private onBad(b: BadLine): void {
    this.stats.bad(b);
    this.scheduleStatus();
  }

  private onState(s: SourceState, detail?: string): void {
    this.stats.state = s;
    this.emit('source-state', s);
    if (detail) this.options.log(`source ${this.source?.name ?? ''}: ${s} (${detail})`);
    // A pause in the stream: let the tracker finish what it buffered.
    const flowing = s === 'live' || s === 'playing';
    if (this.tracker && !flowing) this.applyOutput(this.runTracker((t) => t.flush()), undefined);
    // Stopped (paused, ended, waiting): what is pending goes out now, before the state says so;
    // scheduled for the next slot, it arrived after "paused" and the picture moved on a scan.
    if (flowing) this.batch.schedule();
    else this.batch.flush();
    this.emitMessage({ type: 'source', source: this.stats.status() });
    this.tickReplay(true);
  }

  private statusTimer: NodeJS.Timeout | null = null;
  /** Bad lines can come in floods; one status message per 250 ms is plenty. */
  private scheduleStatus(): void {
    if (this.statusTimer) return;
    this.statusTimer = setTimeout(() => {
      this.statusTimer = null;
      this.emitMessage({ type: 'source', source: this.stats.status() });
    }, 250);
  }

  /** A replay jumped: rebuild the state at the new time (seek-gate.ts), then one fresh snapshot for all. */
  private onSeeked(timeS: number): void {
    const retrack = this.tracker !== null;
    const epoch = this.seek.begin(retrack, true);
    this.batch.discard();
    this.batch.hold();
    this.state.reset();
    this.comparison?.reset();
    this.comparisonStale = !retrack && this.comparison !== null;
    this.fixedSignature = '';
    setImmediate(() => this.finishSeek(epoch, timeS, retrack).catch((err: unknown) => this.options.log(`seek to ${timeS} s: ${(err as Error).message}`)));
  }

  private async finishSeek(epoch: number, timeS: number, retrack: boolean): Promise<void> {
    if (!this.seek.isCurrent(epoch)) return;
    this.seek.resending = false;
    const src = this.source;
    if (retrack && src && isReplayControl(src)) {
      try {
        this.tracker = await this.options.createTracker();
        await rebuildAfterSeek(src, this.tracker, this.state, timeS, () => !this.seek.isCurrent(epoch), this.comparison);
      } catch (err) {
        // The replay goes on from the new position; only the picture before it is missing.
        this.options.log(`rebuilding state after seek to ${timeS} s: ${(err as Error).message}`);
      }
      if (!this.seek.isCurrent(epoch)) return;
      for (const [r, at] of this.seek.drain()) this.onRecord(r, at);
    } else if (src && isReplayControl(src) && this.options.createComparison && typeof src.recordsUntil === 'function') {
      // A session: its re-sent state (handled by now) rebuilt the picture but holds only the last
      // window of track history, so the comparison is built again from the start of the run,
      // while what the replay plays meanwhile waits in the queue (in time order after it).
      this.seek.queueFromNow();
      const fresh = this.options.createComparison();
      try {
        if (await rebuildComparison(src, fresh, this.state, timeS, () => !this.seek.isCurrent(epoch))) this.comparison = fresh;
      } catch (err) {
        this.options.log(`rebuilding the comparison after seek to ${timeS} s: ${(err as Error).message}`);
      }
      if (!this.seek.isCurrent(epoch)) return;
      for (const [r, at] of this.seek.drain()) this.onRecord(r, at);
    }
    this.comparisonStale = false;
    this.markComparisonSent();
    this.state.timeS = Math.max(this.state.timeS, timeS);
    this.batch.discard();
    this.batch.release();
    this.emit('resync');
    this.tickReplay(true);
  }

  /**
   * Every client is about to get a snapshot with the whole running-RMSE history (a resync): the
   * next `comparison` messages go on from its end. (A snapshot for one joining client does not
   * move this: the others still need the points since the last message; clients drop points they
   * already hold.)
   */
  private markComparisonSent(): void {
    this.comparisonSentS.clear();
    for (const h of this.comparison?.history() ?? []) this.comparisonSentS.set(h.pathId, h.points[h.points.length - 2]);
  }

  private sendScan(scan: ScanMessage, arrivals: number[]): void {
    this.emit('scan', scan);
    const sent = performance.now();
    for (const a of arrivals) this.stats.latency(a, sent);
  }

  private emitMessage(msg: ServerMessage): void {
    this.emit('message', msg);
  }

  private tickStatus(): void {
    if (this.tracker) this.setFixedEchoes(this.tracker.fixedEchoes());
    this.emitMessage({ type: 'source', source: this.stats.status() });
    if (this.comparisonStale || !this.comparison) return;
    for (const figures of this.comparison.figures()) {
      // The chart's points since the last message of this path (a fast replay moves seconds between two).
      const pathId = figures.pathId ?? '';
      const recent = this.comparison.historyAfter(pathId, this.comparisonSentS.get(pathId) ?? -Infinity);
      if (recent.length) this.comparisonSentS.set(pathId, recent[recent.length - 2]);
      this.emitMessage({ type: 'comparison', figures, ...(recent.length ? { recent } : {}) });
    }
  }

  /** Sends the replay state when it changed (or always, after a control). */
  tickReplay(force = false): void {
    const r = this.replayState();
    if (!r) return;
    const json = JSON.stringify(r);
    if (!force && json === this.lastReplayJson) return;
    this.lastReplayJson = json;
    this.emitMessage({ type: 'replay', replay: r });
  }

  /** Set by the bridge when it plays a list of sessions: their place in it goes with the replay state. */
  playlistInfo: (() => ReplayState['playlist'] | null) | null = null;

  replayState(): ReplayState | null {
    const r = this.replay?.state();
    if (!r) return null;
    const list = this.playlistInfo?.();
    return list ? { ...r, playlist: list } : r;
  }

  status(): SourceStatus {
    return this.stats.status();
  }

  hello(): ServerMessage {
    return { type: 'hello', protocol: PROTOCOL_VERSION, server: 'echotrail-bridge' };
  }

  /**
   * The state as a client starting now needs it. Detections waiting in the scan batch are left
   * out: the next scan brings them to every client, this one included. (Updates need no such
   * care: clients skip an update not newer than the track's last point.)
   */
  snapshot(): SnapshotMessage {
    const s = this.state;
    const pending = this.batch.pendingDetections();
    const paths = s.commandedPaths;
    // A comparison still being rebuilt after a seek has only the re-sent window: none yet.
    const history = this.comparison && !this.comparisonStale ? this.comparison.history() : [];
    return {
      type: 'snapshot',
      seq: this.batch.nextSeq,
      timeS: s.timeS,
      source: this.stats.status(),
      tracks: s.tracks(),
      history: s.history(),
      detections: pending.size ? s.recentDetections().filter((d) => !pending.has(d)) : s.recentDetections(),
      fixedEchoes: s.fixedEchoes,
      commanded: s.commanded,
      // Several paths, or one named after its positioner: the client needs the names.
      ...(paths.length > 1 || (paths.length === 1 && paths[0].target !== '') ? { commandedPaths: paths } : {}),
      ...(s.commandedFrom ? { commandedFrom: s.commandedFrom } : {}),
      ...(history.length ? { comparisonHistory: history } : {}),
      replay: this.replayState(),
    };
  }

  async close(): Promise<void> {
    this.seek.begin(false, false);
    for (const t of this.timers) clearInterval(t);
    if (this.statusTimer) clearTimeout(this.statusTimer);
    this.batch.close();
    await this.detach();
  }
}
