/**
 * Range offset, range scale and azimuth offset of the radar from a reflector set at tape-measured
 * positions (radar frame, antenna at the origin).
 *
 * Model, per detection j of reflector i (true range Rᵢ, azimuth θᵢ from the tape):
 *   measured range   = s·Rᵢ + b + e_r,     measured azimuth = θᵢ + δ + e_az,
 * fitted by least squares (linalg.ts), so the standard errors come from the normal equations.
 * The scale is fitted only when the reflectors stand at clearly different distances. Detections
 * are first gated wide around each entered position (the offsets are unknown), then re-gated at
 * 4 robust σ about a median fit so a nearby fixed echo or clutter does not pull the result.
 *
 * The tracker adds its offsets to what it measures (bridge/tracking/measurement.ts), so its
 * corrections are the negatives: rangeOffsetM = −b (valid for s ≈ 1), azimuthOffsetRad = −δ.
 */
import { EchotrailError } from '../errors.ts';
import type { Detection } from '../types.ts';
import { leastSquares, median, robustSigma } from './linalg.ts';

const DEG = Math.PI / 180;

export interface ReflectorPosition {
  /** Tape-measured position in the radar frame, m. */
  x: number;
  y: number;
  /** Name shown in messages (default "reflector N"). */
  label?: string;
  /** Only detections in this time span belong to this placement, s (default: the whole run). */
  fromS?: number;
  toS?: number;
}

export interface OffsetFitOptions {
  /** Half-width of the first, wide range gate around each position, m (default 0.5). */
  gateRangeM?: number;
  /** Half-width of the first azimuth gate, degrees (default 10). */
  gateAzimuthDeg?: number;
  /** 'auto' fits the scale when the distances span ≥ minScaleSpanM; true insists; false never (default 'auto'). */
  fitScale?: 'auto' | boolean;
  /** Least span of reflector distances for a scale fit, m (default 0.5). */
  minScaleSpanM?: number;
  /** Fewest detections per position after gating (default 5). */
  minDetections?: number;
}

export function resolveOffsetFitOptions(o: OffsetFitOptions = {}): Required<OffsetFitOptions> {
  return { gateRangeM: o.gateRangeM ?? 0.5, gateAzimuthDeg: o.gateAzimuthDeg ?? 10, fitScale: o.fitScale ?? 'auto', minScaleSpanM: o.minScaleSpanM ?? 0.5, minDetections: o.minDetections ?? 5 };
}

export interface ReflectorResidual {
  label: string;
  trueRangeM: number;
  trueAzimuthRad: number;
  detections: number;
  /** Mean and std of measured − fitted, range m and azimuth rad. */
  meanRangeResidualM: number;
  stdRangeResidualM: number;
  meanAzimuthResidualRad: number;
  stdAzimuthResidualRad: number;
}

export interface OffsetFit {
  /** Measured = scale·true + offset (radar's error), with standard errors. */
  rangeOffsetM: number;
  rangeOffsetSeM: number;
  rangeScale: number;
  rangeScaleSe: number;
  /** False when only the offset was fitted (scale held at 1). */
  scaleFitted: boolean;
  /** Covariance of (scale, offset) when the scale was fitted. */
  scaleOffsetCov: number;
  /** Measured azimuth − true azimuth, rad, with its standard error. */
  azimuthOffsetRad: number;
  azimuthOffsetSeRad: number;
  /** Residual std of single detections: an estimate of σ_range and σ_azimuth. */
  sigmaRangeM: number;
  sigmaAzimuthRad: number;
  reflectors: ReflectorResidual[];
  detectionsUsed: number;
  /**
   * What the fit cannot vouch for (see offsetWarnings): a spot whose mean residual is far beyond
   * its noise (a mis-measured or mislabelled position), or too few spots to check the fit at all.
   * The standard errors above assume the tape-measured positions are right.
   */
  warnings: string[];
}

/** Smallest mean residuals worth a warning: tape placement errors below these are common practice. */
const SPOT_RANGE_FLOOR_M = 0.03;
const SPOT_AZIMUTH_FLOOR_RAD = 0.5 * (Math.PI / 180);

/**
 * Whether a spot's mean residuals lie beyond 3 standard errors of its own detections (and a floor
 * for ordinary tape error): a mis-measured or mislabelled position.
 */
