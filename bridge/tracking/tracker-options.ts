/** All tracker options in one typed tree, and the one place their defaults are filled in. */
import { EchotrailError } from '../errors.ts';
import { resolveFilterOptions, type FilterOptions } from './filter.ts';
import { resolveFixedEchoOptions, type FixedEchoOptions } from './fixed-echo-map.ts';
import { resolveGateOptions, type GateOptions } from './gate.ts';
import { resolveInitiationOptions, type InitiationOptions } from './m-of-n.ts';
import { resolveMeasurementOptions, type MeasurementOptions } from './measurement.ts';
import { resolveDeletionOptions, type DeletionOptions } from './track-life.ts';

export type AntennaOption = 'auto' | 'rotating' | 'staring';

export interface TrackerOptions {
  /** Antenna kind; auto = inferred from azimuth wrap-around during the warm-up. */
  antenna: AntennaOption;
  /** Revolution period (rotating) or per-target update interval (staring), s; 0 = infer. */
  intervalS: number;
  /** Estimate σ_range and σ_azimuth from stationary reflectors in the warm-up (ignored when the noise is given). */
  estimateNoise: boolean;
  /** Polar → Cartesian conversion, noise and calibration offsets. */
  measurement: MeasurementOptions;
  /** Track filter. */
  filter: FilterOptions;
  /** χ² gate. */
  gate: GateOptions;
  /** M-of-N confirmation and the speed bound of new tracks. */
  initiation: InitiationOptions;
  /** Deletion of established tracks. */
  deletion: DeletionOptions;
  /** Fixed-echo map. */
  fixedEchoes: FixedEchoOptions;
  /** Assignment batch window, s; 0 = per detection, contested clusters waiting for the beam (rotating), or half the staring interval. */
  batchS: number;
  /**
   * Rotating antenna, when `batchS` is 0: gather half a revolution before assigning. Several
   * times the throughput and half a revolution of delay: right for files (`track`), wrong for the
   * live view, which assigns each detection as the beam passes its gate.
   */
  revolutionBatches: boolean;
  /** Also report confirmed tracks that never moved (they still turn into fixed echoes unless those are off). */
  reportStationary: boolean;
  /** The warm-up ends once the antenna is settled: this many whole revolutions (rotating), or this many seconds (staring). */
  warmupRevolutions: number;
  /** Warm-up used for inference ends after this much run time at the latest, s; the noise estimate uses this much. */
  warmupS: number;
  /** ...or after this many detections, whichever comes first. */
  warmupDetections: number;
}

/** What callers pass: every field optional, nested groups partial. */
export interface TrackerOptionsInput {
  antenna?: AntennaOption;
  intervalS?: number;
  estimateNoise?: boolean;
  measurement?: Partial<MeasurementOptions>;
  filter?: Partial<FilterOptions>;
  gate?: Partial<GateOptions>;
  initiation?: Partial<InitiationOptions>;
  deletion?: Partial<DeletionOptions>;
  fixedEchoes?: Partial<FixedEchoOptions>;
  batchS?: number;
  revolutionBatches?: boolean;
  reportStationary?: boolean;
  warmupRevolutions?: number;
  warmupS?: number;
  warmupDetections?: number;
}

export function resolveTrackerOptions(o: TrackerOptionsInput = {}): TrackerOptions {
  const noiseGiven = o.measurement?.sigmaRangeM !== undefined || o.measurement?.sigmaAzimuthRad !== undefined;
  const r: TrackerOptions = {
    antenna: o.antenna ?? 'auto',
    intervalS: o.intervalS ?? 0,
    estimateNoise: o.estimateNoise ?? !noiseGiven,
    measurement: resolveMeasurementOptions(o.measurement),
    filter: resolveFilterOptions(o.filter),
    gate: resolveGateOptions(o.gate),
    initiation: resolveInitiationOptions(o.initiation),
    deletion: resolveDeletionOptions(o.deletion),
    fixedEchoes: resolveFixedEchoOptions(o.fixedEchoes),
    batchS: o.batchS ?? 0,
    revolutionBatches: o.revolutionBatches ?? false,
    reportStationary: o.reportStationary ?? false,
    warmupRevolutions: o.warmupRevolutions ?? 3,
    warmupS: o.warmupS ?? 12,
    warmupDetections: o.warmupDetections ?? 20000,
  };
  if (!['auto', 'rotating', 'staring'].includes(r.antenna)) {
    throw new EchotrailError('E_OPTION', `unknown antenna '${String(r.antenna)}': use auto, rotating or staring`);
  }
  if (!(r.intervalS >= 0) || !(r.batchS >= 0) || !(r.warmupS >= 0) || !(r.warmupRevolutions >= 1) || !(r.warmupDetections >= 1)) {
    throw new EchotrailError('E_OPTION', 'interval, batch and warm-up must be ≥ 0 s (warm-up detections ≥ 1)');
  }
  return r;
}
