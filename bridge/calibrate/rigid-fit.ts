/**
 * Closed-form 2-D rigid fit (rotation + translation, no scale, no reflection) between two sets of
 * paired points: find R(φ), t minimising Σ wᵢ‖qᵢ − (R·pᵢ + t)‖².
 *
 * This is the Kabsch / Umeyama solution (Umeyama, "Least-squares estimation of transformation
 * parameters between two point patterns", IEEE PAMI 13(4):376–380, 1991, eqs. 40–42 with c = 1):
 * centre both sets, R from the SVD of the cross-covariance with the determinant correction. In
 * 2-D the SVD collapses to one angle, φ = atan2(Σ w(p′ₓq′ᵧ − p′ᵧq′ₓ), Σ w(p′ₓq′ₓ + p′ᵧq′ᵧ))
 * (our own algebra, checked in the tests against a brute-force search), and t = q̄ − R·p̄.
 * φ is counter-clockwise (positive turns +x towards +y), as in bridge/sim/scenario.ts.
 *
 * Uncertainty (linearised LS, isotropic residuals, common practice): σ̂² = RSS/(2n − 3),
 * var φ ≈ σ̂²/Σw‖p′‖², var tₖ ≈ σ̂²/Σw + (∂(R·p̄)ₖ/∂φ)²·var φ.
 */
import { EchotrailError } from '../errors.ts';

export interface XY {
  x: number;
  y: number;
}

export interface RigidFitOptions {
  /** Accept points on a straight line (a rail run); see the note at `fitRigid2D`. Default false. */
  allowCollinear?: boolean;
  /** Least RMS spread of the source points about their centroid, m (default 0.1). */
  minSpreadM?: number;
}

export interface RigidFit {
  /** Counter-clockwise rotation, radians, and its standard error. */
  rotationRad: number;
  rotationSeRad: number;
  /** Translation (radar frame) and its standard errors, m. */
  translation: XY;
  translationSe: XY;
  /** qᵢ − (R·pᵢ + t), per pair. */
  residuals: XY[];
  /** RMS of the residual vector length, m. */
  rmsM: number;
  /** Largest residual length, m. */
  maxM: number;
  /** Per-axis residual std σ̂, m. */
  sigmaM: number;
  /** The source points lie on a straight line (only when allowed): the shift along it also holds any lag. */
  collinear: boolean;
  pairs: number;
}

export function resolveRigidFitOptions(o: RigidFitOptions = {}): Required<RigidFitOptions> {
  return { allowCollinear: o.allowCollinear ?? false, minSpreadM: o.minSpreadM ?? 0.1 };
}

/** Applies p ↦ R(φ)·p + t. */
export function applyRigid(p: XY, rotationRad: number, t: XY): XY {
  const c = Math.cos(rotationRad);
  const s = Math.sin(rotationRad);
  return { x: c * p.x - s * p.y + t.x, y: s * p.x + c * p.y + t.y };
}

/**
 * Fits q ≈ R·p + t. Refuses (E_CALIBRATION) fewer than 3 pairs, source points without spread, and,
 * unless allowed, collinear source points: on a straight path a tracker's lag along the line is
 * indistinguishable from a translation along it, and the rotation rests on the cross-track
 * offsets alone.
 */
export function fitRigid2D(p: XY[], q: XY[], options?: RigidFitOptions, w?: number[]): RigidFit {
  const o = resolveRigidFitOptions(options);
  const n = p.length;
  if (n !== q.length) throw new EchotrailError('E_CALIBRATION', `frame fit: ${n} source points but ${q.length} targets`);
  if (n < 3) throw new EchotrailError('E_CALIBRATION', `frame fit: ${n} point pairs; at least 3 are needed`);
  const wt = (i: number) => (w ? w[i] : 1);
  let sw = 0, px = 0, py = 0, qx = 0, qy = 0;
  for (let i = 0; i < n; i++) {
    sw += wt(i); px += wt(i) * p[i].x; py += wt(i) * p[i].y; qx += wt(i) * q[i].x; qy += wt(i) * q[i].y;
  }
  px /= sw; py /= sw; qx /= sw; qy /= sw;
  let sxx = 0, sxy = 0, syy = 0, num = 0, den = 0;
  for (let i = 0; i < n; i++) {
    const ax = p[i].x - px, ay = p[i].y - py, bx = q[i].x - qx, by = q[i].y - qy;
    sxx += wt(i) * ax * ax; sxy += wt(i) * ax * ay; syy += wt(i) * ay * ay;
    num += wt(i) * (ax * by - ay * bx);
    den += wt(i) * (ax * bx + ay * by);
  }
  // Eigenvalues of the source scatter: spread along the two principal axes.
  const tr = sxx + syy;
  const disc = Math.sqrt(Math.max(0, ((sxx - syy) / 2) ** 2 + sxy * sxy));
  const l1 = tr / 2 + disc;
  const l2 = tr / 2 - disc;
  if (Math.sqrt(tr / sw) < o.minSpreadM) {
    throw new EchotrailError('E_CALIBRATION', `frame fit: the positions spread only ${(Math.sqrt(tr / sw) * 100).toFixed(1)} cm about their centre (need ≥ ${o.minSpreadM * 100} cm): the rotation is undetermined; use a run that moves`);
  }
  if (!o.allowCollinear && l2 < 1e-3 * l1) {
    throw new EchotrailError('E_CALIBRATION', 'frame fit: the positions lie on a straight line, so tracking lag along it cannot be told from a shift; use a 2-D path (circle, figure-eight, waypoints), or accept that (calibrate frame --allow-line; "Allow a straight-line path" in the dashboard)');
  }
  const phi = Math.atan2(num, den);
  const c = Math.cos(phi), s = Math.sin(phi);
  const t = { x: qx - (c * px - s * py), y: qy - (s * px + c * py) };
  const residuals = q.map((qi, i) => {
    const m = applyRigid(p[i], phi, t);
    return { x: qi.x - m.x, y: qi.y - m.y };
  });
  const rss = residuals.reduce((a, r, i) => a + wt(i) * (r.x * r.x + r.y * r.y), 0);
  const dof = Math.max(1, 2 * n - 3);
  const sigma2 = rss / dof; // variance of unit weight
  const varPhi = sigma2 / tr;
  const dx = -s * px - c * py; // ∂(R·p̄)/∂φ
  const dy = c * px - s * py;
  const lens = residuals.map((r) => Math.hypot(r.x, r.y));
  return {
    rotationRad: phi,
    rotationSeRad: Math.sqrt(varPhi),
    translation: t,
    translationSe: { x: Math.sqrt(sigma2 / sw + dx * dx * varPhi), y: Math.sqrt(sigma2 / sw + dy * dy * varPhi) },
    residuals,
    rmsM: Math.sqrt(lens.reduce((a, l) => a + l * l, 0) / n),
    maxM: Math.max(...lens),
    sigmaM: Math.sqrt(sigma2),
    pairs: n,
    collinear: l2 < 1e-3 * l1,
  };
}
