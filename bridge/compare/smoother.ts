/**
 * Hindsight estimate of the followed target: our own constant-velocity Kalman filter run forward
 * over the measurements the tracker used (the tracks CSV's meas_* columns with their covariances),
 * then the Rauch–Tung–Striebel pass backward (rts.ts). The tracker's own x,y stay the "filtered"
 * figures (what the live view showed); this gives the "smoothed" ones.
 *
 * Model per axis (Bar-Shalom, Li & Kirubarajan 2001, §6.2.2, continuous white-noise acceleration):
 *   F = [[1, T], [0, 1]], Q = q̃·[[T³/3, T²/2], [T²/2, T]]; state order (x, y, vx, vy).
 */
import { col, zeros, type Mat } from './matrix.ts';
import { filterAndSmooth, type FilterStep } from './rts.ts';
import type { TrackRow } from './track-rows.ts';

/** Smoother settings. */
export interface SmootherOptions {
  /** Power spectral density q̃ of the white-noise acceleration, m²/s³, both axes. */
  accelPsd: number;
  /** Prior velocity standard deviation at the first measurement, m/s. */
  initialSpeedStdMps: number;
}

/**
 * Defaults. q̃ = 0.05 m²/s³. The rule of thumb q̃ ≈ Δv²/Δt (common practice) gives 0.25 m²/s³ for a
 * 0.5 m/s positioner reversing within a second, the hardest bench manoeuvre; the smoother sees the
 * whole run, before and after, so it follows such a change with a fifth of that and smooths the
 * glides better (chosen on the demo scenarios, not derived).
 */
export function resolveSmootherOptions(o: Partial<SmootherOptions> = {}): SmootherOptions {
  return { accelPsd: o.accelPsd ?? 0.05, initialSpeedStdMps: o.initialSpeedStdMps ?? 1 };
}

/** A smoothed (or own-filtered) state at a track row's time. */
export interface SmoothedState {
  timeS: number;
  /** Track id of the row it belongs to. */
  id: number;
  x: number;
  y: number;
  vx: number;
  vy: number;
  /** Position variance, m². */
  pxx: number;
  pyy: number;
}

/** Transition and process noise of the CV model over dt. */
export function cvModel(dt: number, q: number): { F: Mat; Q: Mat } {
  const F = [
    [1, 0, dt, 0],
    [0, 1, 0, dt],
    [0, 0, 1, 0],
    [0, 0, 0, 1],
  ];
  const a = (q * dt ** 3) / 3;
  const b = (q * dt ** 2) / 2;
  const c = q * dt;
  const Q = [
    [a, 0, b, 0],
    [0, a, 0, b],
    [b, 0, c, 0],
    [0, b, 0, c],
  ];
  return { F, Q };
}

const H = [
  [1, 0, 0, 0],
  [0, 1, 0, 0],
];

/**
 * Smooth a time-ordered series of rows of one target. Rows before the first measured one are
 * skipped (nothing to start from). Returns null when no row carries a measurement.
 */
export function smoothTrack(
  rows: readonly TrackRow[],
  options: Partial<SmootherOptions> = {},
): { offset: number; filtered: SmoothedState[]; smoothed: SmoothedState[] } | null {
  const o = resolveSmootherOptions(options);
  const first = rows.findIndex((r) => r.meas !== undefined);
  if (first < 0) return null;
  const use = rows.slice(first);
  const steps: FilterStep[] = use.map((r, k) => {
    const dt = k === 0 ? 0 : r.timeS - use[k - 1].timeS;
    const { F, Q } = cvModel(dt, o.accelPsd);
    if (!r.meas) return { F, Q };
    return { F, Q, z: col(r.meas.x, r.meas.y), H, R: [[r.meas.sxx, r.meas.sxy], [r.meas.sxy, r.meas.syy]] };
  });
  const m0 = use[0].meas!;
  const x0 = col(m0.x, m0.y, use[0].vx, use[0].vy);
  const P0 = zeros(4, 4);
  // Velocity prior wide, position prior wide too: the first update then sets the position from the
  // measurement alone (the prior barely weighs in).
  P0[0][0] = P0[1][1] = 100;
  P0[2][2] = P0[3][3] = o.initialSpeedStdMps ** 2;
  const res = filterAndSmooth(x0, P0, steps);
  const toState = (e: { x: Mat; P: Mat }, k: number): SmoothedState => ({
    timeS: use[k].timeS,
    id: use[k].id,
    x: e.x[0][0],
    y: e.x[1][0],
    vx: e.x[2][0],
    vy: e.x[3][0],
    pxx: e.P[0][0],
    pyy: e.P[1][1],
  });
  // offset: index in `rows` of the first state (states[k] belongs to rows[offset + k]).
  return { offset: first, filtered: res.filtered.map(toState), smoothed: res.smoothed.map(toState) };
}