export function spotBeyondNoise(r: ReflectorResidual): { range: boolean; azimuth: boolean } {
  const k = 3 / Math.sqrt(Math.max(r.detections, 1));
  return {
    range: Math.abs(r.meanRangeResidualM) > Math.max(k * r.stdRangeResidualM, SPOT_RANGE_FLOOR_M),
    azimuth: Math.abs(r.meanAzimuthResidualRad) > Math.max(k * r.stdAzimuthResidualRad, SPOT_AZIMUTH_FLOOR_RAD),
  };
}

/**
 * Warnings for a fit: each spot beyond its noise (spotBeyondNoise), and the redundancy left to
 * check the fit with.
 */
export function offsetWarnings(reflectors: readonly ReflectorResidual[], scaleFitted: boolean): string[] {
  const out: string[] = [];
  for (const r of reflectors) {
    const beyond = spotBeyondNoise(r);
    if (beyond.range) out.push(`spot ${r.label}: mean range residual ${(r.meanRangeResidualM * 1000).toFixed(0)} mm, beyond its noise: check its tape-measured position and label`);
    if (beyond.azimuth) out.push(`spot ${r.label}: mean azimuth residual ${(r.meanAzimuthResidualRad / DEG).toFixed(2)}°, beyond its noise: check its tape-measured position and label`);
  }
  const distances = new Set(reflectors.map((r) => r.trueRangeM.toFixed(2))).size;
  if (reflectors.length < 2) out.push('one spot fits the offsets exactly and cannot check them: measure at two or more spots');
  else if (scaleFitted && distances <= 2) out.push(`range scale and offset from ${distances} distances fit them exactly, with nothing left to check them: add a spot at a third distance`);
  return out;
}

const wrapPi = (a: number) => a - 2 * Math.PI * Math.floor((a + Math.PI) / (2 * Math.PI));
const deg360 = (a: number) => ((((a / DEG) % 360) + 360) % 360).toFixed(1);
const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;
const std = (v: number[]) => (v.length > 1 ? Math.sqrt(v.reduce((a, b) => a + (b - mean(v)) ** 2, 0) / (v.length - 1)) : 0);

