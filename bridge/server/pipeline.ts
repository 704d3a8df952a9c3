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
import type { FixedEcho, TrackEngine, TrackerOutput } from '../types.ts';
import type { ReplayState, ServerMessage, SourceStatus } from './protocol.ts';
import { PROTOCOL_VERSION } from './protocol.ts';
import { isReplayControl, type LiveComparisonLike, type RecorderLike, type ReplaySourceLike } from './deps.ts';
import { LiveState } from './state.ts';
import { SourceStats } from './source-stats.ts';
import { ScanBatch, type ScanMessage } from './scan-batch.ts';
import { rebuildAfterSeek } from './rebuild.ts';

export type SnapshotMessage = Extract<ServerMessage, { type: 'snapshot' }>;

/** What the pipeline is built from; the bridge fills these from its options. */
export interface PipelineOptions {
  /** Builds a fresh tracking engine (also after a seek in a CSV replay). */
  createTracker: () => TrackEngine | Promise<TrackEngine>;
  /** Opens a recorder for a live source; null when the run is not recorded. */
  createRecorder: ((source: Source, onError: (message: string) => void) => RecorderLike | Promise<RecorderLike>) | null;
  /** Builds a live comparison, or null when none is available. */
  createComparison: (() => LiveComparisonLike) | null;
  /** Caps of the live state. */
  state: ConstructorParameters<typeof LiveState>[0];
  /** Most scans per second. */
  scanRateHz: number;
  /** Where problems the user should see in the log go. */
  log: (line: string) => void;
}

/** How often source status, replay state, fixed echoes and comparison figures are refreshed, ms. */
const STATUS_MS = 1000;
const REPLAY_MS = 250;
/** Records queued during a re-track at most (a few seconds at the highest replay speeds). */
const MAX_QUEUED = 200_000;

export class Pipeline extends EventEmitter {
  readonly state: LiveState;
  readonly stats = new SourceStats();
  private source: Source | null = null;
  private tracker: TrackEngine | null = null;
  private recorder: RecorderLike | null = null;
  private comparison: LiveComparisonLike | null;
  private readonly batch: ScanBatch;
  private readonly timers: NodeJS.Timeout[] = [];
  private lastReplayJson = '';
  private fixedSignature = '';
  private sourceListeners: [string, (...a: never[]) => void][] = [];
  /** Bumped on every seek and source change, so a rebuild that was overtaken is abandoned. */
  private epoch = 0;
  trackerErrors = 0;
  /** Records held back while a CSV replay is re-tracked after a seek (see onSeeked). */
  private queue: [SourceRecord, number][] | null = null;
  queueDropped = 0;
  /** True between 'seeked' and the next turn of the event loop: the source re-sends its state. */
  private resending = false;

