/**
 * source → tracker (when the source carries no tracks) → recorder → fan-out.
 *
 * The pipeline owns the bounded live state used for snapshots and turns source events into
 * protocol messages. It emits:
 * - 'scan' (scan: ScanMessage): a paced, merged increment for every client;
 * - 'message' (msg: ServerMessage): other increments (source, replay, fixed-echoes, commanded, ...);
 * - 'resync' (): the state was rebuilt (replay seek, new source); every client needs a fresh snapshot;
 * - 'source-state' (state: SourceState): the source changed state (the playlist listens for 'ended').
 *
 * It routes each record and composes the rest: the input and its switches (source-slot.ts), a
 * replay seek (replay-seek.ts), a live clock restart (live-restart.ts), the messages besides scans
 * and their timers (status-ticker.ts), the comparison's bookkeeping (comparison-feed.ts) and what
 * a joining client gets (snapshot.ts).
 */
import { EventEmitter } from 'node:events';
import type { BadLine, Source, SourceRecord, SourceState } from '../ingest/source.ts';
import type { PositionerSample, TrackEngine, TrackerOutput } from '../types.ts';
import type { ReplayState, ServerMessage, SourceStatus } from './protocol.ts';
import { isReplayControl, type LiveComparisonLike, type ReplaySourceLike } from './deps.ts';
import { RecordingSlot, type OpenRecorder } from './recording.ts';
import { LiveState } from './state.ts';
import { SourceStats } from './source-stats.ts';
import { ScanBatch, type ScanMessage } from './scan-batch.ts';
import { recordTime as recordTimeOf } from '../session/record-time.ts';
import { ComparisonFeed } from './comparison-feed.ts';
import { StatusTicker } from './status-ticker.ts';
import { SourceSlot } from './source-slot.ts';
import { ReplaySeek } from './replay-seek.ts';
import { LiveRestart } from './live-restart.ts';
import { buildSnapshot, helloMessage, type SnapshotMessage } from './snapshot.ts';

export type { SnapshotMessage } from './snapshot.ts';

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

export class Pipeline extends EventEmitter {
  readonly state: LiveState;
  readonly stats = new SourceStats();
  private tracker: TrackEngine | null = null;
  private readonly slot: SourceSlot;
  private readonly recording: RecordingSlot;
  private readonly comparison: ComparisonFeed;
  private readonly batch: ScanBatch;
  private readonly ticker: StatusTicker;
  private readonly seek: ReplaySeek;
  private readonly restart: LiveRestart;
  trackerErrors = 0;
  /** Records whose handling threw (logged for the first few): never fatal. */
  recordErrors = 0;
  /** Set by the bridge when it plays a list of sessions: their place in it goes with the replay state. */
  playlistInfo: (() => ReplayState['playlist'] | null) | null = null;

  constructor(private readonly options: PipelineOptions) {
    super();
    const { log, createTracker, createComparison } = options;
    this.state = new LiveState(options.state);
    this.slot = new SourceSlot(log);
    this.comparison = new ComparisonFeed(createComparison ? createComparison() : null);
    this.ticker = new StatusTicker({
      emit: (msg) => this.emitMessage(msg),
      status: () => this.stats.status(),
      replayState: () => this.replayState(),
      trackerFixedEchoes: () => (this.tracker ? this.tracker.fixedEchoes() : null),
      comparisonMessages: () => this.comparison.messages(),
      state: this.state,
    });
    this.recording = new RecordingSlot(options.createRecorder, this.stats, log, (message) => {
      this.emitMessage({ type: 'error', code: 'E_RECORDING', message });
      this.ticker.sendStatus();
    });
    this.batch = new ScanBatch({ rateHz: options.scanRateHz, maxDetections: 5000, emit: (scan, arrivals) => this.sendScan(scan, arrivals) });
    const useTracker = (t: TrackEngine): void => void (this.tracker = t);
    this.seek = new ReplaySeek({
      state: this.state, batch: this.batch, comparison: this.comparison, source: () => this.slot.current,
      tracking: () => this.tracker !== null, createTracker, useTracker, createComparison,
      handle: (r, at) => this.onRecord(r, at),
      forgetFixedEchoes: () => this.ticker.forgetFixedEchoes(),
      resync: () => (this.emit('resync'), this.ticker.tickReplay(true)),
      log,
    });
    this.restart = new LiveRestart({
      latestS: () => this.state.timeS, flushTracker: () => this.flushTracker(), batch: this.batch,
      forgetRun: () => this.forgetRun(), createTracker, useTracker, recording: this.recording,
      announce: () => (this.emit('resync'), this.ticker.sendStatus()),
      log,
    });
  }

