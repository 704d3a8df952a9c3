/**
 * The bounded in-memory picture the bridge keeps for snapshots: current tracks, a short history per
 * track, the last few seconds of detections, the fixed-echo map and the commanded path. Every
 * collection has a hard cap because a lab leaves the bridge running all day.
 */
import type { Detection, FixedEcho, PositionerSample, TrackDeletion, TrackUpdate } from '../types.ts';
import type { DetectionWire, PathPointWire, TrackWire } from './protocol.ts';
import { Ring } from './ring.ts';

/** Caps of the state; copied from the resolved bridge options. */
export interface LiveStateOptions {
  /** Positions kept per track. */
  historyPoints: number;
  /** Seconds of detections kept. */
  recentDetectionsS: number;
  /** Most detections kept whatever their rate. */
  maxRecentDetections: number;
  /** Most tracks kept; the least recently updated goes first. */
  maxTracks: number;
  /** Most commanded-path points kept. */
  maxCommandedPoints: number;
}

export function resolveLiveStateOptions(o: Partial<LiveStateOptions> = {}): LiveStateOptions {
  return {
    historyPoints: o.historyPoints ?? 600,
    recentDetectionsS: o.recentDetectionsS ?? 4,
    maxRecentDetections: o.maxRecentDetections ?? 20_000,
    maxTracks: o.maxTracks ?? 500,
    maxCommandedPoints: o.maxCommandedPoints ?? 20_000,
  };
}

/** Only the wire fields: measurement and NIS stay inside the bridge. */
export function toTrackWire(u: TrackUpdate): TrackWire {
  return {
    timeS: u.timeS, id: u.id, status: u.status, x: u.x, y: u.y, vx: u.vx, vy: u.vy, speed: u.speed,
    headingRad: u.headingRad, pxx: u.pxx, pxy: u.pxy, pyy: u.pyy, quality: u.quality, moving: u.moving,
    hits: u.hits, misses: u.misses, ...(u.startS !== undefined ? { startS: u.startS } : {}),
  };
}

export function toDetectionWire(d: Detection): DetectionWire {
  return { timeS: d.timeS, azimuthRad: d.azimuthRad, rangeM: d.rangeM, amplitude: d.amplitude };
}

/** Positioner-derived commanded points closer in time than this are not kept (bounded path). */
const COMMANDED_MIN_DT_S = 0.05;

/** Points at least `stepS` apart in time (a time that goes back starts again from there). */
function thinToStep(path: PathPointWire[], stepS: number): PathPointWire[] {
  const out: PathPointWire[] = [];
  for (const p of path) {
    const last = out[out.length - 1];
    if (last && p.timeS - last.timeS < stepS && p.timeS >= last.timeS) continue;
    out.push(p);
  }
  return out;
}

export class LiveState {
  readonly options: LiveStateOptions;
  timeS = 0;
  antennaAzimuthRad: number | null = null;
  fixedEchoes: FixedEcho[] = [];
  private readonly trackMap = new Map<number, TrackWire>();
  /** Per track: [t, x, y, speed, heading] of each update, the filter's own speed and heading included. */
  private readonly historyMap = new Map<number, Ring<[number, number, number, number, number]>>();
  private readonly detections: Ring<DetectionWire>;
  /** Whole commanded paths by target ('' for one without), in the order they came. */
  private readonly commandedByTarget = new Map<string, PathPointWire[]>();
  /** True once the source sent a whole commanded path: positioner samples then no longer extend it. */
  private commandedExplicit = false;
  /**
   * Paths built from positioner samples, by positioner ('' for unnamed samples), in the order
   * they came, each with the least time between its kept points (doubled each time it hits the cap).
   */
  private readonly positionerPaths = new Map<string, { path: PathPointWire[]; stepS: number }>();

  constructor(options: Partial<LiveStateOptions> = {}) {
    this.options = resolveLiveStateOptions(options);
    this.detections = new Ring(this.options.maxRecentDetections);
  }

  reset(): void {
    this.timeS = 0;
    this.antennaAzimuthRad = null;
    this.fixedEchoes = [];
    this.trackMap.clear();
    this.historyMap.clear();
    this.detections.clear();
    // The commanded path belongs to the run, not to a replay position: a seek keeps it.
  }

  clearCommanded(): void {
    this.commandedByTarget.clear();
    this.commandedExplicit = false;
    this.positionerPaths.clear();
  }

  private advance(t: number): void {
    if (t > this.timeS) this.timeS = t;
  }

  addDetection(d: Detection): DetectionWire {
    const w = toDetectionWire(d);
    this.advance(d.timeS);
    this.detections.push(w);
    const horizon = this.timeS - this.options.recentDetectionsS;
    this.detections.dropWhile((x) => x.timeS < horizon);
    return w;
  }

