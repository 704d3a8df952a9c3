/**
 * The warm-up decisions of the tracker in one place: antenna kind, update interval, batch window
 * and measurement noise, each either given by the user, inferred from the run, or a default, and
 * a plain-words summary of them for stderr.
 */
import type { Detection } from '../types.ts';
import { inferAntenna, type AntennaKind } from './antenna-inference.ts';
import { estimateNoise } from './noise-estimate.ts';
import type { TrackerOptions } from './tracker-options.ts';

export type Origin = 'option' | 'inferred' | 'default';

export interface TrackerInference {
  antenna: AntennaKind;
  antennaFrom: Origin;
  /** Time between two detections of one target (revolution period when rotating), s. */
  intervalS: number;
  intervalFrom: Origin;
  /** Assignment batch window, s; 0 = per detection, clusters waiting for the beam to pass their gates. */
  batchS: number;
  sigmaRangeM: number;
  sigmaAzimuthRad: number;
  noiseFrom: Origin;
  /** Stationary reflectors the noise estimate used (0 when not estimated). */
  noiseReflectors: number;
  /** True while the noise estimate is still collecting detections (the defaults apply meanwhile). */
  noisePending: boolean;
  /** Run time from which the noise figures apply, s. */
  noiseFromS: number;
  /** Detections looked at before tracking started. */
  warmupDetections: number;
  /** Run time at which tracking started, s. */
  warmupEndS: number;
  /** Share of azimuth steps forward (rotating antennas are near 1). */
  forwardFraction: number;
  /** Detections ignored because their time went backwards. */
  outOfOrder: number;
}

/**
 * True once the buffered detections settle the antenna: a rotating antenna after `revolutions`
 * whole revolutions between azimuth wraps, nearly all steps forward; a staring one (no wraps)
 * after `stareS` of run with a repeating interval.
 */
export function antennaSettled(dets: readonly Detection[], revolutions: number, stareS: number): boolean {
  if (dets.length < 3) return false;
  const a = inferAntenna(dets);
  if (a.kind === 'rotating') return a.wraps >= revolutions + 1 && a.forwardFraction >= 0.95 && a.periodS > 0;
  return a.wraps === 0 && dets[dets.length - 1].timeS - dets[0].timeS >= stareS && a.intervalS > 0;
}

/**
 * Decides everything the warm-up decides, from the buffered detections. With `noiseLater` the
 * noise stays at its defaults for now (noisePending), to be estimated by decideNoise from a
 * longer stretch of the run.
 */
export function decide(dets: readonly Detection[], o: TrackerOptions, noiseLater = false): TrackerInference {
  const a = inferAntenna(dets);
  const antenna: AntennaKind = o.antenna === 'auto' ? a.kind : o.antenna;
  const antennaFrom: Origin = o.antenna !== 'auto' ? 'option' : dets.length >= 3 ? 'inferred' : 'default';
  let intervalS = o.intervalS;
  let intervalFrom: Origin = 'option';
  if (!(intervalS > 0)) {
    const guess = antenna === 'rotating' ? a.periodS : a.intervalS;
    if (antenna === a.kind && guess > 0 && Number.isFinite(guess)) {
      intervalS = guess;
      intervalFrom = 'inferred';
    } else {
      // Nothing to go by: a mid-range revolution for a rotating antenna, 100 Hz for staring.
      intervalS = antenna === 'rotating' ? 1 : 0.01;
      intervalFrom = 'default';
    }
  }
  // Rotating: no fixed batch (0): each detection is assigned as it comes, except for the clusters
  // of tracks and detections whose gates the beam has not yet swept past, which wait for it (see
  // sweep-deferral.ts). An update then leaves a small fraction of a revolution after its
  // detection, yet neighbours still compete for the detections of one sweep together; a track
  // cannot take a second detection later in the same sweep (the tracker's half-revolution rule),
  // which is what made wall reflectors chain along when batches were short before.
  // With `revolutionBatches` (files, where delay does not matter) a rotating antenna is batched
  // half a revolution: the shortest time between two hits of one target (the tracker's
  // MIN_GAP_REVOLUTIONS), so that no batch ever holds two detections of one target, the second
  // of which the track could not take. Batches of a whole revolution did hold two whenever a
  // target moved against the beam, and on the demo scenarios (6 × 10 seeded runs) split tracks
  // twice as often as assigning each detection as it comes; half-revolution batches come within
  // a few per cent of it (ids on target 90 against 85, coverage 75.5 % against 75.4 %).
  const batchS = o.batchS > 0 ? o.batchS : antenna !== 'rotating' ? intervalS / 2 : o.revolutionBatches ? intervalS / 2 : 0;
  const info: TrackerInference = {
    antenna,
    antennaFrom,
    intervalS,
    intervalFrom,
    batchS,
    sigmaRangeM: o.measurement.sigmaRangeM,
    sigmaAzimuthRad: o.measurement.sigmaAzimuthRad,
    noiseFrom: o.estimateNoise ? 'default' : 'option',
    noiseReflectors: 0,
    noisePending: o.estimateNoise && noiseLater,
    noiseFromS: dets.length ? dets[0].timeS : 0,
    warmupDetections: dets.length,
    warmupEndS: dets.length ? dets[dets.length - 1].timeS : 0,
    forwardFraction: a.forwardFraction,
    outOfOrder: 0,
  };
  if (o.estimateNoise && !noiseLater) decideNoise(info, dets, o);
  return info;
}

