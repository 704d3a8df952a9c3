/**
 * The little linear algebra calibration needs: ordinary least squares with the parameter
 * covariance from the normal equations, for at most a handful of unknowns.
 *
 * Model y = A·x + e, e ~ N(0, σ²I): x̂ = (AᵀA)⁻¹Aᵀy, σ̂² = RSS/(n − p),
 * cov(x̂) = σ̂²(AᵀA)⁻¹ (Bar-Shalom, Li & Kirubarajan 2001, §3.4, linear LS; also any regression
 * text, e.g. Draper & Smith, Applied Regression Analysis, ch. 5).
 */
import { EchotrailError } from '../errors.ts';

export interface LeastSquaresResult {
  /** Estimated parameters. */
  x: number[];
  /** Parameter covariance σ̂²(AᵀA)⁻¹. */
  cov: number[][];
  /** Standard errors √diag(cov). */
  se: number[];
  /** Residuals y − A·x̂, in row order. */
  residuals: number[];
  /** Residual variance estimate RSS/(n − p). */
  sigma2: number;
  /** Degrees of freedom n − p. */
  dof: number;
}

/** Inverse of a small symmetric positive-definite matrix by Gauss–Jordan; null when singular. */
export function invertSmall(m: number[][]): number[][] | null {
  const n = m.length;
  const a = m.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  const scale = Math.max(...m.map((row, i) => Math.abs(row[i])), 1e-300);
  for (let c = 0; c < n; c++) {
    let piv = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r][c]) > Math.abs(a[piv][c])) piv = r;
    // Relative pivot test: a column that is (nearly) a combination of the others is singular.
    if (Math.abs(a[piv][c]) <= 1e-12 * scale) return null;
    [a[c], a[piv]] = [a[piv], a[c]];
    const p = a[c][c];
    for (let k = 0; k < 2 * n; k++) a[c][k] /= p;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = a[r][c];
      if (f !== 0) for (let k = 0; k < 2 * n; k++) a[r][k] -= f * a[c][k];
    }
  }
  return a.map((row) => row.slice(n));
}

/** Ordinary least squares; throws E_CALIBRATION with `what` when the design is singular or too short. */
export function leastSquares(rows: number[][], y: number[], what: string): LeastSquaresResult {
  const n = rows.length;
  const p = rows[0]?.length ?? 0;
  if (n <= p) throw new EchotrailError('E_CALIBRATION', `${what}: ${n} usable detections for ${p} unknowns; record longer or add reflectors`);
  const ata = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const aty = new Array<number>(p).fill(0);
  for (let i = 0; i < n; i++) {
    const r = rows[i];
    for (let j = 0; j < p; j++) {
      aty[j] += r[j] * y[i];
      for (let k = 0; k < p; k++) ata[j][k] += r[j] * r[k];
    }
  }
  const inv = invertSmall(ata);
  if (!inv) throw new EchotrailError('E_CALIBRATION', `${what}: the unknowns cannot be told apart from these positions (singular normal equations)`);
  const x = inv.map((row) => row.reduce((s, v, k) => s + v * aty[k], 0));
  const residuals = rows.map((r, i) => y[i] - r.reduce((s, v, k) => s + v * x[k], 0));
  const dof = n - p;
  const sigma2 = residuals.reduce((s, e) => s + e * e, 0) / dof;
  const cov = inv.map((row) => row.map((v) => v * sigma2));
  return { x, cov, se: cov.map((row, i) => Math.sqrt(row[i])), residuals, sigma2, dof };
}

/** Median of a non-empty list (copy sorted). */
export function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

/** Robust scale 1.4826·MAD, equal to σ for Gaussian data (common practice). */
export function robustSigma(v: number[]): number {
  const m = median(v);
  return 1.4826 * median(v.map((x) => Math.abs(x - m)));
}
