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
 * Each spot is then checked against what the other spots alone predict (spot-check.ts, leave-one-
 * out), so that a spot entered wrong is named and the good ones are not blamed with it. And each
 * spot must have been recorded as long as the guide asks (guide.ts: revolutions of a rotating
 * antenna, seconds of a staring one); a fit on six stray detections is refused.
 *
 * The tracker adds its offsets to what it measures (bridge/tracking/measurement.ts), so its
 * corrections are the negatives: rangeOffsetM = −b (valid for s ≈ 1), azimuthOffsetRad = −δ.
 */
import { EchotrailError } from '../errors.ts';
import type { Detection } from '../types.ts';
import { MIN_REVOLUTIONS_PER_SPOT, MIN_STARING_S_PER_SPOT } from './guide.ts';
import { leastSquares, median, robustSigma } from './linalg.ts';
import { checkSpots, type SpotCheck, type SpotObservation, type SpotVerdict } from './spot-check.ts';

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
  /** Fewest antenna revolutions in which each position must be seen, rotating antenna (default: the guide's, guide.ts). */
  minRevolutions?: number;
  /** Shortest span of each position's detections with a staring antenna, s (default: the guide's, guide.ts). */
  minStaringS?: number;
  /**
   * Standard uncertainty of a tape-measured position per coordinate, m (default 0.01: steel tape
   * and a reflector set up by eye, common practice). Spots are judged against it: a spot off by
   * less than about 3 of these is ordinary tape error, not a mistake.
   */
  tapeSigmaM?: number;
}

export function resolveOffsetFitOptions(o: OffsetFitOptions = {}): Required<OffsetFitOptions> {
  return {
    gateRangeM: o.gateRangeM ?? 0.5, gateAzimuthDeg: o.gateAzimuthDeg ?? 10, fitScale: o.fitScale ?? 'auto', minScaleSpanM: o.minScaleSpanM ?? 0.5, minDetections: o.minDetections ?? 5,
    minRevolutions: o.minRevolutions ?? MIN_REVOLUTIONS_PER_SPOT, minStaringS: o.minStaringS ?? MIN_STARING_S_PER_SPOT, tapeSigmaM: o.tapeSigmaM ?? 0.01,
  };
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
  /**
   * Leave-one-out (spot-check.ts): the spot's mean measured − what the other spots alone predict,
   * with the standard deviation of that difference; null when the others cannot predict it.
   */
  deletedRangeResidualM: number | null;
  deletedRangeSdM: number | null;
  deletedAzimuthResidualRad: number | null;
  deletedAzimuthSdRad: number | null;
  /** The check's verdict on this spot's range and azimuth (SpotVerdict). */
  rangeVerdict: SpotVerdict;
  azimuthVerdict: SpotVerdict;
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
  /** The leave-one-out checks of the spots' ranges and azimuths. */
  rangeCheck: SpotCheck;
  azimuthCheck: SpotCheck;
  /**
   * What the fit cannot vouch for (see offsetWarnings): a spot that disagrees with what the other
   * spots predict (a mis-measured or mislabelled position), spots that disagree without one to
   * blame, or too few spots to check the fit at all. The standard errors above assume the
   * tape-measured positions are right.
   */
  warnings: string[];
}

/**
 * Floor of a spot's azimuth uncertainty besides the tape, rad: 0.5° at 3σ for the reflector's
 * alignment and the beam's error from one azimuth to another (common practice), so a far spot,
 * where a centimetre of tape is a small angle, is not held to less.
 */
const SPOT_AZIMUTH_FLOOR_RAD = (0.5 / 3) * DEG;

/** Whether the spot check singled this spot out (the panel marks it, the warnings name it). */
export function spotFlags(r: Pick<ReflectorResidual, 'rangeVerdict' | 'azimuthVerdict'>): { range: boolean; azimuth: boolean } {
  return { range: r.rangeVerdict === 'inconsistent', azimuth: r.azimuthVerdict === 'inconsistent' };
}

