/**
 * Words and flat numbers for calibration results: the history records stored in the bench
 * config, the summaries shown by the CLI and the dashboard panel (degrees at this edge), and the
 * guided panel's steps.
 */
import type { CalibrationRecord } from './bench-config.ts';
import type { FrameAlignment } from './frame-align.ts';
import type { NoiseTuningResult } from './noise-tuning.ts';
import type { OffsetFit } from './offsets.ts';
import { MIN_REVOLUTIONS_PER_SPOT, MIN_STARING_S_PER_SPOT } from './guide.ts';

const DEG = Math.PI / 180;

export const GUIDE_STEPS: string[] = [
  'Offsets: stand a corner reflector at a spot you can tape-measure from the antenna (x across, y along boresight, metres); two or three spots at different distances also give the range scale, and four or more at three or more distances let the fit name a spot taped wrong.',
  `Record at least ${MIN_REVOLUTIONS_PER_SPOT} revolutions (or ${MIN_STARING_S_PER_SPOT} s staring) per spot, keeping people and tools out of the beam; the fit refuses less.`,
  'Enter each spot and, if the reflector was moved within one recording, the time span it stood there; fit, check the residuals, accept.',
  'Frame: run a 2-D path (circle, figure-eight, waypoints) on the positioner with the offsets applied and fit the positioner frame from the run and its commanded path.',
  'Tuning: with offsets and frame in place, tune on a run with manoeuvres like the ones you will test; the profile makes the tracker consistent (mean NIS inside its bounds).',
];

/** The fit's figures; a scale held at 1 has no standard error to show (it was not measured). */
export function offsetsSummary(f: OffsetFit): Record<string, number> {
  return {
    rangeOffsetM: f.rangeOffsetM, rangeOffsetSeM: f.rangeOffsetSeM, rangeScale: f.rangeScale, ...(f.scaleFitted ? { rangeScaleSe: f.rangeScaleSe } : {}),
    azimuthOffsetDeg: f.azimuthOffsetRad / DEG, azimuthOffsetSeDeg: f.azimuthOffsetSeRad / DEG,
    sigmaRangeM: f.sigmaRangeM, sigmaAzimuthDeg: f.sigmaAzimuthRad / DEG, detectionsUsed: f.detectionsUsed,
  };
}

export function frameSummary(f: FrameAlignment): Record<string, number> {
  return {
    rotationDeg: f.rotationRad / DEG, rotationSeDeg: f.rotationSeRad / DEG, translationXM: f.translation.x, translationYM: f.translation.y,
    translationSeXM: f.translationSe.x, translationSeYM: f.translationSe.y, rmsM: f.rmsM, maxM: f.maxM, pairs: f.pairs, candidates: f.candidates,
  };
}

export function offsetsRecord(f: OffsetFit, measuredBy: string, dateUtc: string, positions: number): CalibrationRecord {
  return { kind: 'offsets', dateUtc, measuredBy, method: `least squares on ${f.detectionsUsed} detections of ${positions} tape-measured position(s)${f.scaleFitted ? ', scale fitted' : ', offset only'}`, result: offsetsSummary(f) };
}

export function frameRecord(f: FrameAlignment, measuredBy: string, dateUtc: string): CalibrationRecord {
  return { kind: 'frame', dateUtc, measuredBy, method: `closed-form rigid fit (Umeyama 1991) on ${f.pairs} detection/commanded pairs`, result: frameSummary(f) };
}

export function noiseRecord(r: NoiseTuningResult, measuredBy: string, dateUtc: string): CalibrationRecord {
  return {
    kind: 'noise', dateUtc, measuredBy, method: `residuals of ${r.samples} detections against the commanded path; process noise by NIS`,
    result: { sigmaRangeM: r.sigmaRangeM, sigmaAzimuthDeg: r.sigmaAzimuthRad / DEG, rangeBiasM: r.rangeBiasM, azimuthBiasDeg: r.azimuthBiasRad / DEG, nisMean: r.nisTuned.mean, nisCount: r.nisTuned.count },
  };
}

/** Multi-line text for the terminal. */
export function formatSummary(title: string, s: Record<string, number | string | boolean>): string {
  const w = Math.max(...Object.keys(s).map((k) => k.length));
  return [title, ...Object.entries(s).map(([k, v]) => `  ${k.padEnd(w)}  ${typeof v === 'number' ? (Number.isInteger(v) ? String(v) : v.toPrecision(5)) : String(v)}`)].join('\n');
}
