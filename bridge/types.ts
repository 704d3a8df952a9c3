/**
 * The data that travels through the bridge: ingest → tracking → session + server.
 *
 * Units are SI inside the program (metres, seconds, radians). Degrees appear only at the
 * edges (files, screens) and are then named so (`azimuth_deg`). The radar sits at the origin;
 * azimuth is measured clockwise from +y, so x = r·sin(az), y = r·cos(az).
 * See docs/conventions.md (binding for file formats) and the other files in docs/.
 */

/** One detection (a "plot") as it leaves the acquisition hardware or a file. */
export interface Detection {
  /** Seconds from the start of the run. */
  timeS: number;
  /** Antenna azimuth of the detection, radians clockwise from +y, in [0, 2π). */
  azimuthRad: number;
  /** Slant range from the antenna, metres. */
  rangeM: number;
  /** Detector amplitude, in the hardware's own linear units (unitless, > 0). */
  amplitude: number;
  /** Pulse-to-pulse phase of the I/Q sample, radians, when the hardware sends it. */
  phaseRad?: number;
  /** Where the detection came from in its source (file line number), for error reports. */
  line?: number;
}

/** A Cartesian position measurement with its covariance, produced from a Detection. */
export interface Measurement {
  timeS: number;
  x: number;
  y: number;
  /** Covariance entries of (x, y), m². */
  rxx: number;
  rxy: number;
  ryy: number;
}

/** Life-cycle stage of a track. */
export type TrackStatus = 'tentative' | 'confirmed' | 'coasting';

/** The state of one track after an update (measurement or coast). */
export interface TrackUpdate {
  timeS: number;
  /** Stable id, unique within a run, never reused. */
  id: number;
  status: TrackStatus;
  /** Position, metres. */
  x: number;
  y: number;
  /** Velocity, m/s. */
  vx: number;
  vy: number;
  /** |v|, m/s. */
  speed: number;
  /** Direction of the velocity, radians clockwise from +y, in [0, 2π). */
  headingRad: number;
  /** Position covariance (x, y), m². */
  pxx: number;
  pxy: number;
  pyy: number;
  /** 0..1; rises with hits and consistent innovations, falls with misses. */
  quality: number;
  /** True while the target moves or moved recently (not a fixed echo). */
  moving: boolean;
  /** Number of updates with a detection so far. */
  hits: number;
  /** Consecutive scans without a detection. */
  misses: number;
  /**
   * Time of the track's first detection, s: where its age counts from, even for a client that
   * joins late or a replay that seeks (absent in sessions recorded before it was added).
   */
  startS?: number;
  /** The measurement used in this update, absent on a coast. */
  measurement?: Measurement;
  /** Normalised innovation squared of this update (ν'S⁻¹ν), absent on a coast. */
  nis?: number;
}

/** A track that ended. */
export interface TrackDeletion {
  timeS: number;
  id: number;
  reason: 'misses' | 'covariance' | 'fixed-echo' | 'merged';
}

/** A cell of the fixed-echo map: a persistent, stationary reflector. */
export interface FixedEcho {
  x: number;
  y: number;
  rangeM: number;
  azimuthRad: number;
  /** Number of revolutions (or seconds, for a staring antenna) it has been seen in. */
  seen: number;
  /** Mean amplitude of its detections. */
  amplitude: number;
}

/** What the tracker returns after each call. */
export interface TrackerOutput {
  updates: TrackUpdate[];
  deletions: TrackDeletion[];
}

/** The engine contract the rest of the bridge codes against (implemented in tracking/tracker.ts). */
export interface TrackEngine {
  /** Feed one detection; detections must come in time order. */
  push(detection: Detection): TrackerOutput;
  /** Process whatever is buffered (end of file, pause in the stream). */
  flush(): TrackerOutput;
  /** Current tracks, all stages. */
  tracks(): TrackUpdate[];
  /** Current fixed-echo map. */
  fixedEchoes(): FixedEcho[];
}

/** Positioner record: where the positioner was told to be and where it says it is. */
export interface PositionerSample {
  timeS: number;
  /** Commanded position, metres, radar frame unless the bench config says otherwise. */
  cmdX: number;
  cmdY: number;
  /** Measured (encoder) position, when reported. */
  measX?: number;
  measY?: number;
  /**
   * Which positioner or carriage, on a bench with several (the same names as the commanded
   * paths' targets); absent on a bench with one.
   */
  target?: string;
}

/** Antenna record: pointing direction at a time (also the heartbeat of the device). */
export interface AntennaSample {
  timeS: number;
  azimuthRad: number;
}
