/**
 * How sure is the lag? A confidence interval for the least-squares lag of lag.ts by the moving-block
 * bootstrap (H. R. Künsch, "The jackknife and the bootstrap for general stationary observations",
 * Annals of Statistics 17(3):1217–1241, 1989): the samples are cut into overlapping blocks of
 * consecutive samples, a run is rebuilt from blocks drawn with replacement, its lag found again,
 * and the interval is the percentile interval of those lags (B. Efron & R. J. Tibshirani, "An
 * Introduction to the Bootstrap", 1993, §13.3). Blocks, not single samples, because the errors
 * of a tracked (and still more of a smoothed) path are correlated over several updates; the block
 * length grows as n^(1/3) (P. Hall, J. L. Horowitz & B.-Y. Jing, "On blocking rules for the
 * bootstrap with dependent data", Biometrika 82(3):561–574, 1995), at least five samples.
 * (References from memory.)
 *
 * A bootstrap rather than the curvature of the cost curve: the curvature gives σ²/Σ|v|² for
 * independent errors, which the correlated errors of a filtered track make several times too
 * small. A lag whose interval holds zero is "not significant"; one whose interval reaches the edge
 * of the search window is undetermined (the cost curve is flat).
 *
 * Each replicate re-runs the grid search on the precomputed per-sample squared distances (prefix
 * sums per candidate lag), refined by the parabola through the grid minimum and its neighbours
 * (common practice), so a few hundred replicates cost less than the search itself.
 */
import type { Point } from './geometry.ts';
import { inliersAt, searchSamples, type LagOptions } from './lag.ts';
import { sampleAt, type TimedPath } from './timed-path.ts';
import { mulberry32 } from '../sim/prng.ts';

/** Bootstrap settings. */
export interface LagIntervalOptions {
  /** Bootstrap replicates. */
  replicates: number;
  /** Coverage of the interval, 0–1. */
  level: number;
  /** Seed of the resampling, so a report is reproducible. */
  seed: number;
}

/** Defaults: 400 replicates put the 2.5 % and 97.5 % points on 10 replicates each (common practice). */
export function resolveLagIntervalOptions(o: Partial<LagIntervalOptions> = {}): LagIntervalOptions {
  return { replicates: o.replicates ?? 400, level: o.level ?? 0.95, seed: o.seed ?? 1 };
}

/** The interval and what it says. */
export interface LagInterval {
  lowS: number;
  highS: number;
  /** Coverage, e.g. 0.95. */
  level: number;
  /** Zero lies outside the interval. */
  significant: boolean;
  /** The interval reaches the edge of the search window: the data do not fix the lag. */
  undetermined: boolean;
  /** Samples and block length (samples) used. */
  samples: number;
  blockLength: number;
}

/** Grid minimum refined by the parabola through it and its neighbours. */
function gridMinimum(cost: Float64Array, lags: readonly number[]): number {
  let best = 0;
  for (let g = 1; g < cost.length; g++) if (cost[g] < cost[best]) best = g;
  if (best === 0 || best === cost.length - 1) return lags[best];
  const [a, b, c] = [cost[best - 1], cost[best], cost[best + 1]];
  const den = a - 2 * b + c;
  const step = lags[best + 1] - lags[best];
  return den > 0 ? lags[best] + (0.5 * (a - c) / den) * step : lags[best];
}

/**
 * Confidence interval of the lag `lagS` found by estimateLag on `all` (the same samples and
 * options), or null when there are too few samples (under 20) to resample.
 */
export function lagInterval(path: TimedPath, all: readonly (Point & { timeS: number })[], lagS: number, lag: LagOptions, options: Partial<LagIntervalOptions> = {}): LagInterval | null {
  const o = resolveLagIntervalOptions(options);
  let samples = searchSamples(path, all, lag.maxLagS);
  // The same outlier rule as the estimate's second pass.
  if (Number.isFinite(lag.inlierM)) {
    const inliers = inliersAt(path, samples, lagS, lag.inlierM);
    if (inliers.length >= 10) samples = inliers;
  }
  const n = samples.length;
  if (n < 20) return null;
  const steps = Math.round(lag.maxLagS / lag.stepS);
  const lags = Array.from({ length: 2 * steps + 1 }, (_, k) => (k - steps) * lag.stepS);
  // prefix[g][i]: sum of squared distances of samples 0…i−1 at candidate lag g.
  const prefix = lags.map((L) => {
    const p = new Float64Array(n + 1);
    samples.forEach((s, i) => {
      const c = sampleAt(path, s.timeS - L);
      p[i + 1] = p[i] + (s.x - c.x) ** 2 + (s.y - c.y) ** 2;
    });
    return p;
  });
  const blockLength = Math.min(n, Math.max(5, Math.ceil(n ** (1 / 3))));
  const blocks = Math.ceil(n / blockLength);
  // Seeded (the simulator's mulberry32), so the interval does not change between runs.
  const random = mulberry32(o.seed);
  const estimates: number[] = [];
  const cost = new Float64Array(lags.length);
  for (let r = 0; r < o.replicates; r++) {
    cost.fill(0);
    for (let b = 0; b < blocks; b++) {
      const start = Math.floor(random() * (n - blockLength + 1));
      for (let g = 0; g < lags.length; g++) cost[g] += prefix[g][start + blockLength] - prefix[g][start];
    }
    estimates.push(gridMinimum(cost, lags));
  }
  estimates.sort((a, b) => a - b);
  const at = (q: number) => estimates[Math.min(estimates.length - 1, Math.max(0, Math.round(q * (estimates.length - 1))))];
  // Widened to hold the point estimate itself: with few samples the refined lagS (found off the
  // grid the bootstrap re-estimates on) can fall just outside the percentile interval.
  const lowS = Math.min(at((1 - o.level) / 2), lagS);
  const highS = Math.max(at(1 - (1 - o.level) / 2), lagS);
  const edge = lag.maxLagS - lag.stepS / 2;
  return { lowS, highS, level: o.level, significant: lowS > 0 || highS < 0, undetermined: lowS <= -edge || highS >= edge, samples: n, blockLength };
}
