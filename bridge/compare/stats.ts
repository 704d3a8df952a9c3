/**
 * Summary figures of an error series: RMSE, mean, max, 95th percentile (simple-statistics; its
 * quantile is the linear-interpolation definition, Hyndman & Fan 1996 type 7).
 */
import { max, mean, quantile, rootMeanSquare } from 'simple-statistics';
import type { Deviation } from './deviation.ts';

/** Figures of one quantity; null when there are no samples. */
export interface ErrorFigures {
  n: number;
  rmse: number | null;
  mean: number | null;
  max: number | null;
  p95: number | null;
}

/** Figures of a list of values (absolute value taken for max and p95 of signed quantities). */
export function figuresOf(values: readonly number[], signed = false): ErrorFigures {
  if (values.length === 0) return { n: 0, rmse: null, mean: null, max: null, p95: null };
  const abs = signed ? values.map(Math.abs) : [...values];
  return {
    n: values.length,
    rmse: rootMeanSquare([...values]),
    mean: mean([...values]),
    max: max(abs),
    p95: quantile(abs, 0.95),
  };
}

/** All figures of a group of deviations. */
export interface DeviationSummary {
  /** Euclidean position error, metres. */
  position: ErrorFigures;
  /** Along-track (ahead +), metres; mean shows a systematic lead or lag. */
  along: ErrorFigures;
  /** Cross-track (left +), metres; mean shows a systematic offset to one side. */
  cross: ErrorFigures;
  /** Speed error, m/s. */
  speed: ErrorFigures;
  /** Heading error, degrees (converted at this edge for reading). */
  headingDeg: ErrorFigures;
}

/** Summarise deviations. */
export function summarise(devs: readonly Deviation[]): DeviationSummary {
  const speeds = devs.flatMap((d) => (d.speedMps === null ? [] : [d.speedMps]));
  const headings = devs.flatMap((d) => (d.headingRad === null ? [] : [(d.headingRad * 180) / Math.PI]));
  return {
    position: figuresOf(devs.map((d) => d.positionM)),
    along: figuresOf(devs.map((d) => d.alongM), true),
    cross: figuresOf(devs.map((d) => d.crossM), true),
    speed: figuresOf(speeds, true),
    headingDeg: figuresOf(headings, true),
  };
}
