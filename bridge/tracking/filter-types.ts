/** The contract every track filter fulfils, so the tracker can swap α-β, Kalman and IMM. */
import type { Measurement } from '../types.ts';

/** Predicted position and its covariance, metres / m². */
export interface PositionPrediction {
  x: number;
  y: number;
  pxx: number;
  pxy: number;
  pyy: number;
}

/** Full kinematic estimate: position, velocity (m/s) and position covariance. */
export interface FilterEstimate extends PositionPrediction {
  vx: number;
  vy: number;
}

export interface TrackFilter {
  /** Time of the current estimate, seconds. */
  readonly timeS: number;
  /** Position prediction at `t` ≥ timeS without changing the filter (for gating). */
  peek(t: number): PositionPrediction;
  /** Moves the estimate to `t` ≥ timeS (a coast, or the step before an update). */
  predict(t: number): void;
  /** Updates with a measurement taken at timeS (call predict(m.timeS) first); returns the NIS ν'S⁻¹ν. */
  update(m: Measurement): number;
  /** Current estimate. */
  estimate(): FilterEstimate;
}

/** d² = νᵀS⁻¹ν for a 2-vector ν and a symmetric 2×2 S; Infinity when S is not positive definite. */
export function mahalanobis2(nx: number, ny: number, sxx: number, sxy: number, syy: number): number {
  const det = sxx * syy - sxy * sxy;
  if (!(det > 0)) return Infinity;
  return (nx * nx * syy - 2 * nx * ny * sxy + ny * ny * sxx) / det;
}
