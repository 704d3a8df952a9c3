/**
 * The bridge's view of modules other parts of the project provide (tracker, recorder, live
 * comparison, calibration API), each behind one small adapter here, so the rest of bridge/server/
 * codes against small interfaces and tests can inject their own implementations.
 */
import type { Source, SourceRecord, ReplayControl } from '../ingest/source.ts';
import type { TrackDeletion, TrackEngine, TrackUpdate, PositionerSample } from '../types.ts';
import type { ComparisonFigures, PathPointWire } from './protocol.ts';
import { EchotrailError } from '../errors.ts';
import { Recorder } from '../session/recorder.ts';
import { MultiPathComparison } from '../compare/live-multi.ts';
import { Tracker, type TrackerOptionsInput } from '../tracking/tracker.ts';
import { calibrationApi } from '../calibrate/api.ts';

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

/** What the pipeline needs from a live comparison. */
export interface LiveComparisonLike {
  /** A whole commanded path; `target` names it when the run commands several. */
  commanded(path: PathPointWire[], target?: string): void;
  positioner(sample: PositionerSample): void;
  update(update: TrackUpdate): void;
  deletion(deletion: TrackDeletion): void;
  /** Latest figures of every commanded path that has compared something (empty before). */
  figures(): ComparisonFigures[];
  /** The running RMSE of each such path as it went, flat [t, rmse, …] (for a late or re-synced client's chart). */
  history(): { pathId: string; points: number[] }[];
  /** One path's running-RMSE points after run time `afterS` (for the next `comparison` message). */
  historyAfter(pathId: string, afterS: number): number[];
  /** Forget figures and followed track, keep the commanded path (replay seek). */
  reset(): void;
  /** Forget everything, commanded path included (new source). */
  restart(): void;
}

/** Replays of detections CSVs offer their history, to re-track after a seek. */
export interface ReplayHistory {
  /** Records from the start of the run up to `timeS`, in order (for re-tracking CSV replays). */
  recordsUntil?(timeS: number): Iterable<SourceRecord> | AsyncIterable<SourceRecord>;
}

export type ReplaySourceLike = Source & ReplayControl & ReplayHistory;

export function isReplayControl(s: Source): s is ReplaySourceLike {
  const r = s as Partial<ReplayControl>;
  return typeof r.play === 'function' && typeof r.seek === 'function' && typeof r.state === 'function';
}

/** The project's tracking engine, configured with `trackerOptions` (checked by the tracker). */
export async function loadTrackerFactory(): Promise<(options: unknown) => TrackEngine> {
  return (options) => new Tracker((options ?? {}) as TrackerOptionsInput);
}

/** The calibration HTTP handler (bridge/calibrate/api.ts). */
export async function loadCalibrationApi(): Promise<(request: unknown) => unknown> {
  return calibrationApi;
}

/** Opens a recording through bridge/session/recorder.ts; throws E_RECORDING when the file cannot be created. */
export function openRecording(req: RecordingRequest): RecorderLike {
  const rec = new Recorder({ dir: req.dir, name: req.name, source: req.source, config: req.config, startUtc: new Date() });
  let failed = false;
  rec.on('error', (e: Error) => {
    if (!failed) req.onError(e.message);
    failed = true;
  });
  if (!rec.open()) throw new EchotrailError('E_RECORDING', rec.status().error ?? `cannot record in '${req.dir}'`);
  return {
    name: rec.status().recording ?? req.name,
    write: (r) => rec.record(r),
    close: async () => rec.close(),
  };
}

/**
 * bridge/compare/live.ts behind the pipeline's small interface: one comparison per commanded path
 * (per target), each following its own track. Paths sent whole by the source win; positioner
 * samples only build a path when no whole path came.
 */
export function createLiveComparison(log: (line: string) => void): LiveComparisonLike {
  let live = new MultiPathComparison();
  return {
    commanded(path, target) {
      try {
        live.setCommanded(path, target);
      } catch (err) {
        log(`live comparison: commanded path${target ? ` '${target}'` : ''} refused: ${(err as Error).message}`);
      }
    },
    positioner: (sample) => live.addPositioner(sample),
    update: (u) => live.update(u),
    deletion: () => undefined,
    figures: () => live.figures(),
    history: () => live.history(),
    historyAfter: (pathId, afterS) => live.historyAfter(pathId, afterS),
    reset: () => live.reset(),
    restart() {
      live = new MultiPathComparison();
    },
  };
}