  addUpdate(u: TrackUpdate): TrackWire {
    const w = toTrackWire(u);
    this.advance(u.timeS);
    // Re-insert so that Map order is "least recently updated first" for eviction.
    this.trackMap.delete(u.id);
    this.trackMap.set(u.id, w);
    let ring = this.historyMap.get(u.id);
    if (!ring) {
      ring = new Ring(this.options.historyPoints);
      this.historyMap.set(u.id, ring);
    }
    ring.push([u.timeS, u.x, u.y, u.speed, u.headingRad]);
    while (this.trackMap.size > this.options.maxTracks) {
      const oldest = this.trackMap.keys().next().value as number;
      this.removeTrack(oldest);
    }
    return w;
  }

  addDeletion(d: TrackDeletion): void {
    this.advance(d.timeS);
    this.removeTrack(d.id);
  }

  private removeTrack(id: number): void {
    this.trackMap.delete(id);
    this.historyMap.delete(id);
  }

  /** Extends the path of the sample's positioner (one per `target`), unless whole paths were given. */
  addPositioner(p: PositionerSample): void {
    this.advance(p.timeS);
    if (this.commandedExplicit) return;
    const key = p.target ?? '';
    let built = this.positionerPaths.get(key);
    if (!built) this.positionerPaths.set(key, (built = { path: [], stepS: COMMANDED_MIN_DT_S }));
    const last = built.path[built.path.length - 1];
    if (last && p.timeS - last.timeS < built.stepS && p.timeS >= last.timeS) return;
    built.path.push({ timeS: p.timeS, x: p.cmdX, y: p.cmdY });
    if (built.path.length > this.options.maxCommandedPoints) {
      // Coarser everywhere rather than forget the start: the step doubles and the whole path is
      // thinned to it once, so old and new parts keep the same resolution (dropping every other
      // point instead would thin the start again at each overflow).
      built.stepS *= 2;
      built.path = thinToStep(built.path, built.stepS);
    }
  }

  /**
   * A whole commanded path, replacing the one of the same target; returns it as kept (thinned to
   * the cap). The first target's path is also `commanded`, for clients that know only one.
   */
  setCommanded(path: PathPointWire[], target = ''): PathPointWire[] {
    if (!this.commandedExplicit) (this.commandedByTarget.clear(), this.positionerPaths.clear());
    this.commandedExplicit = true;
    const step = Math.ceil(path.length / this.options.maxCommandedPoints);
    const kept = step > 1 ? path.filter((_, i) => i % step === 0) : path.slice();
    this.commandedByTarget.set(target, kept);
    return kept;
  }

  get commanded(): PathPointWire[] {
    // The first target's path, whole or built from positioner samples.
    const first = this.commandedExplicit ? this.commandedByTarget.values().next().value : this.positionerPaths.values().next().value?.path;
    return first ?? [];
  }

  /** Every commanded path by target: the whole ones given, else those built from positioner samples. */
  get commandedPaths(): { target: string; path: PathPointWire[] }[] {
    if (!this.commandedExplicit) return [...this.positionerPaths].map(([target, built]) => ({ target, path: built.path }));
    return [...this.commandedByTarget].map(([target, path]) => ({ target, path }));
  }

  /**
   * Forgets the paths built from positioner samples (a replay seek: they are built again from the
   * run's start up to the new time, see rebuild.ts); whole paths stay.
   */
  clearPositionerPaths(): void {
    if (this.commandedExplicit) return;
    this.positionerPaths.clear();
  }

  /** Where the paths come from: given whole, built from positioner samples, or none yet. */
  get commandedFrom(): 'whole' | 'positioner' | null {
    return this.commandedExplicit ? 'whole' : this.positionerPaths.size ? 'positioner' : null;
  }

  tracks(): TrackWire[] {
    return [...this.trackMap.values()];
  }

  /**
   * Flat history per track: `points` [t, x, y, ...] and, parallel to it, `kinematics`
   * [speed, heading, ...] as the filter gave them, so a client restarting from a snapshot shows
   * the same speed and heading as live updates instead of differencing positions.
   */
  history(): { id: number; points: number[]; kinematics: number[] }[] {
    const out: { id: number; points: number[]; kinematics: number[] }[] = [];
    for (const [id, ring] of this.historyMap) {
      const rows = ring.toArray();
      const points = new Array<number>(rows.length * 3);
      const kinematics = new Array<number>(rows.length * 2);
      rows.forEach(([t, x, y, speed, heading], i) => {
        points[3 * i] = t;
        points[3 * i + 1] = x;
        points[3 * i + 2] = y;
        kinematics[2 * i] = speed;
        kinematics[2 * i + 1] = heading;
      });
      out.push({ id, points, kinematics });
    }
    return out;
  }

  recentDetections(): DetectionWire[] {
    return this.detections.toArray();
  }

  /** Replaces the tracks wholesale (from a tracker after a rebuild). History starts again from them. */
  replaceTracks(updates: TrackUpdate[]): void {
    this.trackMap.clear();
    this.historyMap.clear();
    for (const u of updates) this.addUpdate(u);
  }
}
