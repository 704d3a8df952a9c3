/**
 * Target trajectories: each spec (plain JSON, so a scenario file can hold it) becomes a function
 * of time giving position and velocity in the positioner's frame, metres and m/s.
 * Angles in specs are degrees and named so; azimuth-like angles run clockwise from +y.
 */
import { segmentedMotion, trapezoidMove, type AccelSegment } from './motion.ts';
import { waypointTrajectory, type WaypointSpec } from './waypoints.ts';

export interface Point {
  x: number;
  y: number;
}

/** Position and velocity at one instant. */
export interface KinematicState {
  x: number;
  y: number;
  vx: number;
  vy: number;
}

export type Trajectory = (tS: number) => KinematicState;

export type TrajectorySpec =
  | { kind: 'static'; at: Point }
  | { kind: 'line'; from: Point; to: Point; speedMps: number; accelMps2?: number; startS?: number }
  | { kind: 'circle'; center: Point; radiusM: number; periodS: number; startAngleDeg?: number; clockwise?: boolean }
  | { kind: 'figure-eight'; center: Point; widthM: number; heightM: number; periodS: number; rotationDeg?: number }
  | { kind: 'rail'; from: Point; to: Point; speedMps: number; dwellS?: number; accelMps2?: number; stops?: { at: number; dwellS: number }[] }
  | { kind: 'profile'; start: Point; headingDeg: number; speedMps?: number; segments: AccelSegment[] }
  | { kind: 'waypoints'; points: WaypointSpec[]; speedMps: number; accelMps2?: number; loop?: boolean };

const DEG = Math.PI / 180;

/** Builds the function of time for a spec. */
export function makeTrajectory(spec: TrajectorySpec): Trajectory {
  switch (spec.kind) {
    case 'static':
      return () => ({ x: spec.at.x, y: spec.at.y, vx: 0, vy: 0 });
    case 'line': {
      const len = Math.hypot(spec.to.x - spec.from.x, spec.to.y - spec.from.y);
      const ux = len > 0 ? (spec.to.x - spec.from.x) / len : 0;
      const uy = len > 0 ? (spec.to.y - spec.from.y) / len : 0;
      const move = trapezoidMove(len, spec.speedMps, spec.accelMps2 ?? Infinity);
      const t0 = spec.startS ?? 0;
      return (t) => {
        const { s, v } = move.at(t - t0);
        return { x: spec.from.x + ux * s, y: spec.from.y + uy * s, vx: ux * v, vy: uy * v };
      };
    }
    case 'circle': {
      const w = ((spec.clockwise ?? true) ? 1 : -1) * (2 * Math.PI) / spec.periodS;
      const phi0 = (spec.startAngleDeg ?? 0) * DEG;
      const r = spec.radiusM;
      return (t) => {
        const phi = phi0 + w * t; // clockwise from +y, like azimuth
        return { x: spec.center.x + r * Math.sin(phi), y: spec.center.y + r * Math.cos(phi), vx: r * w * Math.cos(phi), vy: -r * w * Math.sin(phi) };
      };
    }
    case 'figure-eight': {
      // Lissajous 1:2 curve x' = a·sin ωt, y' = b·sin 2ωt, rotated counter-clockwise by rotationDeg.
      const w = (2 * Math.PI) / spec.periodS;
      const a = spec.widthM / 2;
      const b = spec.heightM / 2;
      const c = Math.cos((spec.rotationDeg ?? 0) * DEG);
      const s = Math.sin((spec.rotationDeg ?? 0) * DEG);
      return (t) => {
        const px = a * Math.sin(w * t);
        const py = b * Math.sin(2 * w * t);
        const qx = a * w * Math.cos(w * t);
        const qy = 2 * b * w * Math.cos(2 * w * t);
        return { x: spec.center.x + c * px - s * py, y: spec.center.y + s * px + c * py, vx: c * qx - s * qy, vy: s * qx + c * qy };
      };
    }
    case 'rail': {
      // Back and forth between the ends, dwelling at each end and at the intermediate stops.
      const lerp = (f: number): Point => ({ x: spec.from.x + f * (spec.to.x - spec.from.x), y: spec.from.y + f * (spec.to.y - spec.from.y) });
      const stops = [...(spec.stops ?? [])].filter((st) => st.at > 0 && st.at < 1).sort((p, q) => p.at - q.at);
      const dwell = spec.dwellS ?? 0;
      const points: WaypointSpec[] = [
        { ...spec.from, dwellS: dwell },
        ...stops.map((st) => ({ ...lerp(st.at), dwellS: st.dwellS })),
        { ...spec.to, dwellS: dwell },
        ...[...stops].reverse().map((st) => ({ ...lerp(st.at), dwellS: st.dwellS })),
      ];
      return waypointTrajectory(points, spec.speedMps, spec.accelMps2 ?? Infinity, true);
    }
    case 'profile': {
      const along = segmentedMotion(spec.speedMps ?? 0, spec.segments);
      const ux = Math.sin(spec.headingDeg * DEG);
      const uy = Math.cos(spec.headingDeg * DEG);
      return (t) => {
        const { s, v } = along(t);
        return { x: spec.start.x + ux * s, y: spec.start.y + uy * s, vx: ux * v, vy: uy * v };
      };
    }
    case 'waypoints':
      return waypointTrajectory(spec.points, spec.speedMps, spec.accelMps2 ?? Infinity, spec.loop ?? false);
  }
}
