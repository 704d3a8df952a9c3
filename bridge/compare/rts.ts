/**
 * Linear Kalman filter forward pass and fixed-interval Rauch–Tung–Striebel smoother backward pass.
 *
 * Rauch, Tung & Striebel, "Maximum likelihood estimates of linear dynamic systems", AIAA Journal
 * 3(8):1445–1450, 1965. In the usual modern notation (Bar-Shalom, Li & Kirubarajan 2001, §8.6):
 *   C_k = P_k|k F_kᵀ P_k+1|k⁻¹
 *   x_k|N = x_k|k + C_k (x_k+1|N − x_k+1|k)
 *   P_k|N = P_k|k + C_k (P_k+1|N − P_k+1|k) C_kᵀ
 * Steps may lack a measurement (coasts): they are predicted only, and the smoother runs through
 * them unchanged. Generic in the state size so that a scalar case can be checked by hand.
 */
import { add, inverse, mul, sub, symmetrise, transpose, type Mat } from './matrix.ts';

/** One step of the model: the transition into this step and an optional measurement at it. */
export interface FilterStep {
  /** Transition from the previous step (ignored on the first step). */
  F: Mat;
  /** Process noise of that transition. */
  Q: Mat;
  /** Measurement z = H x + v, v ~ N(0, R); absent when this step has no measurement. */
  z?: Mat;
  H?: Mat;
  R?: Mat;
}

/** Forward and backward estimates at each step. */
export interface SmootherResult {
  /** x_k|k, P_k|k. */
  filtered: { x: Mat; P: Mat }[];
  /** x_k|N, P_k|N. */
  smoothed: { x: Mat; P: Mat }[];
}

/**
 * Run the filter from the prior (x0, P0), taken as the predicted state at the first step, then the
 * RTS pass back over every step.
 */
export function filterAndSmooth(x0: Mat, P0: Mat, steps: readonly FilterStep[]): SmootherResult {
  const predicted: { x: Mat; P: Mat }[] = [];
  const filtered: { x: Mat; P: Mat }[] = [];
  for (let k = 0; k < steps.length; k++) {
    const s = steps[k];
    let x: Mat;
    let P: Mat;
    if (k === 0) {
      x = x0;
      P = P0;
    } else {
      const prev = filtered[k - 1];
      x = mul(s.F, prev.x);
      P = symmetrise(add(mul(mul(s.F, prev.P), transpose(s.F)), s.Q));
    }
    predicted.push({ x, P });
    if (s.z && s.H && s.R) {
      const Ht = transpose(s.H);
      const S = add(mul(mul(s.H, P), Ht), s.R);
      const K = mul(mul(P, Ht), inverse(S));
      x = add(x, mul(K, sub(s.z, mul(s.H, x))));
      // Joseph form: stays positive definite with the small R of a precise range measurement.
      const IKH = sub(identityLike(P), mul(K, s.H));
      P = symmetrise(add(mul(mul(IKH, P), transpose(IKH)), mul(mul(K, s.R), transpose(K))));
    }
    filtered.push({ x, P });
  }
  const smoothed: { x: Mat; P: Mat }[] = new Array(steps.length);
  if (steps.length === 0) return { filtered, smoothed };
  smoothed[steps.length - 1] = filtered[steps.length - 1];
  for (let k = steps.length - 2; k >= 0; k--) {
    const f = filtered[k];
    const next = predicted[k + 1];
    const C = mul(mul(f.P, transpose(steps[k + 1].F)), inverse(next.P));
    const x = add(f.x, mul(C, sub(smoothed[k + 1].x, next.x)));
    const P = symmetrise(add(f.P, mul(mul(C, sub(smoothed[k + 1].P, next.P)), transpose(C))));
    smoothed[k] = { x, P };
  }
  return { filtered, smoothed };
}

function identityLike(P: Mat): Mat {
  return P.map((row, i) => row.map((_, j) => (i === j ? 1 : 0)));
}
