/**
 * Replays a recorded session (its tracks included: carriesTracks = true) or a detections CSV
 * (carriesTracks = false: the pipeline tracks it) on a clock: real time × speed, pause, step
 * forward and back, seek, loop. Records are released when the run time they carry comes due on the clock.
 *
 * After a seek it emits 'seeked' (consumers reset) and then, for sessions, re-emits the state at
 * the new time (resendAt: commanded path, fixed echoes, alive tracks, the history window) so the
 * picture is complete again; CSV consumers re-track through recordsUntil().
 */
import { EventEmitter } from 'node:events';
import { basename } from 'node:path';
import { EchotrailError } from '../errors.ts';
import type { ReplayState } from '../server/protocol.ts';
import type { BadLine, ReplayControl, Source, SourceRecord } from './source.ts';
import { resolveReplaySourceOptions, type ReplaySourceOptions } from './replay-options.ts';
import { openTimeline, type ReplayTimeline, type TimedSourceRecord } from './replay-timeline.ts';
import { sessionIdOf } from '../session/reader.ts';
import type { SessionSnapshot } from '../session/run-state.ts';

export { resolveReplaySourceOptions, type ReplaySourceOptions };

export class ReplaySource extends EventEmitter implements Source, ReplayControl {
  readonly kind = 'replay' as const;
  readonly name: string;
  readonly options: ReplaySourceOptions;
  private timeline: ReplayTimeline | null = null;
  private cursor: Iterator<TimedSourceRecord> | null = null;
  private next: TimedSourceRecord | null = null;
  private positionS = 0;
  private playing = false;
  private ended = false;
  private speed: number;
  private loop: boolean;
  /** While playing: the clock reading and run time the current stretch of play started from. */
  private anchorMs = 0;
  private anchorS = 0;
  private timer: unknown = null;

  constructor(options: Partial<ReplaySourceOptions> & { path: string }) {
    super();
    this.options = resolveReplaySourceOptions(options);
    this.name = sessionIdOf(this.options.path) || basename(this.options.path);
    this.speed = this.options.speed;
    this.loop = this.options.loop;
  }

  get carriesTracks(): boolean {
    return this.timeline ? this.timeline.carriesTracks : this.format() === 'session';
  }

  private format(): 'session' | 'csv' {
    const f = this.options.format;
    return f === 'auto' ? (this.options.path.toLowerCase().endsWith('.csv') ? 'csv' : 'session') : f;
  }

  /** Opens and indexes the file; rejects with E_SESSION_FORMAT / E_INPUT_* when it is unusable. */
  async start(): Promise<void> {
    if (this.timeline) return;
    this.timeline = await openTimeline(this.options.path, this.format(), this.name, this.options.session);
    // The timeline lists a bounded number of bad lines; the last one listed also carries those
    // it only counted, so the source's bad-line count is the file's.
    const bads = this.timeline.badLines;
    const unlisted = this.timeline.badLineCount - bads.reduce((n, b) => n + (b.count ?? 1), 0);
    bads.forEach((bad, i) => this.emit('bad', (i === bads.length - 1 && unlisted > 0 ? { ...bad, count: (bad.count ?? 1) + unlisted } : bad) satisfies BadLine));
    this.reposition(0, false);
    if (this.options.autoplay) this.play();
    else this.emit('state', 'paused');
  }

  async close(): Promise<void> {
    this.stopTimer();
    this.playing = false;
    this.timeline?.close();
    this.timeline = null;
    this.cursor = null;
    this.next = null;
  }

  play(): void {
    if (!this.timeline || this.playing) return;
    if (this.ended) this.reposition(0, true);
    this.playing = true;
    this.anchor();
    this.emit('state', 'playing');
    this.schedule(0);
  }

  pause(): void {
    if (!this.timeline || !this.playing) return;
    this.positionS = this.clockPosition();
    this.playing = false;
    this.stopTimer();
    this.emit('state', 'paused');
  }

  /** The default step: the configured one, else one antenna revolution as recorded, else 0.5 s. */
  private get defaultStepS(): number {
    return this.options.stepS ?? this.timeline?.revolutionS ?? 0.5;
  }

  step(seconds = this.defaultStepS): void {
    if (!this.timeline) return;
    if (this.playing) this.pause();
    if (this.ended) return;
    const target = Math.min(this.positionS + Math.max(0, seconds), this.timeline.durationS);
    this.release(target, Infinity);
    this.positionS = target;
    if (!this.next) this.finish();
    else this.emit('state', 'paused');
  }