/** `v.toFixed(digits)` with the minus sign (U+2212), and no sign on what rounds to zero. */
export function fixedWithMinus(v: number, digits: number): string {
  const text = Math.abs(v).toFixed(digits);
  return v < 0 && Number(text) !== 0 ? `−${text}` : text;
}
const mm = (m: number) => `${fixedWithMinus(m * 1000, 0)} mm`;
const degrees = (rad: number) => `${fixedWithMinus(rad / DEG, 2)}°`;
const names = (labels: string[]) => (labels.length > 1 ? `${labels.slice(0, -1).join(', ')} and ${labels[labels.length - 1]}` : labels[0]);

/** The warning for spots that disagree in one quantity without a spot to blame. */
function disagreement(what: 'range' | 'azimuth', check: SpotCheck, reflectors: readonly ReflectorResidual[], params: number): string | null {
  const among = reflectors.filter((_, i) => check.verdicts[i] === 'disagree').map((r) => r.label);
  if (among.length === 0) return null;
  const point = check.pointsAt !== null ? `; leave-one-out points at ${reflectors[check.pointsAt].label}, without confirming it` : '';
  const unknowns = params === 1 ? `the ${what} offset` : 'range scale and offset';
  const why = check.redundancy <= 1
    ? `with ${reflectors.length} spots for ${unknowns} leave-one-out cannot tell which is wrong${point}: re-measure them, or add a spot${what === 'range' ? ' at another distance' : ''}`
    : `leave-one-out cannot single one out${point}: re-measure them; more spots help tell them apart`;
  return `the spots disagree in ${what} (${names(among)} beyond 3σ of what the others predict), and ${why}`;
}

/**
 * Warnings for a fit: each spot the leave-one-out check singled out, spots that disagree without
 * one to blame, and the redundancy left to check the fit with.
 */