  constructor(private readonly options: PipelineOptions) {
    super();
    this.state = new LiveState(options.state);
    this.comparison = options.createComparison ? options.createComparison() : null;
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

  /** Replaces the input: the old source is closed, the state starts again, clients get a snapshot. */
  async setSource(source: Source): Promise<void> {
    this.epoch++;
    await this.detach();
    this.batch.discard();
    this.batch.release();
    this.queue = null;
    this.resending = false;
    this.state.reset();
    this.state.clearCommanded();
    this.comparison?.restart();
    this.stats.reset(source.kind, source.name);
    this.tracker = source.carriesTracks ? null : await this.options.createTracker();
    this.source = source;
    this.on2(source, 'record', (r: SourceRecord, at: number) => this.onRecord(r, at));
    this.on2(source, 'bad', (b: BadLine) => this.onBad(b));
    this.on2(source, 'state', (s: SourceState, detail?: string) => this.onState(s, detail));
    this.on2(source, 'seeked', (t: number) => this.onSeeked(t));
    this.on2(source, 'error', (e: Error) => this.options.log(`source ${source.name}: ${e.message}`));
    if (this.options.createRecorder) {
      try {
        this.recorder = await this.options.createRecorder(source, (message) => this.recordingFailed(message));
        this.stats.recording = this.recorder.name;
      } catch (err) {
        // A live view without a recording is still useful: say why and keep going.
        this.stats.recordingError = (err as Error).message;
        this.options.log(`recording disabled: ${(err as Error).message}`);
      }
    }
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
    if (this.recorder) await this.closeRecorder();
  }

  private async closeRecorder(): Promise<void> {
    const rec = this.recorder;
    this.recorder = null;
    this.stats.recording = null;
    await rec?.close().catch((e: Error) => this.options.log(`closing recording ${rec.name}: ${e.message}`));
  }

  private record(r: SourceRecord): void {
    if (!this.recorder) return;
    try {
      this.recorder.write(r);
    } catch (err) {
      this.recordingFailed((err as Error).message);
    }
  }

  /** Recording stopped (disk full, folder gone): say so everywhere; the live view carries on. */
  private recordingFailed(message: string): void {
    this.stats.recordingError = message;
    this.options.log(`recording stopped: ${message}`);
    void this.closeRecorder();
    this.emitMessage({ type: 'error', code: 'E_RECORDING', message });
    this.emitMessage({ type: 'source', source: this.stats.status() });
  }

  private onRecord(r: SourceRecord, receivedAtMs: number): void {
    if (this.queue) {
      if (this.queue.length < MAX_QUEUED) this.queue.push([r, receivedAtMs]);
      else this.queueDropped++;
      return;
    }
    // A replay's re-sent state after a seek is already recorded (replays are not recorded anyway).
    if (!this.resending) this.record(r);
    switch (r.kind) {
      case 'detection': {
        this.stats.detection(receivedAtMs);
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
      case 'commanded':
        this.state.setCommanded(r.path);
        this.comparison?.commanded(r.path);
        this.emitMessage({ type: 'commanded', path: this.state.commanded });
        break;
    }
    this.batch.schedule();
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
      if (recordIt) this.record({ kind: 'track', update: u });
      this.comparison?.update(u);
      this.batch.update(this.state.addUpdate(u), receivedAtMs);
    }
    for (const d of out.deletions) {
      if (recordIt) this.record({ kind: 'deletion', deletion: d });
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
    if (this.tracker && s !== 'live' && s !== 'playing') this.applyOutput(this.runTracker((t) => t.flush()), undefined);
    this.batch.schedule();
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

  /**
   * A replay jumped. Sessions re-send the state at the new time synchronously right after
   * 'seeked' (tracks, history window, fixed echoes): those records rebuild the state but are not
   * streamed as increments. CSV replays are re-tracked from the start up to the new time; records
   * the replay releases meanwhile wait in a queue so the tracker still sees time order. Then every
   * client gets one fresh snapshot.
   */
  private onSeeked(timeS: number): void {
    const epoch = ++this.epoch;
    this.batch.discard();
    this.batch.hold();
    this.state.reset();
    this.comparison?.reset();
    this.fixedSignature = '';
    this.resending = true;
    const retrack = this.tracker !== null;
    if (retrack) this.queue = [];
    setImmediate(() => void this.finishSeek(epoch, timeS, retrack));
  }

  private async finishSeek(epoch: number, timeS: number, retrack: boolean): Promise<void> {
    if (epoch !== this.epoch) return;
    this.resending = false;
    const src = this.source;
    if (retrack && src && isReplayControl(src)) {
      try {
        this.tracker = await this.options.createTracker();
        await rebuildAfterSeek(src, this.tracker, this.state, timeS, () => epoch !== this.epoch);
      } catch (err) {
        // The replay goes on from the new position; only the picture before it is missing.
        this.options.log(`rebuilding state after seek to ${timeS} s: ${(err as Error).message}`);
      }
      if (epoch !== this.epoch) return;
      const queued = this.queue ?? [];
      this.queue = null;
      for (const [r, at] of queued) this.onRecord(r, at);
    }
    this.state.timeS = Math.max(this.state.timeS, timeS);
    this.batch.discard();
    this.batch.release();
    this.emit('resync');
    this.tickReplay(true);
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
    const figures = this.comparison?.figures();
    if (figures) this.emitMessage({ type: 'comparison', figures });
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

  replayState(): ReplayState | null {
    return this.replay?.state() ?? null;
  }

  status(): SourceStatus {
    return this.stats.status();
  }

  hello(): ServerMessage {
    return { type: 'hello', protocol: PROTOCOL_VERSION, server: 'echotrail-bridge' };
  }

  snapshot(): SnapshotMessage {
    const s = this.state;
    return {
      type: 'snapshot',
      seq: this.batch.nextSeq,
      timeS: s.timeS,
      source: this.stats.status(),
      tracks: s.tracks(),
      history: s.history(),
      detections: s.recentDetections(),
      fixedEchoes: s.fixedEchoes,
      commanded: s.commanded,
      replay: this.replayState(),
    };
  }

  async close(): Promise<void> {
    this.epoch++;
    for (const t of this.timers) clearInterval(t);
    if (this.statusTimer) clearTimeout(this.statusTimer);
    this.batch.close();
    await this.detach();
  }
}
