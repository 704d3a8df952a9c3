/**
 * Test input generator: an analytic bench run with seeded noise, built here so the comparison
 * tests do not depend on the simulator or tracker. A reflector follows the commanded path late by
 * a fixed lag; a rotating antenna measures it once per scan in polar coordinates (range and
 * azimuth noise, missed detections); a constant-velocity Kalman filter (rts.ts forward pass)
 * stands in for the tracker and writes rows like `echotrail track` does.
 */
import { col, zeros } from '../../bridge/compare/matrix.ts';
import { filterAndSmooth, type FilterStep } from '../../bridge/compare/rts.ts';
import { cvModel } from '../../bridge/compare/smoother.ts';
import { mulberry32 } from '../../bridge/sim/prng.ts';
import { sampleAt, type TimedPath } from '../../bridge/compare/timed-path.ts';
import type { TrackRow } from '../../bridge/compare/track-rows.ts';

/** The project's seeded PRNG (mulberry32, bridge/sim/prng.ts). */
export const prng = mulberry32;

/** Standard normal deviate by Box–Muller. */
export function gauss(rand: () => number): number {
  const u = Math.max(rand(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

export interface BenchRunOptions {
  seed: number;
  /** Lag of the reflector behind the command, s. */
  lagS: number;
  /** Scan period, s. */
  scanS: number;
  sigmaRangeM: number;
  sigmaAzDeg: number;
  /** Probability of detection per scan. */
  pd: number;
  /** Tracker process-noise PSD, m²/s³. */
  trackerQ: number;
  /** Time at which the tracker loses the target and restarts with a new id (none if undefined). */
  breakAtS?: number;
  /** A stationary false track at this point (id 99), or none. */
  ghost?: { x: number; y: number };
}

export interface BenchRun {
  rows: TrackRow[];
  /** True reflector position at t. */
  truth: (t: number) => { x: number; y: number };
}

/** Generate a run against `path`. */
export function benchRun(path: TimedPath, options: Partial<BenchRunOptions> = {}): BenchRun {
  const o: BenchRunOptions = { seed: 1, lagS: 0, scanS: 0.25, sigmaRangeM: 0.03, sigmaAzDeg: 1, pd: 1, trackerQ: 0.05, ...options };
  const rand = prng(o.seed);
  const truth = (t: number) => {
    const s = sampleAt(path, t - o.lagS);
    return { x: s.x, y: s.y };
  };
  const t0 = path.points[0].timeS;
  const t1 = path.points[path.points.length - 1].timeS;
  const scans: { t: number; meas?: TrackRow['meas'] }[] = [];
  for (let t = t0; t <= t1 + 1e-9; t += o.scanS) {
    if (rand() > o.pd) {
      scans.push({ t });
      continue;
    }
    const p = truth(t);
    const r = Math.hypot(p.x, p.y);
    const az = Math.atan2(p.x, p.y);
    const sa = (o.sigmaAzDeg * Math.PI) / 180;
    const rm = r + o.sigmaRangeM * gauss(rand);
    const am = az + sa * gauss(rand);
    // Linearised polar-to-Cartesian covariance (Bar-Shalom, Li & Kirubarajan 2001, §10.4.3),
    // written for azimuth clockwise from +y: θ = 90° − az.
    const th = Math.PI / 2 - am;
    const s2r = o.sigmaRangeM ** 2;
    const s2t = rm * rm * sa * sa;
    scans.push({
      t,
      meas: {
        x: rm * Math.sin(am),
        y: rm * Math.cos(am),
        sxx: s2r * Math.cos(th) ** 2 + s2t * Math.sin(th) ** 2,
        syy: s2r * Math.sin(th) ** 2 + s2t * Math.cos(th) ** 2,
        sxy: (s2r - s2t) * Math.sin(th) * Math.cos(th),
      },
    });
  }
  const rows: TrackRow[] = [];
  const pieces = o.breakAtS === undefined ? [scans] : [scans.filter((s) => s.t < o.breakAtS!), scans.filter((s) => s.t >= o.breakAtS! + 1)];
  pieces.forEach((piece, k) => rows.push(...trackPiece(piece, o.trackerQ, k + 1)));
  if (o.ghost) {
    for (const s of scans) {
      rows.push({
        timeS: s.t + 0.01, id: 99, status: 'confirmed', x: o.ghost.x + 0.02 * gauss(rand), y: o.ghost.y + 0.02 * gauss(rand),
        vx: 0, vy: 0, speed: 0, headingRad: 0,
      });
    }
    rows.sort((a, b) => a.timeS - b.timeS);
  }
  return { rows, truth };
}

/** Run the stand-in tracker over scans; the first two measured updates are tentative. */
function trackPiece(scans: { t: number; meas?: TrackRow['meas'] }[], q: number, id: number): TrackRow[] {
  const first = scans.findIndex((s) => s.meas);
  if (first < 0) return [];
  const use = scans.slice(first);
  const steps: FilterStep[] = use.map((s, k) => {
    const { F, Q } = cvModel(k === 0 ? 0 : s.t - use[k - 1].t, q);
    return s.meas ? { F, Q, z: col(s.meas.x, s.meas.y), H: [[1, 0, 0, 0], [0, 1, 0, 0]], R: [[s.meas.sxx, s.meas.sxy], [s.meas.sxy, s.meas.syy]] } : { F, Q };
  });
  const P0 = zeros(4, 4);
  P0[0][0] = P0[1][1] = 100;
  P0[2][2] = P0[3][3] = 1;
  const { filtered } = filterAndSmooth(col(use[0].meas!.x, use[0].meas!.y, 0, 0), P0, steps);
  let hits = 0;
  return use.map((s, k) => {
    if (s.meas) hits++;
    const [x, y, vx, vy] = filtered[k].x.map((r) => r[0]);
    const h = Math.atan2(vx, vy);
    return {
      timeS: s.t, id, status: hits < 3 ? 'tentative' : s.meas ? 'confirmed' : 'coasting',
      x, y, vx, vy, speed: Math.hypot(vx, vy), headingRad: h < 0 ? h + 2 * Math.PI : h, meas: s.meas,
    };
  });
}

/** Rows as a tracks CSV in the `echotrail track` column layout. */
export function tracksCsv(rows: readonly TrackRow[]): string {
  const head = 'time_s,track_id,x_m,y_m,vx_mps,vy_mps,speed_mps,heading_deg,status,quality,range_m,azimuth_deg,meas_x_m,meas_y_m,meas_sxx,meas_sxy,meas_syy,nis';
  const lines = rows.map((r) => {
    const az = Math.atan2(r.x, r.y) * (180 / Math.PI);
    const m = r.meas;
    return [r.timeS.toFixed(4), r.id, r.x, r.y, r.vx, r.vy, r.speed, (r.headingRad * 180) / Math.PI, r.status, 0.9,
      Math.hypot(r.x, r.y), az < 0 ? az + 360 : az, m?.x ?? '', m?.y ?? '', m?.sxx ?? '', m?.sxy ?? '', m?.syy ?? '', m ? 1 : ''].join(',');
  });
  return [head, ...lines].join('\n') + '\n';
}

/** A path as a commanded CSV. */
export function commandedCsv(path: TimedPath): string {
  return ['time_s,x_m,y_m', ...path.points.map((p) => `${p.timeS},${p.x},${p.y}`)].join('\n') + '\n';
}
