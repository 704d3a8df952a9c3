/**
 * WebSocket protocol between the bridge and the dashboard, version 1.
 *
 * Shared by bridge/ and web/: both sides validate what they receive with these schemas.
 * Every frame is a JSON text frame holding one object with a `type`. SI units and radians,
 * as inside the program; the dashboard converts to degrees for display.
 * The prose description with examples is docs/protocol.md; keep both in step.
 */
import { z } from 'zod';
import { POSITIONER_ID_RE } from '../ingest/line-protocol.ts';

export const PROTOCOL_VERSION = 1;

const finite = z.number().finite();

export const trackWire = z.object({
  timeS: finite,
  id: z.number().int().nonnegative(),
  status: z.enum(['tentative', 'confirmed', 'coasting']),
  x: finite,
  y: finite,
  vx: finite,
  vy: finite,
  speed: finite,
  headingRad: finite,
  pxx: finite,
  pxy: finite,
  pyy: finite,
  quality: finite,
  moving: z.boolean(),
  hits: z.number().int().nonnegative(),
  misses: z.number().int().nonnegative(),
  /** Time of the track's first detection, s (optional within protocol 1: older sessions lack it). */
  startS: finite.optional(),
});
export type TrackWire = z.infer<typeof trackWire>;

export const detectionWire = z.object({
  timeS: finite,
  azimuthRad: finite,
  rangeM: finite,
  amplitude: finite,
  /** True when the fixed-echo map explains this detection. */
  fixed: z.boolean().optional(),
});
export type DetectionWire = z.infer<typeof detectionWire>;

export const deletionWire = z.object({
  timeS: finite,
  id: z.number().int().nonnegative(),
  reason: z.enum(['misses', 'covariance', 'fixed-echo', 'merged']),
});
export type DeletionWire = z.infer<typeof deletionWire>;

export const fixedEchoWire = z.object({
  x: finite,
  y: finite,
  rangeM: finite,
  azimuthRad: finite,
  seen: finite,
  amplitude: finite,
});

export const pathPointWire = z.object({ timeS: finite, x: finite, y: finite });
export type PathPointWire = z.infer<typeof pathPointWire>;

export const positionerWire = z.object({
  timeS: finite,
  cmdX: finite,
  cmdY: finite,
  measX: finite.optional(),
  measY: finite.optional(),
  /** Which positioner or carriage, on a bench with several (the line protocol's `id=`). */
  target: z.string().regex(POSITIONER_ID_RE).optional(),
});
export type PositionerWire = z.infer<typeof positionerWire>;

export const sourceStatus = z.object({
  /** What feeds the bridge. */
  kind: z.enum(['serial', 'replay', 'none']),
  /** live: data arriving; waiting: port absent, reopening with backoff; paused/ended: replay. */
  state: z.enum(['live', 'waiting', 'disconnected', 'playing', 'paused', 'ended']),
  /** Serial path or session name. */
  name: z.string(),
  /** Lines that failed to parse or checksum since the source opened. */
  badLines: z.number().int().nonnegative(),
  /** The most recent bad line: its number and why it was refused. */
  lastBad: z.object({ line: z.number().int(), reason: z.string() }).nullable(),
  detectionsPerSecond: finite,
  /** Time from a line arriving to its update leaving, ms (median over the last second). */
  latencyMs: finite.nullable(),
  /** Recording in progress: the session file name, or null. Error text if recording failed. */
  recording: z.string().nullable(),
  recordingError: z.string().nullable(),
});
export type SourceStatus = z.infer<typeof sourceStatus>;

export const replayState = z.object({
  sessionId: z.string(),
  durationS: finite,
  positionS: finite,
  speed: finite,
  playing: z.boolean(),
  /** The current session starts over when it ends. */
  loop: z.boolean(),
  /**
   * When the bridge plays a list of sessions in turn (the demo): this one's place in it and
   * whether the list starts over after the last (added within protocol 1, optional).
   */
  playlist: z.object({ index: z.number().int().nonnegative(), count: z.number().int().positive(), loops: z.boolean() }).optional(),
});
export type ReplayState = z.infer<typeof replayState>;

export const comparisonFigures = z.object({
  timeS: finite,
  /** Samples compared so far. */
  samples: z.number().int().nonnegative(),
  rmseM: finite.nullable(),
  /** Latest signed cross-track error (left of the path is positive), metres. */
  crossTrackM: finite.nullable(),
  /** Latest along-track error (ahead is positive), metres. */
  alongTrackM: finite.nullable(),
  maxErrorM: finite.nullable(),
  /** Estimated lag of the track behind the commanded path, seconds. */
  lagS: finite.nullable(),
  /** Track id compared with the commanded path. */
  trackId: z.number().int().nullable(),
  /**
   * Which commanded path these figures are against, when the run commands several (one per
   * positioner or carriage; POSITIONER_PATH_ID for the path built from positioner records,
   * DEFAULT_PATH_ID for one given whole without a target). Added within protocol 1, optional:
   * absent means the one commanded path.
   */
  pathId: z.string().optional(),
});