export function fitRadarOffsets(positions: ReflectorPosition[], detections: Iterable<Detection>, options?: OffsetFitOptions): OffsetFit {
  const o = resolveOffsetFitOptions(options);
  if (positions.length === 0) throw new EchotrailError('E_CALIBRATION', 'offset fit: enter at least one tape-measured reflector position');
  const refl = positions.map((p, i) => ({ ...p, label: p.label ?? `reflector ${i + 1}`, r: Math.hypot(p.x, p.y), az: Math.atan2(p.x, p.y), dets: [] as Detection[] }));
  for (const r of refl) if (r.r < 0.05) throw new EchotrailError('E_CALIBRATION', `offset fit: ${r.label} is at the antenna (${r.r.toFixed(3)} m); enter its position relative to the antenna`);
  const dets = [...detections];
  for (const d of dets) {
    for (const r of refl) {
      if ((r.fromS !== undefined && d.timeS < r.fromS) || (r.toS !== undefined && d.timeS > r.toS)) continue;
      if (Math.abs(d.rangeM - r.r) <= o.gateRangeM && Math.abs(wrapPi(d.azimuthRad - r.az)) <= o.gateAzimuthDeg * DEG) r.dets.push(d);
    }
  }
  for (const r of refl) {
    if (r.dets.length === 0) {
      let best: Detection | null = null;
      for (const d of dets) if (!best || Math.hypot(d.rangeM - r.r, r.r * wrapPi(d.azimuthRad - r.az)) < Math.hypot(best.rangeM - r.r, r.r * wrapPi(best.azimuthRad - r.az))) best = d;
      const near = best ? `; the nearest detection is at ${best.rangeM.toFixed(2)} m, ${deg360(best.azimuthRad)}°` : '; the run has no detections at all';
      throw new EchotrailError('E_CALIBRATION', `offset fit: no detections within ±${o.gateRangeM} m and ±${o.gateAzimuthDeg}° of ${r.label} (${r.r.toFixed(2)} m, ${deg360(r.az)}°)${near}. Check the entered position or widen the gate; nothing was saved`);
    }
  }
  // Robust first pass: each reflector's median residuals (a scale error shifts them apart), a
  // pooled robust σ, then keep detections within 4 robust σ of their reflector's median.
  const centre = refl.map((r) => ({ dr: median(r.dets.map((d) => d.rangeM - r.r)), da: median(r.dets.map((d) => wrapPi(d.azimuthRad - r.az))) }));
  const dr0 = refl.flatMap((r, i) => r.dets.map((d) => d.rangeM - r.r - centre[i].dr));
  const da0 = refl.flatMap((r, i) => r.dets.map((d) => wrapPi(d.azimuthRad - r.az) - centre[i].da));
  const sr = Math.max(robustSigma(dr0), 0.005);
  const sa = Math.max(robustSigma(da0), 0.05 * DEG);
  refl.forEach((r, i) => {
    r.dets = r.dets.filter((d) => Math.abs(d.rangeM - r.r - centre[i].dr) <= 4 * sr && Math.abs(wrapPi(d.azimuthRad - r.az) - centre[i].da) <= 4 * sa);
    if (r.dets.length < o.minDetections) throw new EchotrailError('E_CALIBRATION', `offset fit: only ${r.dets.length} consistent detections of ${r.label} (need ${o.minDetections}); record longer or check the position; nothing was saved`);
  });
  const span = Math.max(...refl.map((r) => r.r)) - Math.min(...refl.map((r) => r.r));
  const canScale = span >= o.minScaleSpanM;
  if (o.fitScale === true && !canScale) {
    throw new EchotrailError('E_CALIBRATION', `offset fit: a range scale needs reflectors at two or more distances at least ${o.minScaleSpanM} m apart (these span ${span.toFixed(2)} m); add a position or fit the offset alone; nothing was saved`);
  }
  const scaleFitted = o.fitScale !== false && canScale;
  const all = refl.flatMap((r) => r.dets.map((d) => ({ r, d })));
  const rangeFit = scaleFitted
    ? leastSquares(all.map(({ r }) => [r.r, 1]), all.map(({ d }) => d.rangeM), 'range scale and offset')
    : leastSquares(all.map(() => [1]), all.map(({ r, d }) => d.rangeM - r.r), 'range offset');
  const azFit = leastSquares(all.map(() => [1]), all.map(({ r, d }) => wrapPi(d.azimuthRad - r.az)), 'azimuth offset');
  const s = scaleFitted ? rangeFit.x[0] : 1;
  const b = scaleFitted ? rangeFit.x[1] : rangeFit.x[0];
  const delta = azFit.x[0];
  const reflectors = refl.map((r) => {
    const er = r.dets.map((d) => d.rangeM - (s * r.r + b));
    const ea = r.dets.map((d) => wrapPi(d.azimuthRad - r.az - delta));
    return { label: r.label, trueRangeM: r.r, trueAzimuthRad: (r.az + 2 * Math.PI) % (2 * Math.PI), detections: r.dets.length, meanRangeResidualM: mean(er), stdRangeResidualM: std(er), meanAzimuthResidualRad: mean(ea), stdAzimuthResidualRad: std(ea) };
  });
  return {
    rangeOffsetM: b,
    rangeOffsetSeM: scaleFitted ? rangeFit.se[1] : rangeFit.se[0],
    rangeScale: s,
    rangeScaleSe: scaleFitted ? rangeFit.se[0] : 0,
    scaleFitted,
    scaleOffsetCov: scaleFitted ? rangeFit.cov[0][1] : 0,
    azimuthOffsetRad: delta,
    azimuthOffsetSeRad: azFit.se[0],
    sigmaRangeM: Math.sqrt(rangeFit.sigma2),
    sigmaAzimuthRad: Math.sqrt(azFit.sigma2),
    reflectors,
    detectionsUsed: all.length,
    warnings: [
      ...offsetWarnings(reflectors, scaleFitted),
      // Auto mode left the scale out: say so, or the scale of 1 reads as a measured one.
      ...(o.fitScale === 'auto' && !scaleFitted && reflectors.length > 1 ? [`range scale not fitted (held at 1): the spots' distances span ${(span * 100).toFixed(0)} cm, less than ${(o.minScaleSpanM * 100).toFixed(0)} cm; add a spot at another distance to fit it`] : []),
    ],
  };
}
