/**
 * The baseline tracker of the tracking benchmarks (track, track-cli): built directly on npm
 * `kalman-filter`, with none of the project's gating, assignment or clutter handling.
 */
import kf from 'kalman-filter';
import type { Detection } from '../bridge/types.ts';

/**
 * The baseline: what one writes first with `kalman-filter` — per detection, the nearest track
 * within 1 m (a scan over all tracks), the library's predict/correct with a constant-velocity
 * model, a new track otherwise; tracks unseen for 3 s are dropped. `onUpdate` receives each
 * track update (for writing it out); returns the number of updates.
 */
export function kalmanBaseline(dets: Iterable<Detection>, onUpdate?: (timeS: number, id: number, x: number, y: number, vx: number, vy: number) => void): number {
  const filter = new kf.KalmanFilter({
    observation: { dimension: 2, stateProjection: [[1, 0, 0, 0], [0, 0, 1, 0]], covariance: [[0.0025, 0], [0, 0.0025]] },
    dynamic: {
      dimension: 4,
      transition: [[1, 1, 0, 0], [0, 1, 0, 0], [0, 0, 1, 1], [0, 0, 0, 1]],
      covariance: [[0.01, 0, 0, 0], [0, 0.01, 0, 0], [0, 0, 0.01, 0], [0, 0, 0, 0.01]],
    },
  });
  type T = { id: number; x: number; y: number; t: number; state: InstanceType<typeof kf.State> };
  let tracks: T[] = [];
  let lastPrune = 0;
  let nextId = 1;
  let updates = 0;
  for (const d of dets) {
    const x = d.rangeM * Math.sin(d.azimuthRad);
    const y = d.rangeM * Math.cos(d.azimuthRad);
    let best: T | null = null;
    let bd = 1;
    for (const t of tracks) {
      const dd = Math.hypot(t.x - x, t.y - y);
      if (dd < bd) {
        bd = dd;
        best = t;
      }
    }
    if (best) {
      const pred = filter.predict({ previousCorrected: best.state });
      best.state = filter.correct({ predicted: pred, observation: [x, y] });
      best.x = best.state.mean[0][0];
      best.y = best.state.mean[2][0];
      best.t = d.timeS;
      updates++;
      onUpdate?.(d.timeS, best.id, best.x, best.y, best.state.mean[1][0], best.state.mean[3][0]);
    } else {
      tracks.push({ id: nextId++, x, y, t: d.timeS, state: new kf.State({ mean: [[x], [0], [y], [0]], covariance: [[0.01, 0, 0, 0], [0, 1, 0, 0], [0, 0, 0.01, 0], [0, 0, 0, 1]] }) });
    }
    if (d.timeS - lastPrune > 1) {
      lastPrune = d.timeS;
      tracks = tracks.filter((t) => d.timeS - t.t < 3);
    }
  }
  return updates;
}
