/**
 * Synthetic stream for the plan benchmark: `tracks` targets on slow loops inside the coverage,
 * one scan message per call with an update and a detection per target. Deterministic.
 */
import type { ServerMessage, TrackWire } from '../../bridge/server/protocol.ts';

export function positionAt(id: number, t: number): { x: number; y: number } {
  const cx = 3 * Math.sin(id * 1.7), cy = 3 * Math.cos(id * 1.7) + 1;
  const r = 0.4 + 0.05 * (id % 7);
  const w = 0.05 + 0.01 * (id % 5);
  return { x: cx + r * Math.sin(w * t + id) + 0.1 * Math.sin(t * 0.9 + id), y: cy + r * Math.cos(w * t + id) };
}

export function scanAt(tracks: number, t: number, dt: number): ServerMessage {
  const updates: TrackWire[] = [];
  const detections = [];
  for (let id = 1; id <= tracks; id++) {
    const p = positionAt(id, t), q = positionAt(id, t - dt);
    const vx = (p.x - q.x) / dt, vy = (p.y - q.y) / dt;
    const h = Math.atan2(vx, vy);
    updates.push({ timeS: t, id, status: 'confirmed', x: p.x, y: p.y, vx, vy, speed: Math.hypot(vx, vy),
      headingRad: h < 0 ? h + 2 * Math.PI : h, pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.9, moving: true, hits: 1, misses: 0 });
    const az = Math.atan2(p.x, p.y);
    detections.push({ timeS: t, azimuthRad: az < 0 ? az + 2 * Math.PI : az, rangeM: Math.hypot(p.x, p.y), amplitude: 1 });
  }
  return { type: 'scan', timeS: t, detections, updates, deletions: [], antennaAzimuthRad: (t * 2 * Math.PI) % (2 * Math.PI), positioner: [] };
}
