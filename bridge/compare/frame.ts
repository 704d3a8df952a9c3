/**
 * Positioner frame → radar frame. The positioner is told positions in its own axes; a bench
 * calibration (bridge/calibrate) gives the rigid transform into the radar frame: turn by θ
 * counter-clockwise (seen from above, +x right, +y up), then shift by (tx, ty). The same
 * convention as the simulator's positionerToRadar.
 */
import { makeTimedPath, type TimedPath } from './timed-path.ts';

/** A rigid 2-D transform. */
export interface FrameTransform {
  /** Counter-clockwise rotation, radians. */
  rotationRad: number;
  /** Position of the positioner origin in the radar frame, metres. */
  tx: number;
  ty: number;
}

/** The identity: commanded positions already in the radar frame. */
export const IDENTITY_FRAME: FrameTransform = { rotationRad: 0, tx: 0, ty: 0 };

/** Map a point from positioner to radar frame. */
export function toRadarFrame(x: number, y: number, f: FrameTransform): { x: number; y: number } {
  const c = Math.cos(f.rotationRad);
  const s = Math.sin(f.rotationRad);
  return { x: c * x - s * y + f.tx, y: s * x + c * y + f.ty };
}

/** A commanded path mapped into the radar frame (times and leg labels kept). */
export function pathToRadarFrame(path: TimedPath, f: FrameTransform): TimedPath {
  if (f.rotationRad === 0 && f.tx === 0 && f.ty === 0) return path;
  return makeTimedPath(path.points.map((p) => ({ ...p, ...toRadarFrame(p.x, p.y, f) })), 'commanded path', path.legs);
}