export function offsetWarnings(reflectors: readonly ReflectorResidual[], scaleFitted: boolean, checks?: { range: SpotCheck; azimuth: SpotCheck }): string[] {
  const out: string[] = [];
  for (const r of reflectors) {
    const flags = spotFlags(r);
    if (flags.range && r.deletedRangeResidualM !== null && r.deletedRangeSdM !== null) out.push(`spot ${r.label}: range ${mm(r.deletedRangeResidualM)} off what the other spots predict (3σ bound ±${mm(3 * r.deletedRangeSdM)}; σ ${mm(r.deletedRangeSdM)} as in the table): check its tape-measured position and label; the offsets above include it`);
    if (flags.azimuth && r.deletedAzimuthResidualRad !== null && r.deletedAzimuthSdRad !== null) out.push(`spot ${r.label}: azimuth ${degrees(r.deletedAzimuthResidualRad)} off what the other spots predict (3σ bound ±${degrees(3 * r.deletedAzimuthSdRad)}; σ ${degrees(r.deletedAzimuthSdRad)} as in the table): check its tape-measured position and label; the offsets above include it`);
  }
  if (checks) {
    const range = disagreement('range', checks.range, reflectors, scaleFitted ? 2 : 1);
    const azimuth = disagreement('azimuth', checks.azimuth, reflectors, 1);
    if (range) out.push(range);
    if (azimuth) out.push(azimuth);
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

/** Variance within groups, pooled: Σ (v − group mean)² / (count − groups); 0 when nothing is left. */
function pooledWithin(groups: number[][]): number {
  let ss = 0;
  let dof = 0;
  for (const g of groups) {
    const m = mean(g);
    for (const v of g) ss += (v - m) ** 2;
    dof += g.length - 1;
  }
  return dof > 0 ? ss / dof : 0;
}

/**
 * Fastest revisit of one spot taken for a rotating antenna, s: benches turn in 0.5–2 s (common
 * practice; bridge/tracking/antenna-inference.ts uses the same floor). Detections of a spot that
 * come faster are a staring antenna's (or several per pass), judged by the time they span.
 */
const MIN_REVISIT_S = 0.1;

/**
 * Why a spot's detections fall short of the guide, or null. Judged on the spot's own detections:
 * the antenna inferred from a whole run misreads a sparse one (a lone reflector at 0° jitters
 * across the zero reference), while a reflector's revisits are its revolutions. A reflector
 * standing at the spot is seen nearly every revolution, so few revolutions mean a short recording
 * or a position where nothing stands (six stray detections of clutter are not a reflector).
 */
function coverageProblem(label: string, dets: readonly Detection[], o: Required<OffsetFitOptions>): string | null {
  const times = dets.map((d) => d.timeS).sort((a, b) => a - b);
  const gaps = times.slice(1).map((t, i) => t - times[i]).filter((g) => g > 0).sort((a, b) => a - b);
  // Its revisit interval: the lower quartile of the gaps between its detections, which is one
  // revolution even when it is missed now and then (the median would be two at Pd below ½).
  const revisitS = gaps.length ? gaps[Math.floor(0.25 * (gaps.length - 1))] : 0;
  if (revisitS >= MIN_REVISIT_S || gaps.length === 0) {
    // Detections more than half a revisit apart are in different revolutions.
    let seen = times.length ? 1 : 0;
    for (let i = 1; i < times.length; i++) if (times[i] - times[i - 1] > 0.5 * revisitS) seen++;
    if (seen >= o.minRevolutions) return null;
    return `offset fit: ${label} was seen in ${seen} antenna revolution${seen === 1 ? '' : 's'} (the guide asks for at least ${o.minRevolutions} per spot): record longer; a reflector standing there is seen nearly every revolution, so if the recording was long enough, check the entered position; nothing was saved`;
  }
  const span = times[times.length - 1] - times[0];
  if (span >= o.minStaringS) return null;
  return `offset fit: ${label} was seen over ${span.toFixed(1)} s of a staring antenna (the guide asks for at least ${o.minStaringS} s per spot, or ${o.minRevolutions} revolutions of a rotating one): record longer; nothing was saved`;
}

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
  // Recorded as long as the guide asks (guide.ts)?
  for (const r of refl) {
    const problem = coverageProblem(r.label, r.dets, o);
    if (problem) throw new EchotrailError('E_CALIBRATION', problem);
  }
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
  // Leave-one-out per spot (spot-check.ts) on the spots' means. The detection noise is the scatter
  // within each spot, pooled, which a wrong spot does not inflate (the fit's σ above it does).
  const sr2 = pooledWithin(refl.map((r) => r.dets.map((d) => d.rangeM)));
  const sa2 = pooledWithin(refl.map((r) => r.dets.map((d) => wrapPi(d.azimuthRad - r.az))));
  const rangeCheck = checkSpots(refl.map((r): SpotObservation => {
    const v = o.tapeSigmaM ** 2 + sr2 / r.dets.length;
    return scaleFitted ? { x: [r.r, 1], y: mean(r.dets.map((d) => d.rangeM)), v } : { x: [1], y: mean(r.dets.map((d) => d.rangeM - r.r)), v };
  }));
  // A position error of τ across the line of sight turns the azimuth by τ/R.
  const azimuthCheck = checkSpots(refl.map((r): SpotObservation => ({ x: [1], y: mean(r.dets.map((d) => wrapPi(d.azimuthRad - r.az))), v: Math.max(o.tapeSigmaM / r.r, SPOT_AZIMUTH_FLOOR_RAD) ** 2 + sa2 / r.dets.length })));
  const checked: ReflectorResidual[] = reflectors.map((row, i) => ({
    ...row,
    deletedRangeResidualM: rangeCheck.deleted[i]?.residual ?? null, deletedRangeSdM: rangeCheck.deleted[i]?.sd ?? null,
    deletedAzimuthResidualRad: azimuthCheck.deleted[i]?.residual ?? null, deletedAzimuthSdRad: azimuthCheck.deleted[i]?.sd ?? null,
    rangeVerdict: rangeCheck.verdicts[i], azimuthVerdict: azimuthCheck.verdicts[i],
  }));
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
    reflectors: checked,
    detectionsUsed: all.length,
    rangeCheck,
    azimuthCheck,
    warnings: [
      ...offsetWarnings(checked, scaleFitted, { range: rangeCheck, azimuth: azimuthCheck }),
      // Auto mode left the scale out: say so, or the scale of 1 reads as a measured one.
      ...(o.fitScale === 'auto' && !scaleFitted && reflectors.length > 1 ? [`range scale not fitted (held at 1): the spots' distances span ${(span * 100).toFixed(0)} cm, less than ${(o.minScaleSpanM * 100).toFixed(0)} cm; add a spot at another distance to fit it`] : []),
    ],
  };
}