  get current(): Source | null {
    return this.slot.current;
  }

  get replay(): ReplaySourceLike | null {
    const source = this.slot.current;
    return source && isReplayControl(source) ? source : null;
  }

  /** Replaces the input: the old source is closed, the state starts again, clients get a snapshot. Switches run one at a time. */
  setSource(source: Source): Promise<void> {
    return this.slot.serialise(() => this.switchTo(source));
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
    this.seek.abandon();
    await this.detach();
    this.batch.discard();
    this.batch.release();
    this.forgetRun();
    this.stats.reset(source.kind, source.name);
    this.tracker = tracker;
    this.slot.attach(source, {
      record: (r, at) => this.onRecord(r, at),
      bad: (b) => this.onBad(b),
      state: (s, detail) => this.onState(s, detail),
      seeked: (t) => this.seek.seeked(t),
      error: (e) => this.options.log(`source ${source.name}: ${e.message}`),
    });
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
    this.ticker.sendStatus();
  }

  private async detach(): Promise<void> {
    await this.slot.detach();
    await this.recording.close();
  }

  /** A new source or a new live run: the picture, the commanded paths and the comparison start again. */
  private forgetRun(): void {
    this.state.reset();
    this.state.clearCommanded();
    this.comparison.restart();
    this.ticker.forgetFixedEchoes();
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
    const source = this.slot.current;
    if (source?.kind === 'serial') {
      this.restart.check(r, source);
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
        this.comparison.positioner(r.sample);
        this.batch.positionerSample(r.sample);
        break;
      case 'track':
        this.applyOutput({ updates: [r.update], deletions: [] }, receivedAtMs, false);
        break;
      case 'deletion':
        this.applyOutput({ updates: [], deletions: [r.deletion] }, receivedAtMs, false);
        break;
      case 'fixed-echoes':
        this.ticker.fixedEchoes(r.echoes);
        break;
      case 'commanded': {
        const path = this.state.setCommanded(r.path, r.target);
        this.comparison.commanded(r.path, r.target);
        this.emitMessage(r.target === undefined ? { type: 'commanded', path } : { type: 'commanded', path, target: r.target });
        break;
      }
    }
    this.batch.schedule();
  }

  /** What the tracker still buffers goes out (recorded and streamed), when a tracker runs. */
  private flushTracker(): void {
    if (this.tracker) this.applyOutput(this.runTracker((t) => t.flush()), undefined);
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
      this.comparison.update(u);
      this.batch.update(this.state.addUpdate(u), receivedAtMs);
    }
    for (const d of out.deletions) {
      if (recordIt) this.recording.write({ kind: 'deletion', deletion: d });
      this.comparison.deletion(d);
      this.state.addDeletion(d);
      this.batch.deletion(d);
    }
  }

  private onBad(b: BadLine): void {
    this.stats.bad(b);
    this.ticker.scheduleStatus();
  }

  private onState(s: SourceState, detail?: string): void {
    this.stats.state = s;
    this.emit('source-state', s);
    if (detail) this.options.log(`source ${this.slot.current?.name ?? ''}: ${s} (${detail})`);
    // A pause in the stream: let the tracker finish what it buffered.
    const flowing = s === 'live' || s === 'playing';
    if (!flowing) this.flushTracker();
    // Stopped (paused, ended, waiting): what is pending goes out now, before the state says so;
    // scheduled for the next slot, it arrived after "paused" and the picture moved on a scan.
    if (flowing) this.batch.schedule();
    else this.batch.flush();
    this.ticker.sendStatus();
    this.ticker.tickReplay(true);
  }

  private sendScan(scan: ScanMessage, arrivals: number[]): void {
    this.emit('scan', scan);
    const sent = performance.now();
    for (const a of arrivals) this.stats.latency(a, sent);
  }

  private emitMessage(msg: ServerMessage): void {
    this.emit('message', msg);
  }

  /** Sends the replay state when it changed (or always, after a control). */
  tickReplay(force = false): void {
    this.ticker.tickReplay(force);
  }

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
    return helloMessage();
  }

  /** The state as a client starting now needs it (snapshot.ts says what is left out). */
  snapshot(): SnapshotMessage {
    return buildSnapshot({
      state: this.state,
      batch: this.batch,
      source: this.stats.status(),
      comparisonHistory: this.comparison.history(),
      replay: this.replayState(),
    });
  }

  async close(): Promise<void> {
    this.seek.abandon();
    this.ticker.close();
    this.batch.close();
    await this.detach();
  }
}
