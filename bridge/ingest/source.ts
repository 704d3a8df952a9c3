/**
 * The contract every input of the bridge fulfils: a serial port, a replayed session, a replayed
 * detections CSV. The pipeline (bridge/server/) listens to these events and never needs to know
 * which kind of source it has.
 */
import type { EventEmitter } from 'node:events';
import type { AntennaSample, Detection, PositionerSample, TrackDeletion, TrackUpdate, FixedEcho } from '../types.ts';
import type { ReplayState, PathPointWire } from '../server/protocol.ts';

/** One good record from a source. Recorded sessions also carry the tracker output they saw live. */
export type SourceRecord =
  | { kind: 'detection'; detection: Detection }
  | { kind: 'antenna'; sample: AntennaSample }
  | { kind: 'positioner'; sample: PositionerSample }
  | { kind: 'track'; update: TrackUpdate }
  | { kind: 'deletion'; deletion: TrackDeletion }
  | { kind: 'fixed-echoes'; echoes: FixedEcho[] }
  /** `target` names whose path it is when a run commands several (one per positioner/carriage); absent for a single path. */
  | { kind: 'commanded'; path: PathPointWire[]; target?: string };

/** A line that was refused, with enough to find it again. */
export interface BadLine {
  /** 1-based line number within the source (since it opened, for a serial port). */
  line: number;
  /** Why it was refused, in plain words. */
  reason: string;
  /** The offending text, cut to 200 characters. */
  text: string;
  /**
   * How many bad lines this entry stands for (default 1). A file read whole at open lists its
   * first bad lines and its last, and the last entry counts the unlisted ones in between.
   */
  count?: number;
}

export type SourceState = 'live' | 'waiting' | 'disconnected' | 'playing' | 'paused' | 'ended';

/**
 * Events:
 * - 'record' (record: SourceRecord, receivedAtMs: number): receivedAtMs is performance.now() when the
 *   bytes arrived (serial) or when the replay clock released the record.
 * - 'bad' (bad: BadLine)
 * - 'state' (state: SourceState, detail?: string)
 * - 'seeked' (timeS: number): a replay jumped; consumers reset their state for that time.
 */
export interface Source extends EventEmitter {
  readonly kind: 'serial' | 'replay';
  /** Serial path or session name. */
  readonly name: string;
  /** True when records include the tracker output (recorded sessions): no re-tracking needed. */
  readonly carriesTracks: boolean;
  start(): Promise<void>;
  close(): Promise<void>;
}

/** Replay sources also take the dashboard's transport controls. */
export interface ReplayControl {
  play(): void;
  pause(): void;
  /** Advance by `seconds` of run time (default: one antenna revolution or 0.5 s) and pause. */
  step(seconds?: number): void;
  /** Go back by `seconds` of run time (default: as step()), never before 0, and pause (a seek: consumers rebuild). */
  stepBack(seconds?: number): void;
  /** Jump to `timeS` (clamped to the run) keeping the play/pause state. */
  seek(timeS: number): void;
  /** Replay speed factor, 0.1–50. */
  setSpeed(factor: number): void;
  setLoop(loop: boolean): void;
  state(): ReplayState;
}
