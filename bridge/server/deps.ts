/**
 * The bridge's view of modules other parts of the project provide (tracker, serial and replay
 * sources, recorder, session list, live comparison, calibration API). Each is loaded on first use
 * through one adapter here, so the rest of bridge/server/ codes against small interfaces and tests
 * can inject their own implementations.
 */
import type { Source, SourceRecord, ReplayControl } from '../ingest/source.ts';
import type { Detection, FixedEcho, TrackDeletion, TrackEngine, TrackUpdate, PositionerSample } from '../types.ts';
import type { ComparisonFigures, PathPointWire, SessionInfo } from './protocol.ts';
import { EchotrailError } from '../errors.ts';

/** What the pipeline needs from a session recorder. */
export interface RecorderLike {
  /** File name of the session being written. */
  readonly name: string;
  /** Appends a record; never throws (a failure goes to `onError`). */
  write(record: SourceRecord): void;
  close(): Promise<void>;
}

/** Settings of a new recording. */
export interface RecordingRequest {
  /** Folder of the session files. */
  dir: string;
  /** Run name (file name and header). */
  name: string;
  /** What feeds the run. */
  source: { kind: string; name: string };
  /** Bench and tracker settings stored in the header. */
  config: unknown;
  /** Called once when recording stops on an error (disk full, unwritable folder). */
  onError: (message: string) => void;
}

/** The state of a session at a time, as a replay of a recorded session offers it after a seek. */
export interface SessionSnapshotLike {
  timeS: number;
  tracks: TrackUpdate[];
  history: { id: number; points: number[] }[];
  detections: Detection[];
  fixedEchoes: FixedEcho[];
  commanded: PathPointWire[];
  antenna: { timeS: number; azimuthRad: number } | null;
}

/** What the pipeline needs from a live comparison. */
export interface LiveComparisonLike {
  commanded(path: PathPointWire[]): void;
  positioner(sample: PositionerSample): void;
  update(update: TrackUpdate): void;
  deletion(deletion: TrackDeletion): void;
  /** Latest figures, or null before there is anything to compare. */
  figures(): ComparisonFigures | null;
  reset(): void;
}

/** Replay sources may offer a way to rebuild state after a seek without re-reading from the start. */
export interface ReplayHistory {
  /** State of a recorded session at `timeS` (sessions that carry their tracks). */
  snapshotAt?(timeS: number): SessionSnapshotLike | Promise<SessionSnapshotLike>;
  /** Records from the start of the run up to `timeS`, in order (for re-tracking CSV replays). */
  recordsUntil?(timeS: number): Iterable<SourceRecord> | AsyncIterable<SourceRecord>;
}

export type ReplaySourceLike = Source & ReplayControl & ReplayHistory;

export function isReplayControl(s: Source): s is ReplaySourceLike {
  const r = s as Partial<ReplayControl>;
  return typeof r.play === 'function' && typeof r.seek === 'function' && typeof r.state === 'function';
}

type Module = Record<string, unknown>;

/**
 * Imports a sibling module by path. The specifier is built at run time on purpose: the type checker
 * must not require modules that another part of the project has not delivered yet.
 */
export async function importOptional(rel: string): Promise<Module | null> {
  const url = new URL(rel, import.meta.url).href;
  try {
    return (await import(url)) as Module;
  } catch (err) {
    const code = (err as { code?: string }).code;
    const msg = String((err as Error).message ?? '');
    if ((code === 'ERR_MODULE_NOT_FOUND' || msg.includes('Cannot find module')) && msg.includes(rel.split('/').pop() as string)) return null;
    throw err;
  }
}

function pick<T>(mod: Module | null, names: string[]): T | null {
  if (!mod) return null;
  for (const n of names) if (typeof mod[n] === 'function') return mod[n] as T;
  return null;
}

function missing(what: string, file: string): EchotrailError {
  return new EchotrailError('E_OPTION', `${what} is not available: ${file} is missing or exports nothing usable`);
}

/** The project's tracking engine, configured with `trackerOptions`. */
export async function loadTrackerFactory(): Promise<(options: unknown) => TrackEngine> {
  const mod = await importOptional('../tracking/tracker.ts');
  const factory = pick<(o: unknown) => TrackEngine>(mod, ['createTracker', 'createTrackEngine']);
  if (factory) return factory;
  const Cls = pick<new (o: unknown) => TrackEngine>(mod, ['Tracker', 'TrackerEngine']);
  if (Cls) return (o) => new Cls(o);
  throw missing('the tracker', 'bridge/tracking/tracker.ts');
}

/** Lists recorded sessions in a folder; an empty list when the session module is absent. */
export async function loadSessionLister(): Promise<((dir: string) => Promise<SessionInfo[]>) | null> {
  const mod = (await importOptional('../session/list.ts')) ?? (await importOptional('../session/sessions.ts'));
  return pick(mod, ['listSessions']);
}

/** The live comparison factory, or null until bridge/compare/live.ts exists. */
export async function loadLiveComparison(): Promise<(() => LiveComparisonLike) | null> {
  const mod = await importOptional('../compare/live.ts');
  return pick(mod, ['createLiveComparison']);
}

/** The calibration HTTP handler, or null until bridge/calibrate/api.ts exists. */
export async function loadCalibrationApi(): Promise<((request: unknown) => Promise<unknown> | unknown) | null> {
  const mod = await importOptional('../calibrate/api.ts');
  return pick(mod, ['calibrationApi']);
}

interface RecorderModuleShape {
  open(): boolean;
  record(rec: SourceRecord): void;
  close(): void;
  status(): { recording: string | null; error: string | null };
  on(ev: 'error', fn: (e: Error) => void): unknown;
}

/** Opens recordings through bridge/session/recorder.ts; null when that module is absent. */
export async function loadRecorderFactory(): Promise<((r: RecordingRequest) => RecorderLike) | null> {
  const mod = await importOptional('../session/recorder.ts');
  const Cls = mod && typeof mod.Recorder === 'function' ? (mod.Recorder as new (o: object) => RecorderModuleShape) : null;
  if (!Cls) return null;
  return (req) => {
    const rec = new Cls({ dir: req.dir, name: req.name, source: req.source, config: req.config, startUtc: new Date() });
    let failed = false;
    rec.on('error', (e) => {
      if (!failed) req.onError(e.message);
      failed = true;
    });
    if (!rec.open()) throw new EchotrailError('E_RECORDING', rec.status().error ?? `cannot record in '${req.dir}'`);
    const name = rec.status().recording ?? req.name;
    return {
      name,
      write: (r) => rec.record(r),
      close: async () => rec.close(),
    };
  };
}