/**
 * `pathId` of the path built from unnamed positioner samples; samples that name their positioner
 * (`pos … id=NAME`) build the path NAME, as a commanded path of that target would be named.
 */
export const POSITIONER_PATH_ID = 'positioner';
/** `pathId` of a commanded path given without a target. */
export const DEFAULT_PATH_ID = 'commanded';
export type ComparisonFigures = z.infer<typeof comparisonFigures>;

export const sessionInfo = z.object({
  id: z.string(),
  name: z.string(),
  startUtc: z.string(),
  durationS: finite,
  detections: z.number().int().nonnegative(),
  tracks: z.number().int().nonnegative(),
  hasCommanded: z.boolean(),
  /** False when the file has no closing summary: the recording was cut off (kill -9, power) or is still going. */
  closed: z.boolean().optional(),
});
export type SessionInfo = z.infer<typeof sessionInfo>;

/** Server → client. */
export const serverMessage = z.discriminatedUnion('type', [
  z.object({ type: z.literal('hello'), protocol: z.literal(PROTOCOL_VERSION), server: z.string() }),
  z.object({
    type: z.literal('snapshot'),
    /** Sequence number of the next `scan` this client will get (added in v1, optional). */
    seq: z.number().int().nonnegative().optional(),
    timeS: finite,
    source: sourceStatus,
    tracks: z.array(trackWire),
    /**
     * Recent history per track: flat [t0, x0, y0, t1, x1, y1, ...] for compactness. `kinematics`
     * (optional, added within protocol 1) runs parallel: [speed0, heading0, speed1, heading1, ...],
     * the filter's speed (m/s) and heading (rad) at each point.
     */
    history: z.array(z.object({ id: z.number().int(), points: z.array(finite), kinematics: z.array(finite).optional() })),
    detections: z.array(detectionWire),
    fixedEchoes: z.array(fixedEchoWire),
    /** The first (or only) commanded path. */
    commanded: z.array(pathPointWire),
    /** Every commanded path by target, when the run commands several (optional, within protocol 1). */
    commandedPaths: z.array(z.object({ target: z.string(), path: z.array(pathPointWire) })).optional(),
    /**
     * Where the paths come from (optional, within protocol 1): given whole (`commanded` messages,
     * never extended), or built from positioner samples, which the scans' `positioner` samples
     * extend, each by its `target`. Absent: no path yet, or a bridge that predates the field.
     */
    commandedFrom: z.enum(['whole', 'positioner']).optional(),
    /**
     * The running RMSE of each compared path so far, flat [t0, rmse0, t1, rmse1, …] at ≥ 0.25 s
     * spacing (optional, within protocol 1): a client draws its chart from it after joining or a
     * seek; `comparison` messages carry the figures of the moment.
     */
    comparisonHistory: z.array(z.object({ pathId: z.string(), points: z.array(finite) })).optional(),
    replay: replayState.nullable(),
  }),
  z.object({
    type: z.literal('scan'),
    /**
     * Increases by one per scan the bridge produces (added in v1, optional). A gap means this client
     * was lagging and skipped scans; a fresh snapshot follows once it catches up.
     */
    seq: z.number().int().nonnegative().optional(),
    timeS: finite,
    detections: z.array(detectionWire),
    updates: z.array(trackWire),
    deletions: z.array(deletionWire),
    antennaAzimuthRad: finite.nullable(),
    positioner: z.array(positionerWire),
  }),
  z.object({ type: z.literal('fixed-echoes'), echoes: z.array(fixedEchoWire) }),
  z.object({ type: z.literal('source'), source: sourceStatus }),
  z.object({ type: z.literal('replay'), replay: replayState }),
  /** A commanded path; `target` names it when the run commands several (optional, within protocol 1). */
  z.object({ type: z.literal('commanded'), path: z.array(pathPointWire), target: z.string().optional() }),
  z.object({
    type: z.literal('comparison'),
    figures: comparisonFigures,
    /**
     * The running RMSE since the previous `comparison` message of the same path, flat
     * [t0, rmse0, t1, rmse1, …] (optional, within protocol 1): a fast replay moves many seconds
     * of run between two messages, and the chart should not skip them.
     */
    recent: z.array(finite).optional(),
  }),
  z.object({ type: z.literal('sessions'), sessions: z.array(sessionInfo) }),
  z.object({ type: z.literal('error'), code: z.string(), message: z.string() }),
]);
export type ServerMessage = z.infer<typeof serverMessage>;

/** Client → server. Kept small; the server caps frame size (maxPayload) as well. */
export const clientMessage = z.discriminatedUnion('type', [
  z.object({
    type: z.literal('control'),
    /** step-back: added within protocol 1. */
    action: z.enum(['play', 'pause', 'step', 'step-back', 'seek', 'speed', 'loop']),
    /**
     * seek: seconds from start; speed: factor 0.1–50; loop: 1 or 0; step, step-back: seconds
     * (default one antenna revolution as recorded, else 0.5 s), then paused.
     */
    value: finite.optional(),
  }),
  z.object({ type: z.literal('open-session'), sessionId: z.string().max(200) }),
  z.object({ type: z.literal('list-sessions') }),
]);
export type ClientMessage = z.infer<typeof clientMessage>;
