/**
 * Time alignment: the lag L of the tracked path behind the commanded one, track(t) ≈ cmd(t − L).
 * It collects positioner latency, radar update interval and filter lag in one number. Estimated
 * by least squares: J(L) = mean |p_i − cmd(t_i − L)|² on a grid of candidate lags, then refined by
 * golden-section search (Kiefer 1953) inside the bracket around the best grid point. J is piecewise
 * quadratic in L for a piecewise-linear path, so it is unimodal near its minimum once the grid step
 * is below the path's leg durations.
 */
import type { Point } from './geometry.ts';
import { sampleAt, timeSpan, type TimedPath } from './timed-path.ts';

/** Search settings. */
export interface LagOptions {
  /** Largest lag considered either way, seconds. */
  maxLagS: number;
  /** Grid step of the coarse search, seconds. */
  stepS: number;
  /** Width at which the refinement stops, seconds. */
  toleranceS: number;
  /**
   * Second pass without outliers: samples further than this from the command shifted by the first
   * estimate are dropped and the search repeated, metres (Infinity: one pass). Squared errors
   * let a few metres of a straying track outweigh hundreds of good samples otherwise.
   */
  inlierM: number;
}

/** Defaults: bench lags are a few tenths of a second (common practice); 2 s covers a slow filter. */
export function resolveLagOptions(o: Partial<LagOptions> = {}): LagOptions {
  return { maxLagS: o.maxLagS ?? 2, stepS: o.stepS ?? 0.05, toleranceS: o.toleranceS ?? 1e-4, inlierM: o.inlierM ?? Infinity };
}

/** Outcome of the lag search. */
export interface LagEstimate {
  /** Lag of the track behind the commanded path, seconds; null when the path does not move. */
  lagS: number | null;
  /** Root of J at the estimate and at zero lag, metres. */
  rmsAtLagM: number;
  rmsAtZeroM: number;
  /** The coarse cost curve, for the report. */
  curve: { lagS: number; rmsM: number }[];
  /** Samples used (after the outlier pass); rmsAtLagM and rmsAtZeroM are both over these. */
  samples: number;
  /** Samples dropped as outliers by the second pass. */
  outliers: number;
}

/** Mean squared distance between samples and the commanded path shifted by lag. */
export function lagCost(path: TimedPath, samples: readonly (Point & { timeS: number })[], lagS: number): number {
  let sum = 0;
  for (const s of samples) {
    const c = sampleAt(path, s.timeS - lagS);
    sum += (s.x - c.x) ** 2 + (s.y - c.y) ** 2;
  }
  return sum / samples.length;
}

const GOLDEN = (Math.sqrt(5) - 1) / 2;

/** Estimate the lag from tracked samples (time, position) against a commanded path. */
export function estimateLag(path: TimedPath, all: readonly (Point & { timeS: number })[], options: Partial<LagOptions> = {}): LagEstimate {
  const o = resolveLagOptions(options);
  const first = searchLag(path, all, o);
  if (!Number.isFinite(o.inlierM) || first.lagS === null) return first;
  const inliers = inliersAt(path, all, first.lagS, o.inlierM);
  if (inliers.length === all.length || inliers.length < 10) return first;
  // Both RMS figures of the answer are over the second pass's samples (the inliers), so that
  // rmsAtLagM ≤ rmsAtZeroM compares like with like.
  const second = searchLag(path, inliers, o);
  return { ...second, outliers: all.length - inliers.length };
}

/** The samples within `inlierM` of the commanded point `lagS` earlier: the outlier rule of the second pass. */
export function inliersAt<T extends Point & { timeS: number }>(path: TimedPath, samples: readonly T[], lagS: number, inlierM: number): T[] {
  return samples.filter((s) => {
    const c = sampleAt(path, s.timeS - lagS);
    return Math.hypot(s.x - c.x, s.y - c.y) <= inlierM;
  });
}

/**
 * The samples the search uses: those whose shifted time stays on the path for every candidate
 * (otherwise the clamped ends would reward lags that push samples off the path), or, when under
 * ten are left, those inside the path's span.
 */
export function searchSamples<T extends { timeS: number }>(path: TimedPath, all: readonly T[], maxLagS: number): T[] {
  const { startS, endS } = timeSpan(path);
  const samples = all.filter((s) => s.timeS - maxLagS >= startS && s.timeS + maxLagS <= endS);
  return samples.length >= 10 ? samples : all.filter((s) => s.timeS >= startS && s.timeS <= endS);
}

function searchLag(path: TimedPath, all: readonly (Point & { timeS: number })[], o: LagOptions): LagEstimate {
  const samples = searchSamples(path, all, o.maxLagS);
  const rmsAtZeroM = samples.length ? Math.sqrt(lagCost(path, samples, 0)) : NaN;
  const moved = samples.length >= 2 &&
    Math.abs(sampleAt(path, samples[samples.length - 1].timeS).alongM - sampleAt(path, samples[0].timeS).alongM) > 1e-3;
  if (!moved) return { lagS: null, rmsAtLagM: rmsAtZeroM, rmsAtZeroM, curve: [], samples: samples.length, outliers: 0 };
  const n = Math.round(o.maxLagS / o.stepS);
  const curve: { lagS: number; rmsM: number }[] = [];
  let best = 0;
  for (let k = -n; k <= n; k++) {
    const lag = k * o.stepS;
    curve.push({ lagS: lag, rmsM: Math.sqrt(lagCost(path, samples, lag)) });
    if (curve[curve.length - 1].rmsM < curve[best].rmsM) best = curve.length - 1;
  }
  let a = curve[Math.max(0, best - 1)].lagS;
  let b = curve[Math.min(curve.length - 1, best + 1)].lagS;
  let c = b - GOLDEN * (b - a);
  let d = a + GOLDEN * (b - a);
  let fc = lagCost(path, samples, c);
  let fd = lagCost(path, samples, d);
  while (b - a > o.toleranceS) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - GOLDEN * (b - a);
      fc = lagCost(path, samples, c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + GOLDEN * (b - a);
      fd = lagCost(path, samples, d);
    }
  }
  const lagS = (a + b) / 2;
  return { lagS, rmsAtLagM: Math.sqrt(lagCost(path, samples, lagS)), rmsAtZeroM, curve, samples: samples.length, outliers: 0 };
}
