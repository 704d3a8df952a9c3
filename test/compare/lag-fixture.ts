/**
 * A commanded path with dwells, turns and speed changes, and a tracked path that follows it a
 * known lag behind with Gaussian noise: the shared input of the lag tests (lag.ts, lag-interval.ts).
 */
import { sampleAt } from '../../bridge/compare/timed-path.ts';
import { waypointsToPath } from '../../bridge/compare/waypoints.ts';
import { gauss, prng } from './bench-run.ts';

export const path = waypointsToPath([
  { x: -1, y: 2, dwellS: 1 },
  { x: 1, y: 2, speedMps: 0.4 },
  { x: 1, y: 4, speedMps: 0.3, dwellS: 1 },
  { x: -1, y: 3, speedMps: 0.5 },
  { x: -1, y: 2, speedMps: 0.4 },
]);

/** Samples every 0.25 s of the path `lagS` behind, with `noiseM` of noise per axis. */
export function shifted(lagS: number, noiseM: number, seed = 3) {
  const rand = prng(seed);
  const out = [];
  for (let t = 0; t <= path.points[path.points.length - 1].timeS; t += 0.25) {
    const c = sampleAt(path, t - lagS);
    out.push({ timeS: t, x: c.x + noiseM * gauss(rand), y: c.y + noiseM * gauss(rand) });
  }
  return out;
}