/**
 * Estimates the measurement noise from `dets` (the run so far) into `info`, unless it was given;
 * `info.noiseFromS` = when the estimate takes effect (the last of these detections).
 */
export function decideNoise(info: TrackerInference, dets: readonly Detection[], o: TrackerOptions): void {
  info.noisePending = false;
  info.noiseFromS = dets.length ? dets[dets.length - 1].timeS : 0;
  if (!o.estimateNoise) return;
  // One slice per scan: a reflector then answers about once per slice, rotating or staring.
  const n = estimateNoise(dets, info.intervalS);
  // Accept estimates within a factor 4 of the typical bench figures; outside that, the
  // "stationary reflector" was more likely a slow target or two reflectors in one bin.
  const r = o.measurement;
  if (n && n.samples >= MIN_SAMPLES && within(n.sigmaRangeM, r.sigmaRangeM) && within(n.sigmaAzimuthRad, r.sigmaAzimuthRad)) {
    info.sigmaRangeM = n.sigmaRangeM;
    info.sigmaAzimuthRad = n.sigmaAzimuthRad;
    info.noiseFrom = 'inferred';
    info.noiseReflectors = n.reflectors;
  }
}

/**
 * Fewer scan-to-scan pairs than this and the robust σ is too loose (its relative standard error
 * is about 0.78/√n for a MAD: common practice) to beat the typical-bench defaults.
 */
const MIN_SAMPLES = 40;

function within(v: number, ref: number): boolean {
  return v > ref / 4 && v < ref * 4;
}

/** The noise line of describeInference (also printed again once a pending estimate is done). */
export function describeNoise(i: TrackerInference): string {
  const from = i.noisePending
    ? 'default for now; estimating from the first part of the run'
    : i.noiseFrom === 'inferred'
      ? `inferred from the run, ${i.noiseReflectors} stationary reflector(s)${i.noiseFromS > i.warmupEndS ? `, applied from ${i.noiseFromS.toFixed(1)} s` : ''}`
      : i.noiseFrom === 'option'
        ? 'as given'
        : 'default';
  return `noise: σ_range ${(i.sigmaRangeM * 100).toFixed(1)} cm, σ_azimuth ${((i.sigmaAzimuthRad * 180) / Math.PI).toFixed(2)}° (${from})`;
}

/** One line per decision, for stderr. */
export function describeInference(i: TrackerInference): string[] {
  const from = (o: Origin) => (o === 'inferred' ? 'inferred from the run' : o === 'option' ? 'as given' : 'default');
  const what = i.antenna === 'rotating' ? 'revolution period' : 'update interval';
  const lines = [
    `antenna: ${i.antenna} (${from(i.antennaFrom)}; ${(100 * i.forwardFraction).toFixed(0)}% of azimuth steps forward over ${i.warmupDetections} detections; tracking from ${i.warmupEndS.toFixed(1)} s)`,
    `${what}: ${i.intervalS.toFixed(i.intervalS < 0.1 ? 4 : 3)} s (${from(i.intervalFrom)}); ${i.batchS > 0 ? `assignment batch ${(i.batchS * 1000).toFixed(1)} ms` : 'assignment per detection, as the beam passes each gate'}`,
    describeNoise(i),
  ];
  if (i.outOfOrder) lines.push(`${i.outOfOrder} detection(s) ignored: time went backwards`);
  return lines;
}
