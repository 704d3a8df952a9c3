/**
 * Filter consistency from the normalised innovation squared, NIS = νᵀS⁻¹ν.
 *
 * For a consistent filter each NIS is χ² with n_z = 2 degrees of freedom, and the time average of
 * K of them, times K, is χ² with K·n_z degrees of freedom; the two-sided 95% acceptance interval
 * of the average is [χ²_{Kn}(0.025)/K, χ²_{Kn}(0.975)/K] (Bar-Shalom, Li & Kirubarajan,
 * *Estimation with Applications to Tracking and Navigation*, 2001, §5.4.2, time-average NIS).
 * Above it the filter is over-confident (innovations bigger than it believes), below it
 * under-confident. Innovations of a real filter are somewhat correlated in time, so the interval
 * is a guide, not a test at exactly 5%.
 */
import quantile from '@stdlib/stats-base-dists-chisquare-quantile';

export type NisVerdict = 'consistent' | 'over-confident' | 'under-confident';

export interface NisStats {
  /** Number of NIS values. */
  count: number;
  /** Measurement dimension (2: x, y). */
  dof: number;
  mean: number;
  /** 95% two-sided interval of the mean for a consistent filter. */
  lower: number;
  upper: number;
  verdict: NisVerdict;
  /** Fraction above the single-update 95% χ² quantile (5% expected when consistent). */
  fractionAbove95: number;
  /** That quantile (5.9915 for 2 dof). */
  single95: number;
}

/** Interval of the time-averaged NIS of `count` values (probability mass `confidence` inside). */
export function nisBounds(count: number, dof = 2, confidence = 0.95): { lower: number; upper: number } {
  const a = (1 - confidence) / 2;
  return { lower: quantile(a, count * dof) / count, upper: quantile(1 - a, count * dof) / count };
}

export function nisStats(values: number[], dof = 2): NisStats {
  const count = values.length;
  const mean = count ? values.reduce((a, b) => a + b, 0) / count : NaN;
  const { lower, upper } = count ? nisBounds(count, dof) : { lower: NaN, upper: NaN };
  const single95 = quantile(0.95, dof);
  const verdict: NisVerdict = mean > upper ? 'over-confident' : mean < lower ? 'under-confident' : 'consistent';
  return { count, dof, mean, lower, upper, verdict, fractionAbove95: count ? values.filter((v) => v > single95).length / count : NaN, single95 };
}

/** One line for people: "mean NIS 2.07 over 412 updates, 95% bounds [1.81, 2.20]: consistent". */
export function describeNis(s: NisStats): string {
  const advice = s.verdict === 'over-confident' ? ' (innovations larger than the filter expects: raise the process noise or σ)' : s.verdict === 'under-confident' ? ' (innovations smaller than expected: the noise settings can come down)' : '';
  return `mean NIS ${s.mean.toFixed(3)} over ${s.count} updates, 95% bounds [${s.lower.toFixed(3)}, ${s.upper.toFixed(3)}], ${(100 * s.fractionAbove95).toFixed(1)}% above ${s.single95.toFixed(2)}: ${s.verdict}${advice}`;
}
