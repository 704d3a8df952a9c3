/**
 * Polar → Cartesian measurement conversion with the converted-measurement covariance.
 *
 * Two conversions, selectable: the classic linearised one (Bar-Shalom, Li & Kirubarajan 2001,
 * §10.4.3) and the unbiased one of Mo, Song, Zhou, Sun & Bar-Shalom (IEEE Trans. AES 34(3), 1998).
 * The unbiased form matters when r·σθ is not small against σr, i.e. at the far end of the bench
 * with a coarse azimuth encoder; at a few metres both agree to a few millimetres.
 *
 * Azimuth is clockwise from +y (project convention); the published formulas use θ
 * counter-clockwise from +x, so θ = π/2 − az throughout.
 */
import type { Detection, Measurement } from '../types.ts';
import { EchotrailError } from '../errors.ts';

export type Conversion = 'linearised' | 'unbiased';

export interface MeasurementOptions {
  /** Which polar → Cartesian conversion to use. */
  conversion: Conversion;
  /** Range noise standard deviation, metres. */
  sigmaRangeM: number;
  /** Azimuth noise standard deviation, radians. */
  sigmaAzimuthRad: number;
  /** Added to every range before conversion (calibration), metres. */
  rangeOffsetM: number;
  /** Added to every azimuth before conversion (calibration), radians; the sum is wrapped to [0, 2π). */
  azimuthOffsetRad: number;
}

const DEG = Math.PI / 180;

/** Defaults typical of a nanosecond-pulse bench radar (common practice): σr 5 cm, σaz 1.5°. */
export function resolveMeasurementOptions(o: Partial<MeasurementOptions> = {}): MeasurementOptions {
  const r: MeasurementOptions = {
    conversion: o.conversion ?? 'unbiased',
    sigmaRangeM: o.sigmaRangeM ?? 0.05,
    sigmaAzimuthRad: o.sigmaAzimuthRad ?? 1.5 * DEG,
    rangeOffsetM: o.rangeOffsetM ?? 0,
    azimuthOffsetRad: o.azimuthOffsetRad ?? 0,
  };
  if (r.conversion !== 'linearised' && r.conversion !== 'unbiased') {
    throw new EchotrailError('E_OPTION', `unknown conversion '${String(r.conversion)}': use linearised or unbiased`);
  }
  if (!(r.sigmaRangeM > 0) || !(r.sigmaAzimuthRad > 0)) {
    throw new EchotrailError('E_OPTION', 'measurement noise must be positive (σ_range in m, σ_azimuth in degrees)');
  }
  if (!Number.isFinite(r.rangeOffsetM) || !Number.isFinite(r.azimuthOffsetRad)) {
    throw new EchotrailError('E_OPTION', 'range and azimuth offsets must be finite numbers');
  }
  return r;
}

/** Wraps an angle to [0, 2π). */
export function wrapAzimuth(a: number): number {
  const t = 2 * Math.PI;
  const w = a % t;
  return w < 0 ? w + t : w;
}

/** Signed smallest difference a − b of two azimuths, in (−π, π]. */
export function azimuthDiff(a: number, b: number): number {
  let d = (a - b) % (2 * Math.PI);
  if (d > Math.PI) d -= 2 * Math.PI;
  else if (d <= -Math.PI) d += 2 * Math.PI;
  return d;
}

/** Linearised conversion (Bar-Shalom et al. 2001, §10.4.3); θ counter-clockwise from +x. */
export function convertLinearised(r: number, theta: number, sr: number, st: number, timeS = 0): Measurement {
  const c = Math.cos(theta);
  const s = Math.sin(theta);
  const sr2 = sr * sr;
  const rt2 = r * r * st * st;
  return {
    timeS,
    x: r * c,
    y: r * s,
    rxx: sr2 * c * c + rt2 * s * s,
    ryy: sr2 * s * s + rt2 * c * c,
    rxy: (sr2 - rt2) * s * c,
  };
}

/** Unbiased conversion, Mo et al. 1998; θ counter-clockwise from +x. */
export function convertUnbiased(r: number, theta: number, sr: number, st: number, timeS = 0): Measurement {
  const lt = Math.exp(-(st * st) / 2);
  const lp = Math.exp(-2 * st * st);
  const c = Math.cos(theta);
  const s = Math.sin(theta);
  const c2 = Math.cos(2 * theta);
  const s2 = Math.sin(2 * theta);
  const a = 1 / (lt * lt) - 2;
  const r2 = r * r;
  const h = 0.5 * (r2 + sr * sr);
  return {
    timeS,
    x: (r * c) / lt,
    y: (r * s) / lt,
    rxx: a * r2 * c * c + h * (1 + lp * c2),
    ryy: a * r2 * s * s + h * (1 - lp * c2),
    rxy: a * r2 * s * c + h * lp * s2,
  };
}

/**
 * Largest eigenvalue of the converted noise covariance of a detection at range `rangeM` (before
 * the range offset), m². It does not depend on azimuth (both conversions' covariances turn with
 * the line of sight) and grows with range: the gate index sizes its discs with it.
 */
export function noiseAtRange(rangeM: number, o: MeasurementOptions): number {
  const r = Math.max(rangeM + o.rangeOffsetM, 0);
  const sr2 = o.sigmaRangeM * o.sigmaRangeM;
  const st2 = o.sigmaAzimuthRad * o.sigmaAzimuthRad;
  if (o.conversion === 'linearised') return Math.max(sr2, r * r * st2);
  // Mo et al.'s R is (λθ⁻² − 2)·r²·uuᵀ + ½(r² + σr²)·(I + λ′·(reflection about u)), u the line of
  // sight: both terms share the eigenvectors u and u⊥.
  const lt2 = Math.exp(-st2);
  const lp = Math.exp(-2 * st2);
  const h = 0.5 * (r * r + sr2);
  return Math.max((1 / lt2 - 2) * r * r + h * (1 + lp), h * (1 - lp));
}

/** Converts one detection (azimuth clockwise from +y) with offsets applied. */
export function toMeasurement(d: Detection, o: MeasurementOptions): Measurement {
  const r = d.rangeM + o.rangeOffsetM;
  const az = wrapAzimuth(d.azimuthRad + o.azimuthOffsetRad);
  const theta = Math.PI / 2 - az;
  return o.conversion === 'unbiased'
    ? convertUnbiased(r, theta, o.sigmaRangeM, o.sigmaAzimuthRad, d.timeS)
    : convertLinearised(r, theta, o.sigmaRangeM, o.sigmaAzimuthRad, d.timeS);
}
