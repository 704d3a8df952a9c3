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
  /** Detections looked at before tracking started. */
  warmupDetections: number;
  /** Share of azimuth steps forward (rotating antennas are near 1). */
  forwardFraction: number;
  /** Detections ignored because their time went backwards. */
  outOfOrder: number;
}

/** Decides everything the warm-up decides, from the buffered detections. */
export function decide(dets: readonly Detection[], o: TrackerOptions): TrackerInference {
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
  const batchS = o.batchS > 0 ? o.batchS : antenna === 'rotating' ? 0 : intervalS / 2;
  let sigmaRangeM = o.measurement.sigmaRangeM;
  let sigmaAzimuthRad = o.measurement.sigmaAzimuthRad;
  let noiseFrom: Origin = o.estimateNoise ? 'default' : 'option';
  let noiseReflectors = 0;
  if (o.estimateNoise) {
    // One slice per scan: a reflector then answers about once per slice, rotating or staring.
    const n = estimateNoise(dets, intervalS);
    // Accept estimates within a factor 4 of the typical bench figures; outside that, the
    // "stationary reflector" was more likely a slow target or two reflectors in one bin.
    if (n && n.samples >= MIN_SAMPLES && within(n.sigmaRangeM, sigmaRangeM) && within(n.sigmaAzimuthRad, sigmaAzimuthRad)) {
      sigmaRangeM = n.sigmaRangeM;
      sigmaAzimuthRad = n.sigmaAzimuthRad;
      noiseFrom = 'inferred';
      noiseReflectors = n.reflectors;
    }
  }
  return {
    antenna,
    antennaFrom,
    intervalS,
    intervalFrom,
    batchS,
    sigmaRangeM,
    sigmaAzimuthRad,
    noiseFrom,
    noiseReflectors,
    warmupDetections: dets.length,
    forwardFraction: a.forwardFraction,
    outOfOrder: 0,
  };
}

/**
 * Fewer scan-to-scan pairs than this and the robust σ is too loose (its relative standard error
 * is about 0.78/√n for a MAD: common practice) to beat the typical-bench defaults.
 */
const MIN_SAMPLES = 40;

function within(v: number, ref: number): boolean {
  return v > ref / 4 && v < ref * 4;
}

/** One line per decision, for stderr. */
export function describeInference(i: TrackerInference): string[] {
  const from = (o: Origin) => (o === 'inferred' ? 'inferred from the run' : o === 'option' ? 'as given' : 'default');
  const what = i.antenna === 'rotating' ? 'revolution period' : 'update interval';
  const lines = [
    `antenna: ${i.antenna} (${from(i.antennaFrom)}; ${(100 * i.forwardFraction).toFixed(0)}% of azimuth steps forward over ${i.warmupDetections} detections)`,
    `${what}: ${i.intervalS.toFixed(i.intervalS < 0.1 ? 4 : 3)} s (${from(i.intervalFrom)}); ${i.batchS > 0 ? `assignment batch ${(i.batchS * 1000).toFixed(1)} ms` : 'assignment per detection, as the beam passes each gate'}`,
    `noise: σ_range ${(i.sigmaRangeM * 100).toFixed(1)} cm, σ_azimuth ${((i.sigmaAzimuthRad * 180) / Math.PI).toFixed(2)}° (${from(i.noiseFrom)}${i.noiseReflectors ? `, ${i.noiseReflectors} stationary reflector(s)` : ''})`,
  ];
  if (i.outOfOrder) lines.push(`${i.outOfOrder} detection(s) ignored: time went backwards`);
  return lines;
}
