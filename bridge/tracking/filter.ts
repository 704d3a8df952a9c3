/** Filter selection: builds the configured TrackFilter for a new track. */
import type { Measurement } from '../types.ts';
import { EchotrailError } from '../errors.ts';
import { AlphaBetaFilter, kalataGains, trackingIndex } from './alpha-beta.ts';
import type { TrackFilter } from './filter-types.ts';
import { ImmCv2 } from './imm.ts';
import { KalmanCv } from './kalman-cv.ts';
import type { ProcessNoiseModel } from './process-noise.ts';

export type FilterKind = 'imm' | 'kalman' | 'alpha-beta';

export interface FilterOptions {
  /** imm (default: CV at two noise levels), kalman (single CV) or alpha-beta. */
  kind: FilterKind;
  /** Process-noise model for kalman and imm: dwna or cwna. */
  processNoise: ProcessNoiseModel;
  /** σ_a of the single-model Kalman filter and of Kalata's tracking index, m/s². */
  sigmaAccel: number;
  /** IMM quiet-model σ_a, m/s². */
  sigmaLow: number;
  /** IMM manoeuvre-model σ_a, m/s². */
  sigmaHigh: number;
  /** IMM mean sojourn in the quiet model, s. */
  sojournLowS: number;
  /** IMM mean sojourn in the manoeuvre model, s. */
  sojournHighS: number;
  /** Fixed α for alpha-beta; null = from Kalata's tracking index. */
  alpha: number | null;
  /** Fixed β for alpha-beta; null = from Kalata's tracking index. */
  beta: number | null;
}

/**
 * Defaults sized for a motorised positioner (common practice for such benches, values chosen
 * here, not from a source): speeds up to ~1 m/s, accelerations of a few tenths of m/s² while
 * gliding and up to ~1 m/s² at starts, stops and reversals.
 */
export function resolveFilterOptions(o: Partial<FilterOptions> = {}): FilterOptions {
  const r: FilterOptions = {
    kind: o.kind ?? 'imm',
    processNoise: o.processNoise ?? 'dwna',
    sigmaAccel: o.sigmaAccel ?? 0.3,
    sigmaLow: o.sigmaLow ?? 0.05,
    sigmaHigh: o.sigmaHigh ?? 1.0,
    sojournLowS: o.sojournLowS ?? 10,
    sojournHighS: o.sojournHighS ?? 2,
    alpha: o.alpha ?? null,
    beta: o.beta ?? null,
  };
  if (!['imm', 'kalman', 'alpha-beta'].includes(r.kind)) {
    throw new EchotrailError('E_OPTION', `unknown filter '${String(r.kind)}': use imm, kalman or alpha-beta`);
  }
  if (r.processNoise !== 'dwna' && r.processNoise !== 'cwna') {
    throw new EchotrailError('E_OPTION', `unknown process noise '${String(r.processNoise)}': use dwna or cwna`);
  }
  for (const k of ['sigmaAccel', 'sigmaLow', 'sigmaHigh', 'sojournLowS', 'sojournHighS'] as const) {
    if (!(r[k] > 0)) throw new EchotrailError('E_OPTION', `filter option ${k} must be positive`);
  }
  if ((r.alpha === null) !== (r.beta === null)) {
    throw new EchotrailError('E_OPTION', 'give both α and β for a fixed-gain filter, or neither');
  }
  return r;
}

/**
 * A new filter started on one measurement. `intervalS` is the nominal time between detections of
 * one target (revolution period, or the staring update interval): Kalata's index needs it.
 */
export function createFilter(m: Measurement, o: FilterOptions, sigmaVel0: number, intervalS: number): TrackFilter {
  switch (o.kind) {
    case 'kalman':
      return new KalmanCv(m, { model: o.processNoise, sigmaAccel: o.sigmaAccel, sigmaVel0 });
    case 'imm':
      return new ImmCv2(m, {
        model: o.processNoise,
        sigmaLow: o.sigmaLow,
        sigmaHigh: o.sigmaHigh,
        sojournLowS: o.sojournLowS,
        sojournHighS: o.sojournHighS,
        sigmaVel0,
      });
    case 'alpha-beta': {
      if (o.alpha !== null && o.beta !== null) return new AlphaBetaFilter(m, o.alpha, o.beta);
      const sigmaV = Math.sqrt(0.5 * (m.rxx + m.ryy));
      const g = kalataGains(trackingIndex(o.sigmaAccel, intervalS, sigmaV));
      return new AlphaBetaFilter(m, Math.min(g.alpha, 0.99), g.beta);
    }
  }
}
