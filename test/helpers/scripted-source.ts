/**
 * A Source driven by the test itself: the test calls emitRecord()/emitBad()/setState() and the
 * bridge sees exactly what a real source would emit. Optionally it also takes replay controls,
 * remembering what it was asked, so control messages can be checked end to end.
 */
import { EventEmitter } from 'node:events';
import type { BadLine, ReplayControl, Source, SourceRecord, SourceState } from '../../bridge/ingest/source.ts';
import type { ReplayState } from '../../bridge/server/protocol.ts';
import type { TrackUpdate } from '../../bridge/types.ts';

export interface ScriptedSourceOptions {
  /** Reported kind. */
  kind: 'serial' | 'replay';
  /** Reported name. */
  name: string;
  /** Whether records include tracks (then the bridge runs no tracker). */
  carriesTracks: boolean;
  /** Run length reported by state(), s. */
  durationS: number;
}

export class ScriptedSource extends EventEmitter implements Source, ReplayControl {
  readonly kind: 'serial' | 'replay';
  readonly name: string;
  readonly carriesTracks: boolean;
  readonly calls: string[] = [];
  started = false;
  closed = false;
  private replay: ReplayState;

  constructor(o: Partial<ScriptedSourceOptions> = {}) {
    super();
    this.kind = o.kind ?? 'replay';
    this.name = o.name ?? 'scripted';
    this.carriesTracks = o.carriesTracks ?? true;
    this.replay = { sessionId: this.name, durationS: o.durationS ?? 100, positionS: 0, speed: 1, playing: false, loop: false };
  }

  async start(): Promise<void> {
    this.started = true;
    this.emit('state', this.kind === 'serial' ? 'live' : 'paused');
  }

  async close(): Promise<void> {
    this.closed = true;
  }

  emitRecord(r: SourceRecord): void {
    this.emit('record', r, performance.now());
  }

  emitBad(b: BadLine): void {
    this.emit('bad', b);
  }

  setState(s: SourceState, detail?: string): void {
    this.emit('state', s, detail);
  }

  play(): void { this.calls.push('play'); this.replay = { ...this.replay, playing: true }; }
  pause(): void { this.calls.push('pause'); this.replay = { ...this.replay, playing: false }; }
  step(seconds?: number): void { this.calls.push(`step ${seconds ?? 'default'}`); }
  stepBack(seconds?: number): void { this.calls.push(`step-back ${seconds ?? 'default'}`); }
  seek(timeS: number): void {
    this.calls.push(`seek ${timeS}`);
    this.replay = { ...this.replay, positionS: timeS };
    this.emit('seeked', timeS);
  }
  setSpeed(factor: number): void { this.calls.push(`speed ${factor}`); this.replay = { ...this.replay, speed: factor }; }
  setLoop(loop: boolean): void { this.calls.push(`loop ${loop}`); this.replay = { ...this.replay, loop }; }
  state(): ReplayState { return this.replay; }
}

/** A plausible confirmed track update at a time and place. */
export function trackAt(id: number, timeS: number, x: number, y: number): TrackUpdate {
  return {
    timeS, id, status: 'confirmed', x, y, vx: 0.5, vy: 0, speed: 0.5, headingRad: Math.PI / 2,
    pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.9, moving: true, hits: 10, misses: 0,
  };
}
