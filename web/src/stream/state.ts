/**
 * The dashboard's data: plain structures, mutated in place by `applyMessage`.
 *
 * Nothing here is reactive on purpose: the stream client applies a whole animation frame's worth
 * of messages and then tells the plan and panels once, so 50 tracks × 5,000 points never pass
 * through a reactivity system.
 */
import type {
  ComparisonFigures, DetectionWire, PathPointWire, PositionerWire, ReplayState, SessionInfo, SourceStatus, TrackWire,
} from '../../../bridge/server/protocol.ts';
import { HistoryRing } from './ring.ts';

export interface TrackEntry {
  id: number;
  /** Latest state as sent by the bridge. */
  latest: TrackWire;
  /** Time the dashboard first heard of this track, seconds of run time. */
  firstSeenS: number;
  history: HistoryRing;
}

export interface DetectionDot {
  timeS: number;
  x: number;
  y: number;
  fixed: boolean;
}

export interface FixedEchoDot { x: number; y: number; amplitude: number }

export interface DashboardState {
  connection: 'connecting' | 'open' | 'closed';
  serverName: string | null;
  /** Latest run time seen in the stream, seconds. */
  timeS: number;
  source: SourceStatus | null;
  tracks: Map<number, TrackEntry>;
  /** Recent detections, oldest first, capped by `detectionLimit`. */
  detections: DetectionDot[];
  fixedEchoes: FixedEchoDot[];
  /** Every commanded path, one per target ('' when the run has one path without a name), in arrival order. */
  commandedPaths: { target: string; path: PathPointWire[] }[];
  /**
   * True once the run gave its commanded paths whole (`commanded` messages, several targets, or
   * figures against a named path); false while the path may be built from positioner samples,
   * which then extend it (positioner-path.ts).
   */
  commandedExplicit: boolean;
  antennaAzimuthRad: number | null;
  /** Latest commanded/measured position of each positioner ('' for an unnamed one), metres. */
  positioners: Map<string, PositionerWire>;
  replay: ReplayState | null;
  /** Latest comparison figures of any path (kept for single-path readers). */
  comparison: ComparisonFigures | null;
  /** Running comparison figures over time for the error chart (capped), all paths. */
  comparisonHistory: ComparisonFigures[];
  /** Latest figures per commanded path (key: the figures' pathId, '' when absent). */
  comparisons: Map<string, ComparisonFigures>;
  sessions: SessionInfo[];
  lastError: { code: string; message: string } | null;
  /** Frames refused by the schema (never applied); shown in the status panel. */
  invalidFrames: number;
  lastInvalid: string | null;
  /**
   * Detections collected for the calibration panel while `capture.active`, capped so a request
   * stays under the bridge's body limit. A seek or loop does not clear them here: their times say
   * where the replay jumped, and the panel's CaptureWatch (calibration-request.ts) cuts the
   * capture there and stops it.
   */
  capture: { active: boolean; detections: DetectionWire[]; limit: number };
  /** Bumps when the picture restarts (snapshot, seek, jump back in time). */
  epoch: number;
  /** Bumps when the fixed-echo map or commanded path changes, so layers rebuild only then. */
  fixedVersion: number;
  commandedVersion: number;
}

export interface StateLimits {
  /** Points kept per track. */
  historyPoints: number;
  /** Detections kept for the fading dots. */
  detectionLimit: number;
  /** Seconds a detection stays on screen. */
  detectionAgeS: number;
  comparisonPoints: number;
}

export const defaultLimits: StateLimits = {
  historyPoints: 5000,
  detectionLimit: 4000,
  detectionAgeS: 4,
  comparisonPoints: 4000,
};

export function createState(): DashboardState {
  return {
    connection: 'connecting', serverName: null, timeS: 0, source: null, tracks: new Map(),
    detections: [], fixedEchoes: [], commandedPaths: [], commandedExplicit: false, antennaAzimuthRad: null, positioners: new Map(),
    replay: null, comparison: null, comparisonHistory: [], comparisons: new Map(), sessions: [], lastError: null,
    invalidFrames: 0, lastInvalid: null, epoch: 0, fixedVersion: 0, commandedVersion: 0,
    capture: { active: false, detections: [], limit: 12_000 },
  };
}

/** The first (or only) commanded path; empty when there is none. */
export function firstCommandedPath(state: Pick<DashboardState, 'commandedPaths'>): readonly PathPointWire[] {
  return state.commandedPaths[0]?.path ?? [];
}

export function newTrack(wire: TrackWire, limits: StateLimits): TrackEntry {
  // The track's own start when the bridge sends it: a late join or a seek sees only part of the
  // history, and the age must not count from there.
  return { id: wire.id, latest: wire, firstSeenS: wire.startS ?? wire.timeS, history: new HistoryRing(limits.historyPoints) };
}

/** Range and azimuth of a track's latest position (radar at the origin, azimuth clockwise from +y). */
export function polarOf(x: number, y: number): { rangeM: number; azimuthRad: number } {
  const az = Math.atan2(x, y);
  return { rangeM: Math.hypot(x, y), azimuthRad: az < 0 ? az + 2 * Math.PI : az };
}

/**
 * Fill a ring from the bridge's flat [t, x, y, ...] history. Speed and heading come from the
 * filter (`kinematics`: [speed, heading, ...], one pair per point) when the bridge sends them, so
 * the charts look the same after a seek or reconnect as when live; older bridges send none, and
 * then they are worked out from position differences.
 */
export function loadFlatHistory(ring: HistoryRing, flat: readonly number[], kinematics?: readonly number[]): void {
  ring.clear();
  const fromFilter = kinematics !== undefined && kinematics.length * 3 === flat.length * 2;
  for (let i = 0, k = 0; i + 2 < flat.length; i += 3, k += 2) {
    const t = flat[i], x = flat[i + 1], y = flat[i + 2];
    let speed = NaN, heading = NaN;
    if (fromFilter) {
      speed = kinematics[k];
      heading = kinematics[k + 1];
    } else if (i >= 3) {
      const dt = t - flat[i - 3];
      if (dt > 0) {
        const dx = x - flat[i - 2], dy = y - flat[i - 1];
        speed = Math.hypot(dx, dy) / dt;
        heading = polarOf(dx, dy).azimuthRad;
      }
    }
    ring.push({ timeS: t, x, y, speed, headingRad: heading });
  }
}

/** Drop detections older than the age limit, and the oldest beyond the count limit. */
export function pruneDetections(state: DashboardState, limits: StateLimits): void {
  const d = state.detections;
  let cut = Math.max(0, d.length - limits.detectionLimit);
  const oldest = state.timeS - limits.detectionAgeS;
  while (cut < d.length && d[cut].timeS < oldest) cut++;
  if (cut > 0) d.splice(0, cut);
}