  /**
   * Goes back `seconds` of run time from the current position (exactly: one revolution earlier
   * after a default step forward), clamped at 0, and pauses. A seek underneath: consumers rebuild
   * the state there; at 0 already it only pauses.
   */
  stepBack(seconds = this.defaultStepS): void {
    if (!this.timeline) return;
    if (this.playing) this.pause();
    const target = Math.max(0, this.positionS - Math.max(0, seconds));
    if (target === this.positionS && !this.ended) return;
    this.seek(target);
  }

  seek(timeS: number): void {
    if (!this.timeline || !Number.isFinite(timeS)) return;
    const wasEnded = this.ended;
    this.reposition(Math.min(Math.max(timeS, 0), this.timeline.durationS), true);
    if (this.playing) {
      this.anchor();
      this.schedule(0);
    } else if (wasEnded) {
      // Back from the end the replay is paused again, not still "ended".
      this.emit('state', 'paused');
    }
  }

  setSpeed(factor: number): void {
    if (!Number.isFinite(factor)) return;
    if (this.playing) {
      this.positionS = this.clockPosition();
      this.anchor();
    }
    this.speed = Math.min(50, Math.max(0.1, factor));
    if (this.playing) this.schedule(0);
  }

  setLoop(loop: boolean): void {
    this.loop = loop;
  }

  state(): ReplayState {
    const pos = this.playing ? Math.min(this.clockPosition(), this.timeline?.durationS ?? 0) : this.positionS;
    return { sessionId: this.name, durationS: this.timeline?.durationS ?? 0, positionS: pos, speed: this.speed, playing: this.playing, loop: this.loop };
  }

  /** The run at the current position (what a new dashboard client is shown). */
  snapshot(): SessionSnapshot {
    if (!this.timeline) throw new EchotrailError('E_SESSION_FORMAT', `replay '${this.name}' is not open`);
    return this.timeline.snapshot(this.state().positionS);
  }

  /** Every record up to `timeS`, for re-tracking a CSV after a seek. */
  recordsUntil(timeS: number): Iterable<SourceRecord> {
    return this.timeline ? this.timeline.recordsUntil(timeS) : [];
  }

  /** Moves the cursor to `timeS`. With `announce`, tells consumers and re-sends the state there. */
  private reposition(timeS: number, announce: boolean): void {
    const tl = this.timeline!;
    this.cursor = tl.cursor(timeS);
    this.pull();
    this.positionS = timeS;
    this.ended = false;
    if (!announce) return;
    // Records at exactly timeS go out with the re-sent state, not again from the cursor.
    while (this.next && this.next.timeS <= timeS) this.pull();
    this.emit('seeked', timeS);
    const at = this.options.clock.now();
    for (const record of tl.resendAt(timeS)) this.emit('record', record, at);
  }

  private pull(): void {
    const r = this.cursor!.next();
    this.next = r.done ? null : r.value;
  }

  private anchor(): void {
    this.anchorMs = this.options.clock.now();
    this.anchorS = this.positionS;
  }

  private clockPosition(): number {
    return this.anchorS + ((this.options.clock.now() - this.anchorMs) / 1000) * this.speed;
  }

  /** Emits records with timeS ≤ target, at most `max`; returns how many. */
  private release(target: number, max: number): number {
    let n = 0;
    while (this.next && this.next.timeS <= target && n < max) {
      const rec = this.next.record;
      this.pull();
      this.emit('record', rec, this.options.clock.now());
      n++;
    }
    return n;
  }

  private tick(): void {
    this.timer = null;
    if (!this.playing || !this.timeline) return;
    const target = Math.min(this.clockPosition(), this.timeline.durationS);
    const n = this.release(target, this.options.maxPerTick);
    if (!this.next) {
      if (this.loop && this.timeline.durationS > 0) {
        this.reposition(0, true);
        this.anchor();
        this.schedule(0);
      } else this.finish();
      return;
    }
    if (n >= this.options.maxPerTick) return this.schedule(0); // behind: catch up first
    const waitMs = ((this.next.timeS - target) / this.speed) * 1000;
    this.schedule(Math.min(this.options.maxTickMs, Math.max(this.options.minTickMs, waitMs)));
  }

  private finish(): void {
    this.stopTimer();
    this.playing = false;
    this.ended = true;
    this.positionS = this.timeline?.durationS ?? 0;
    this.emit('state', 'ended');
  }

  private schedule(ms: number): void {
    this.stopTimer();
    this.timer = this.options.clock.set(() => this.tick(), ms);
  }

  private stopTimer(): void {
    if (this.timer !== null) this.options.clock.clear(this.timer);
    this.timer = null;
  }
}
