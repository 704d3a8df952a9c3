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
  /**
   * A disc holding every measurement the gate admits at `t` (d² < gamma) when the measurement's
   * covariance has largest eigenvalue at most `rMax` m²: for the spatial index. An IMM must cover
   * its manoeuvre model's gate, which reaches far beyond its combined covariance. Written into
   * `out` (the gate index computes several per placement) and returned.
   */
  gateDisc(t: number, gamma: number, rMax: number, out: GateDisc): GateDisc;
  /**
   * Gate statistic d² = νᵀS⁻¹ν of a measurement against the prediction at its time, and ln|S|;
   * the tracker gates on d2 and prices the pair at d2 + logDetS. Does not change the filter.
   * The result may be a shared object: read it before the next gate() call.
   */
  gate(m: Measurement): GateResult;
}

/** Centre and radius of a disc, metres. */
export interface GateDisc {
  x: number;
  y: number;
  r: number;
}

/** Largest eigenvalue of a symmetric 2×2 matrix. */
export function lambdaMax(a: number, b: number, c: number): number {
  const h = 0.5 * (a - c);
  return 0.5 * (a + c) + Math.sqrt(h * h + b * b);
}

/** The disc of a single Gaussian gate: the prediction ± √(γ·(λmax(P) + rMax)), into `out`. */
export function discOf(p: PositionPrediction, gamma: number, rMax: number, out: GateDisc): GateDisc {
  out.x = p.x;
  out.y = p.y;
  out.r = Math.sqrt(gamma * (lambdaMax(p.pxx, p.pxy, p.pyy) + rMax));
  return out;
}

/** The smallest disc holding two discs, into `out` (which may be `a` or `b`). */
export function enclosingDisc(a: GateDisc, b: GateDisc, out: GateDisc = { x: 0, y: 0, r: 0 }): GateDisc {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  // sqrt, not Math.hypot: this runs for every track placement, and hypot is several times slower.
  const d = Math.sqrt(dx * dx + dy * dy);
  let x: number;
  let y: number;
  let r: number;
  if (d + b.r <= a.r) {
    x = a.x;
    y = a.y;
    r = a.r;
  } else if (d + a.r <= b.r) {
    x = b.x;
    y = b.y;
    r = b.r;
  } else {
    r = 0.5 * (d + a.r + b.r);
    // The centre lies on the line between the two, r − a.r from a's centre.
    const k = (r - a.r) / d;
    x = a.x + k * dx;
    y = a.y + k * dy;
  }
  out.x = x;
  out.y = y;
  out.r = r;
  return out;
}

export interface GateResult {
  d2: number;
  logDetS: number;
  /** d² under the filter's most probable model (the IMM's; d2 for single-model filters). */
  d2Likely?: number;
}

/** d² and ln|S| of `m` against a position prediction (S = P + R). */
export function gateAgainst(p: PositionPrediction, m: Measurement): GateResult {
  const sxx = p.pxx + m.rxx;
  const sxy = p.pxy + m.rxy;
  const syy = p.pyy + m.ryy;
  return { d2: mahalanobis2(m.x - p.x, m.y - p.y, sxx, sxy, syy), logDetS: Math.log(sxx * syy - sxy * sxy) };
}

/** d² = νᵀS⁻¹ν for a 2-vector ν and a symmetric 2×2 S; Infinity when S is not positive definite. */
export function mahalanobis2(nx: number, ny: number, sxx: number, sxy: number, syy: number): number {
  const det = sxx * syy - sxy * sxy;
  if (!(det > 0)) return Infinity;
  return (nx * nx * syy - 2 * nx * ny * sxy + ny * ny * sxx) / det;
}
